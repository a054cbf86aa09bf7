#include "upright/sim/motor.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <memory>
#include <string>
#include <vector>

#include "test_robot.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/plant.hpp"

namespace upright::sim {
namespace {

using testing::MakeFrictionlessTestRobot;
using testing::MakePlant;
using testing::MakeTestRobot;

// Expected values below come from the DC motor equations with armature inductance neglected
// (any electric-machines handbook, from memory):
//   i = (V − K_e n ω) / R,  τ_wheel = n η K_t i − b ω − c sign(ω).
// The test motor: K_t = K_e = 0.05, R = 2.5 Ω, n = 10, η = 0.8, supply 12 V, limit 4 A,
// b = 0.02 N·m·s/rad, c = 0.01 N·m; so n η K_t = 0.4 N·m/A.
constexpr double kBand = 1e-3;  // Coulomb smoothing band for the unit evaluations, rad/s

double TorquePerAmp(const model::MotorModel& m) {
  return m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A;
}

TEST(Motor, StallTorqueBelowTheCurrentLimitIsNEtaKtVOverR) {
  const model::MotorModel m = MakeTestRobot().motor;
  const MotorOutput out = EvaluateMotor(m, DriveMode::kVoltage, 6.0, 0.0, kBand);
  // i = V / R = 2.4 A < 4 A; τ = n η K_t V / R = 0.96 N·m.
  EXPECT_NEAR(out.current_A, 6.0 / m.resistance_ohm, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, TorquePerAmp(m) * 6.0 / m.resistance_ohm, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 0.96, 1e-12);
  EXPECT_NEAR(out.voltage_V, 6.0, 1e-12);
  EXPECT_NEAR(out.power_W(), 6.0 * 2.4, 1e-9);  // P = V i
  EXPECT_FALSE(out.current_saturated);
  EXPECT_FALSE(out.voltage_saturated);
}

TEST(Motor, CurrentLimitCapsTheStallTorque) {
  const model::MotorModel m = MakeTestRobot().motor;
  const MotorOutput out = EvaluateMotor(m, DriveMode::kVoltage, 12.0, 0.0, kBand);
  // V / R = 4.8 A exceeds the 4 A limit: τ = n η K_t I_max = 1.6 N·m, and the drive lowers the
  // terminal voltage to R I_max = 10 V.
  EXPECT_TRUE(out.current_saturated);
  EXPECT_NEAR(out.current_A, m.current_limit_A, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, TorquePerAmp(m) * m.current_limit_A, 1e-12);
  EXPECT_NEAR(out.voltage_V, m.resistance_ohm * m.current_limit_A, 1e-12);
  const MotorOutput reverse = EvaluateMotor(m, DriveMode::kVoltage, -12.0, 0.0, kBand);
  EXPECT_NEAR(reverse.wheel_torque_Nm, -TorquePerAmp(m) * m.current_limit_A, 1e-12);
}

TEST(Motor, CurrentLimitHoldsWhenDrivingAgainstTheRotation) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  // Back-EMF at −10 rad/s is −5 V, so 12 V would drive (12 + 5) / 2.5 = 6.8 A: capped at 4 A.
  const MotorOutput out = EvaluateMotor(m, DriveMode::kVoltage, 12.0, -10.0, kBand);
  EXPECT_TRUE(out.current_saturated);
  EXPECT_NEAR(out.current_A, 4.0, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 1.6, 1e-12);
}

TEST(Motor, NoLoadSpeedIsVOverNKeWithZeroCurrent) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  const double no_load = 6.0 / (m.gear_ratio * m.back_emf_V_s_per_rad);  // 12 rad/s
  const MotorOutput out = EvaluateMotor(m, DriveMode::kVoltage, 6.0, no_load, kBand);
  EXPECT_NEAR(out.current_A, 0.0, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 0.0, 1e-12);
  // Slower than no-load speed the motor drives, faster it brakes.
  EXPECT_GT(EvaluateMotor(m, DriveMode::kVoltage, 6.0, 0.9 * no_load, kBand).wheel_torque_Nm, 0);
  EXPECT_LT(EvaluateMotor(m, DriveMode::kVoltage, 6.0, 1.1 * no_load, kBand).wheel_torque_Nm, 0);
}

TEST(Motor, VoltageCommandIsClippedToTheSupply) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  // −20 V asked, −12 V applied; at −24 rad/s the back-EMF is −12 V, so no current flows.
  const MotorOutput out = EvaluateMotor(m, DriveMode::kVoltage, -20.0, -24.0, kBand);
  EXPECT_TRUE(out.voltage_saturated);
  EXPECT_NEAR(out.voltage_V, -12.0, 1e-12);
  EXPECT_NEAR(out.current_A, 0.0, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 0.0, 1e-12);
}

TEST(Motor, TorqueModeGivesTheCommandedTorqueBelowTheLimits) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  const MotorOutput out = EvaluateMotor(m, DriveMode::kTorque, 0.5, 5.0, kBand);
  // i = τ / (n η K_t) = 1.25 A; V = R i + K_e n ω = 3.125 + 2.5 = 5.625 V < 12 V.
  EXPECT_NEAR(out.wheel_torque_Nm, 0.5, 1e-12);
  EXPECT_NEAR(out.current_A, 1.25, 1e-12);
  EXPECT_NEAR(out.voltage_V, 5.625, 1e-12);
  EXPECT_FALSE(out.current_saturated);
  EXPECT_FALSE(out.voltage_saturated);
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kTorque, -0.5, -5.0, kBand).wheel_torque_Nm, -0.5, 1e-12);
}

TEST(Motor, TorqueModeIsCappedByTheCurrentLimit) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  // 2 N·m needs 5 A: capped at 4 A → 1.6 N·m.
  const MotorOutput out = EvaluateMotor(m, DriveMode::kTorque, 2.0, 0.0, kBand);
  EXPECT_TRUE(out.current_saturated);
  EXPECT_FALSE(out.voltage_saturated);
  EXPECT_NEAR(out.current_A, 4.0, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 1.6, 1e-12);
}

TEST(Motor, TorqueModeSaturatesAgainstTheSupplyAtSpeed) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  // 1 N·m needs 2.5 A, i.e. 6.25 + 10 = 16.25 V at 20 rad/s: more than 12 V. With 12 V applied,
  // i = (12 − 10) / 2.5 = 0.8 A → τ = 0.32 N·m.
  const MotorOutput out = EvaluateMotor(m, DriveMode::kTorque, 1.0, 20.0, kBand);
  EXPECT_TRUE(out.voltage_saturated);
  EXPECT_NEAR(out.voltage_V, 12.0, 1e-12);
  EXPECT_NEAR(out.current_A, 0.8, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 0.32, 1e-12);
  const MotorOutput reverse = EvaluateMotor(m, DriveMode::kTorque, -1.0, -20.0, kBand);
  EXPECT_TRUE(reverse.voltage_saturated);
  EXPECT_NEAR(reverse.wheel_torque_Nm, -0.32, 1e-12);
}

// A drive held at exactly its limit is saturated: built-in controllers clamp their command at
// the stall torque or the supply, and that command must count. "At the limit" is within
// kLimitTolerance (1e-6) of it; a command 2e-6 below is not.
TEST(Motor, ATorqueCommandAtTheStallTorqueSaturatesTheCurrent) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  // The stall torque at the wheel, n η K_t min(V / R, I_max) = 0.4 × min(4.8, 4) = 1.6 N·m.
  const double stall_Nm =
      TorquePerAmp(m) * std::min(m.supply_V / m.resistance_ohm, m.current_limit_A);
  ASSERT_NEAR(stall_Nm, 1.6, 1e-12);
  for (double sign : {1.0, -1.0}) {
    const MotorOutput at = EvaluateMotor(m, DriveMode::kTorque, sign * stall_Nm, 0.0, kBand);
    EXPECT_TRUE(at.current_saturated) << sign;
    EXPECT_FALSE(at.voltage_saturated) << sign;  // R I_max = 10 V of the 12 V supply
    EXPECT_NEAR(at.current_A, sign * 4.0, 1e-12);
    const double inside = sign * stall_Nm * (1 - 0.5e-6);
    EXPECT_TRUE(EvaluateMotor(m, DriveMode::kTorque, inside, 0.0, kBand).current_saturated);
    const MotorOutput below =
        EvaluateMotor(m, DriveMode::kTorque, sign * stall_Nm * (1 - 2e-6), 0.0, kBand);
    EXPECT_FALSE(below.current_saturated) << sign;
    EXPECT_FALSE(below.voltage_saturated) << sign;
  }
}

TEST(Motor, ATorqueCommandNeedingExactlyTheSupplySaturatesTheVoltage) {
  model::MotorModel m = MakeFrictionlessTestRobot().motor;
  m.current_limit_A = 10;  // the supply binds: V / R = 4.8 A
  // Stall torque 0.4 × 4.8 = 1.92 N·m; at rest the drive needs R i = 12 V, all of the supply.
  const double stall_Nm = TorquePerAmp(m) * m.supply_V / m.resistance_ohm;
  for (double sign : {1.0, -1.0}) {
    const MotorOutput at = EvaluateMotor(m, DriveMode::kTorque, sign * stall_Nm, 0.0, kBand);
    EXPECT_TRUE(at.voltage_saturated) << sign;
    EXPECT_FALSE(at.current_saturated) << sign;
    EXPECT_NEAR(at.voltage_V, sign * 12.0, 1e-12);
    const double inside = sign * stall_Nm * (1 - 0.5e-6);
    EXPECT_TRUE(EvaluateMotor(m, DriveMode::kTorque, inside, 0.0, kBand).voltage_saturated);
    const double below = sign * stall_Nm * (1 - 2e-6);
    EXPECT_FALSE(EvaluateMotor(m, DriveMode::kTorque, below, 0.0, kBand).voltage_saturated);
  }
}

TEST(Motor, AVoltageCommandAtTheSupplySaturates) {
  const model::MotorModel m = MakeFrictionlessTestRobot().motor;
  // At 10 rad/s the back-EMF is 5 V, so the full 12 V drives (12 − 5) / 2.5 = 2.8 A: the supply
  // is the only limit reached.
  for (double sign : {1.0, -1.0}) {
    const double speed = sign * 10.0;
    const MotorOutput at = EvaluateMotor(m, DriveMode::kVoltage, sign * m.supply_V, speed, kBand);
    EXPECT_TRUE(at.voltage_saturated) << sign;
    EXPECT_FALSE(at.current_saturated) << sign;
    EXPECT_NEAR(at.current_A, sign * 2.8, 1e-12);
    const double inside = sign * m.supply_V * (1 - 0.5e-6);
    EXPECT_TRUE(EvaluateMotor(m, DriveMode::kVoltage, inside, speed, kBand).voltage_saturated);
    const double below = sign * m.supply_V * (1 - 2e-6);
    EXPECT_FALSE(EvaluateMotor(m, DriveMode::kVoltage, below, speed, kBand).voltage_saturated);
  }
}

TEST(Motor, ViscousAndCoulombFrictionOpposeTheRotation) {
  const model::MotorModel m = MakeTestRobot().motor;  // b = 0.02 N·m·s/rad, c = 0.01 N·m
  // Zero torque command: no current, so only friction acts: −b ω − c sign(ω).
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kTorque, 0.0, 5.0, kBand).wheel_torque_Nm,
              -0.02 * 5 - 0.01, 1e-12);
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kTorque, 0.0, -5.0, kBand).wheel_torque_Nm,
              0.02 * 5 + 0.01, 1e-12);
  // Driving at 6 V and 1 rad/s: n η K_t (V − K_e n ω) / R − b ω − c = 0.16 × 5.5 − 0.03.
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kVoltage, 6.0, 1.0, kBand).wheel_torque_Nm,
              0.16 * 5.5 - 0.03, 1e-12);
  // At rest there is no friction torque (the smoothed sign is zero).
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kTorque, 0.0, 0.0, kBand).wheel_torque_Nm, 0, 1e-15);
}

TEST(Motor, CoulombFrictionRampsLinearlyInsideItsBand) {
  const model::MotorModel m = MakeTestRobot().motor;
  const double band = 0.01;
  // Half-way into the band: half the Coulomb torque, plus viscous.
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kTorque, 0.0, 0.005, band).wheel_torque_Nm,
              -0.5 * 0.01 - 0.02 * 0.005, 1e-12);
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kTorque, 0.0, -0.0025, band).wheel_torque_Nm,
              0.25 * 0.01 + 0.02 * 0.0025, 1e-12);
}

TEST(Motor, CoulombBandIsNarrowYetStableForTheExplicitStep) {
  const double inertia = 0.01, dt = 0.001;
  for (double c : {0.0, 0.001, 0.01, 0.5, 5.0}) {
    model::MotorModel m = MakeTestRobot().motor;
    m.coulomb_friction_Nm = c;
    const double band = MotorCoulombBand(m, inertia, dt);
    EXPECT_GE(band, 1e-3) << "c = " << c;  // header contract: at least 1e-3 rad/s
    // Inside the band friction is a damper of slope c / band; explicit Euler on I ω' = −k ω
    // is stable for k dt / I < 2 (numerical-methods handbook, from memory); ask for ≤ 0.5.
    EXPECT_LE(c / band * dt / inertia, 0.5 + 1e-12) << "c = " << c;
  }
  model::MotorModel m = MakeTestRobot().motor;
  m.coulomb_friction_Nm = 0;
  EXPECT_EQ(MotorCoulombBand(m, inertia, dt), 1e-3);
}

TEST(Motor, DriveModeNamesRoundTrip) {
  for (DriveMode mode : {DriveMode::kVoltage, DriveMode::kTorque}) {
    DriveMode parsed = mode == DriveMode::kVoltage ? DriveMode::kTorque : DriveMode::kVoltage;
    ASSERT_TRUE(FromString(ToString(mode), &parsed));
    EXPECT_EQ(parsed, mode);
  }
  DriveMode untouched = DriveMode::kTorque;
  EXPECT_FALSE(FromString("current", &untouched));
  EXPECT_EQ(untouched, DriveMode::kTorque);
}

// --- The motor driving a wheel in the plant, on the test stand (chassis held in the air) ---

// Left-wheel speeds relative to the chassis after each step (index 0 = the initial state) for
// a constant voltage on both motors.
std::vector<double> SpinUp(const model::RobotModel& model, double volts, double dt_s,
                           double duration_s) {
  PlantOptions options;
  options.dt_s = dt_s;
  options.fixed_chassis = true;
  options.sensor_noise = false;
  auto plant = MakePlant(model, options);
  if (!plant) return {};
  plant->SetCommand(volts, volts);
  std::vector<double> speeds{plant->truth().wheel_rate_rad_s[0]};
  const long steps = std::lround(duration_s / dt_s);
  for (long k = 0; k < steps; ++k) {
    plant->Step();
    EXPECT_EQ(plant->truth().wheel_rate_rad_s[0], plant->truth().wheel_rate_rad_s[1]);
    speeds.push_back(plant->truth().wheel_rate_rad_s[0]);
  }
  return speeds;
}

// Handbook motor on a free wheel: I ω' = n η K_t (V − K_e n ω) / R − b ω − c, so
// ω_ss = (n η K_t V / R − c) / (n² η K_t K_e / R + b) and τ = I R / (n² η K_t K_e + b R).
struct FirstOrder {
  double final_rad_s;
  double tau_s;
};

FirstOrder ExpectedSpinUp(const model::RobotModel& model, double volts) {
  const model::MotorModel& m = model.motor;
  const double k_drive = m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A;
  const double damping = k_drive * m.gear_ratio * m.back_emf_V_s_per_rad / m.resistance_ohm +
                         m.viscous_friction_Nm_s_per_rad;
  return {(k_drive * volts / m.resistance_ohm - m.coulomb_friction_Nm) / damping,
          model.wheel.spin_inertia_kgm2 / damping};
}

TEST(Motor, WheelOnTheStandReachesTheSteadyStateSpeed) {
  const model::RobotModel model = MakeTestRobot();
  const FirstOrder expected = ExpectedSpinUp(model, 6.0);  // 9.5 rad/s, τ = 0.1 s
  ASSERT_NEAR(expected.final_rad_s, 9.5, 1e-9);
  const auto speeds = SpinUp(model, 6.0, 0.001, 1.5);  // 15 τ: within 3e-7 of the end
  ASSERT_FALSE(speeds.empty());
  EXPECT_NEAR(speeds.back(), expected.final_rad_s, 0.005 * expected.final_rad_s);
}

TEST(Motor, FrictionlessWheelOnTheStandReachesTheNoLoadSpeed) {
  const model::RobotModel model = MakeFrictionlessTestRobot();
  const double no_load = 6.0 / (model.motor.gear_ratio * model.motor.back_emf_V_s_per_rad);
  // τ = I R / (n² η K_t K_e) = 0.125 s; 2 s is 16 τ.
  PlantOptions options;
  options.fixed_chassis = true;
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(6.0, 6.0);
  for (int k = 0; k < 2000; ++k) plant->Step();
  EXPECT_NEAR(plant->truth().wheel_rate_rad_s[0], no_load, 0.005 * no_load);
  EXPECT_NEAR(plant->motors()[0].current_A, 0.0, 0.01 * 6.0 / model.motor.resistance_ohm);
}

TEST(Motor, WheelOnTheStandStartsAtStallTorqueOverSpinInertia) {
  const model::RobotModel model = MakeTestRobot();
  const auto speeds = SpinUp(model, 6.0, 0.001, 0.001);
  ASSERT_EQ(speeds.size(), 2u);
  // α = n η K_t V / (R I) = 0.96 / 0.01 = 96 rad/s² (Newton's second law for rotation).
  const double expected = 0.96 / model.wheel.spin_inertia_kgm2;
  EXPECT_NEAR((speeds[1] - speeds[0]) / 0.001, expected, 0.01 * expected);
}

TEST(Motor, WheelOnTheStandStartsAtTheCurrentLimitWhenStallCurrentExceedsIt) {
  const model::RobotModel model = MakeTestRobot();
  const auto speeds = SpinUp(model, 12.0, 0.001, 0.001);  // 4.8 A wanted, 4 A allowed
  ASSERT_EQ(speeds.size(), 2u);
  const double expected = 0.4 * 4.0 / model.wheel.spin_inertia_kgm2;  // n η K_t I_max / I
  EXPECT_NEAR((speeds[1] - speeds[0]) / 0.001, expected, 0.01 * expected);
}

TEST(Motor, WheelOnTheStandFollowsTheFirstOrderTimeConstant) {
  const model::RobotModel model = MakeTestRobot();
  const FirstOrder expected = ExpectedSpinUp(model, 6.0);
  ASSERT_NEAR(expected.tau_s, 0.1, 1e-12);
  // ω(t) = ω_ss (1 − e^(−t/τ)): 63.2 % of the final speed at t = τ (first-order response).
  const double at_tau = expected.final_rad_s * (1 - std::exp(-1.0));
  double error_at[2] = {0, 0};
  const double dts[2] = {0.001, 0.0005};
  for (int i = 0; i < 2; ++i) {
    const auto speeds = SpinUp(model, 6.0, dts[i], expected.tau_s);
    ASSERT_FALSE(speeds.empty());
    EXPECT_NEAR(speeds.back(), at_tau, 0.02 * at_tau) << "dt " << dts[i];
    // The whole curve, not just one point: within 2 % of the final speed everywhere.
    for (size_t k = 0; k < speeds.size(); ++k) {
      const double t = static_cast<double>(k) * dts[i];
      const double ideal = expected.final_rad_s * (1 - std::exp(-t / expected.tau_s));
      ASSERT_NEAR(speeds[k], ideal, 0.02 * expected.final_rad_s) << "t " << t;
    }
    error_at[i] = std::abs(speeds.back() - at_tau);
  }
  // The remaining error is the explicit step's (about dt / 2τ): halving dt about halves it.
  EXPECT_GT(error_at[0], 1e-4 * at_tau);
  EXPECT_LT(error_at[1], 0.6 * error_at[0]);
  EXPECT_GT(error_at[1], 0.4 * error_at[0]);
}

TEST(Motor, PlantReportsTheMotorStateOfEachWheel) {
  const model::RobotModel model = MakeTestRobot();
  PlantOptions options;
  options.fixed_chassis = true;
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(6.0, -3.0);
  plant->Step();
  // The readout belongs to the step just taken, from rest: stall values of each command.
  EXPECT_NEAR(plant->motors()[0].current_A, 6.0 / 2.5, 1e-9);
  EXPECT_NEAR(plant->motors()[1].current_A, -3.0 / 2.5, 1e-9);
  EXPECT_NEAR(plant->motors()[0].wheel_torque_Nm, 0.96, 1e-9);
  EXPECT_NEAR(plant->motors()[1].wheel_torque_Nm, -0.48, 1e-9);
  EXPECT_GT(plant->truth().wheel_rate_rad_s[0], 0);
  EXPECT_LT(plant->truth().wheel_rate_rad_s[1], 0);
}

}  // namespace
}  // namespace upright::sim
