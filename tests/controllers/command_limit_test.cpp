// Command limiting: the drive's limits at a wheel's speed against the plant's own motor equations
// (sim/motor.hpp), and balance before heading — a command whose sum exceeds what the drives can
// carry keeps its common mode and gives up its differential.
#include "kit/command_limit.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "upright/sim/motor.hpp"

namespace upright::controllers {
namespace {

// A motor of round numbers (not a demo robot's): stall torque at the current limit
// n η K_t I = 20 × 0.85 × 0.06 × 20 = 20.4 N·m; the supply's headroom V_s − R I = 14 V of
// back-EMF, K_e n ω = 1.2 V·s/rad × ω, is used up at ω = 11.67 rad/s.
model::MotorModel Motor() {
  model::MotorModel m;
  m.torque_constant_Nm_per_A = 0.06;
  m.back_emf_V_s_per_rad = 0.06;
  m.resistance_ohm = 0.5;
  m.gear_ratio = 20;
  m.gear_efficiency = 0.85;
  m.supply_V = 24;
  m.current_limit_A = 20;
  return m;
}

constexpr double kStall = 20 * 0.85 * 0.06 * 20;

TEST(DriveLimits, TorqueIsTheStallTorqueAtRestAndTheSupplysHeadroomAtSpeed) {
  const DriveLimits limits(Motor(), design::InputKind::kTorque);
  const CommandRange rest = limits.At(0);
  EXPECT_NEAR(rest.lo, -kStall, 1e-12);
  EXPECT_NEAR(rest.hi, kStall, 1e-12);
  // At 15 rad/s forward: e = 18 V, forward current at most (24 − 18) / 0.5 = 12 A, backward the
  // limit 20 A: n η K_t · 12 = 12.24 N·m forward, −20.4 N·m back (derived by hand).
  const CommandRange fast = limits.At(15);
  EXPECT_NEAR(fast.hi, 1.02 * 12, 1e-12);
  EXPECT_NEAR(fast.lo, -kStall, 1e-12);
  // Past the no-load speed V_s / (K_e n) = 20 rad/s the motor can only brake: at 25 rad/s,
  // (24 − 30) / 0.5 = −12 A.
  const CommandRange overspeed = limits.At(25);
  EXPECT_NEAR(overspeed.hi, -1.02 * 12, 1e-12);
  EXPECT_NEAR(overspeed.lo, -kStall, 1e-12);
}

TEST(DriveLimits, AreWhereThePlantsDriveSaturates) {
  // At each speed, the plant's motor (friction left out) given a command at the range's end
  // delivers it, and given more delivers no more.
  model::MotorModel m = Motor();
  const double band = 1e-3;
  for (design::InputKind kind : {design::InputKind::kTorque, design::InputKind::kVoltage}) {
    const DriveLimits limits(m, kind);
    const sim::DriveMode mode =
        kind == design::InputKind::kTorque ? sim::DriveMode::kTorque : sim::DriveMode::kVoltage;
    for (double speed : {-25.0, -12.0, -3.0, 0.0, 5.0, 11.0, 15.0, 25.0}) {
      const CommandRange range = limits.At(speed);
      for (double end : {range.lo, range.hi}) {
        const double at = sim::EvaluateMotor(m, mode, end, speed, band).wheel_torque_Nm;
        const double beyond =
            sim::EvaluateMotor(m, mode, end + (end == range.hi ? 5 : -5), speed, band)
                .wheel_torque_Nm;
        EXPECT_NEAR(at, beyond, 1e-9) << "speed " << speed << ", end " << end;
        if (kind == design::InputKind::kTorque) {
          EXPECT_NEAR(at, end, 1e-9) << "speed " << speed;
        }
      }
      // Inside the range a torque command is carried out as given.
      if (kind == design::InputKind::kTorque) {
        const double middle = (range.lo + range.hi) / 2;
        EXPECT_NEAR(sim::EvaluateMotor(m, mode, middle, speed, band).wheel_torque_Nm, middle, 1e-9);
      }
    }
  }
}

TEST(LimitWithPitchPriority, KeepsTheCommonModeAndScalesTheDifferential) {
  // Both wheels at rest, ±20.4 N·m each. Wanted: 10 and 30 N·m — the sum 40 fits in 40.8, the
  // right wheel does not. A per-wheel clamp would give (10, 20.4): the common mode drops from 20
  // to 15.2. With balance first: c = 20 kept, d = 10 scaled to the 0.4 left, (19.6, 20.4).
  const DriveLimits limits(Motor(), design::InputKind::kTorque);
  const CommandRange range = limits.At(0);
  const LimitedCommand out = LimitWithPitchPriority(Eigen::Vector2d(10, 30), range, range);
  EXPECT_NEAR((out.command(0) + out.command(1)) / 2, 20, 1e-12);
  EXPECT_NEAR((out.command(1) - out.command(0)) / 2, kStall - 20, 1e-12);
  EXPECT_EQ(out.common_cut, 0);
  EXPECT_EQ(out.differential_cut, 1);
}

TEST(LimitWithPitchPriority, CutsTheCommonModeFirstAndThenDropsTheDifferential) {
  // Wanted 30 and 40: c = 35 is beyond what both can carry (20.4); it is cut to 20.4 and the
  // differential, 5, has nothing left: (20.4, 20.4). Turning the other way the same.
  const CommandRange range{-kStall, kStall};
  for (double d : {5.0, -5.0}) {
    const LimitedCommand out =
        LimitWithPitchPriority(Eigen::Vector2d(35 - d, 35 + d), range, range);
    EXPECT_NEAR(out.command(0), kStall, 1e-12);
    EXPECT_NEAR(out.command(1), kStall, 1e-12);
    EXPECT_EQ(out.common_cut, 1);
    EXPECT_EQ(out.differential_cut, d > 0 ? 1 : -1);
  }
  const LimitedCommand back = LimitWithPitchPriority(Eigen::Vector2d(-50, -30), range, range);
  EXPECT_NEAR(back.command(0), -kStall, 1e-12);
  EXPECT_NEAR(back.command(1), -kStall, 1e-12);
  EXPECT_EQ(back.common_cut, -1);
}

TEST(LimitWithPitchPriority, KeepsTheCommonModeWhenTheWheelsRangesDiffer) {
  // Turning at speed: the left wheel at 5 rad/s can give 20.4 N·m forward, the right at 15 rad/s
  // only 12.24. Wanted (14, 12): within both, passed untouched.
  const DriveLimits limits(Motor(), design::InputKind::kTorque);
  const CommandRange left = limits.At(5), right = limits.At(15);
  const LimitedCommand kept = LimitWithPitchPriority(Eigen::Vector2d(14, 12), left, right);
  EXPECT_EQ(kept.command(0), 14);
  EXPECT_EQ(kept.command(1), 12);
  // Wanted (18, 14): the right wheel cannot take 14. c = 16 fits within (20.4 + 12.24) / 2 =
  // 16.32 and is kept; d = −2 must become 12.24 − 16 = −3.76 for it: (19.76, 12.24) — the
  // heading gives way (here it turns more than asked), the balance torque stays.
  const LimitedCommand out = LimitWithPitchPriority(Eigen::Vector2d(18, 14), left, right);
  EXPECT_NEAR(out.command.sum() / 2, 16, 1e-12);
  EXPECT_NEAR(out.command(1), right.hi, 1e-12);
  EXPECT_NEAR(out.command(0), 32 - right.hi, 1e-12);
  EXPECT_EQ(out.common_cut, 0);
  EXPECT_EQ(out.differential_cut, 1);
  // A per-wheel clamp would have given (18, 12.24): the common mode down to 15.12.
}

TEST(LimitWithPitchPriority, PassesACommandWithinBothRangesBitForBit) {
  const CommandRange range{-kStall, kStall};
  const Eigen::Vector2d wanted(0.1 + 0.2, -7.3);
  const LimitedCommand out = LimitWithPitchPriority(wanted, range, range);
  EXPECT_EQ(out.command, wanted);
  EXPECT_EQ(out.common_cut, 0);
  EXPECT_EQ(out.differential_cut, 0);
}

}  // namespace
}  // namespace upright::controllers
