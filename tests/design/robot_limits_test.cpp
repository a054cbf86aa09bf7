// What the robot can do: the tilt at which its chassis outline meets flat ground (against the
// corner geometry worked by hand), the acceptable tilt the weights take from it, and the motor
// current a wheel input draws on the linear model.
#include "upright/design/robot_limits.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <string>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/model/conventions.hpp"
#include "upright/sim/motor.hpp"

namespace upright::design {
namespace {

// A demo robot with the outline and wheel radius of the test instead of its own.
model::RobotModel WithOutline(double front, double rear, double bottom, double top, double radius) {
  model::RobotModel m = Demo("tabletop.xml");
  m.chassis.outline_front_m = front;
  m.chassis.outline_rear_m = rear;
  m.chassis.outline_bottom_m = bottom;
  m.chassis.outline_top_m = top;
  m.wheel.radius_m = radius;
  return m;
}

TEST(GroundContact, ABoxMeetsTheGroundAtItsLowerCornerAsWorkedByHand) {
  // Leaning back by φ, the rear-bottom corner (x, z) = (−a, −b) is r − a sin φ − b cos φ above
  // the ground (axle at r; pitch θ = −φ in r + z cos θ − x sin θ). It touches where
  // a sin φ + b cos φ = r, i.e. √(a² + b²) sin(φ + atan(b/a)) = r:
  // φ = asin(r / √(a² + b²)) − atan(b / a) (trigonometry, derived by hand). The box is symmetric,
  // so leaning forward the front-bottom corner touches at the same tilt; the top corners only
  // far beyond it.
  const double a = 0.32, b = 0.10, r = 0.16;
  const double phi = std::asin(r / std::hypot(a, b)) - std::atan(b / a);  // 0.19463 rad, 11.15°
  const GroundContactTilt tilt = GroundContact(WithOutline(a, -a, -b, 0.65, r), 0);
  EXPECT_NEAR(tilt.backward_rad, phi, 1e-12);
  EXPECT_NEAR(tilt.forward_rad, phi, 1e-12);
  EXPECT_NEAR(tilt.smallest_rad(), phi, 1e-12);
}

TEST(GroundContact, AWayNoCornerReachesCountsAsLyingFlat) {
  // A box reaching far back and hardly forward: back, the rear-bottom corner (−0.4, −0.02)
  // touches at asin(0.1 / √(0.4² + 0.02²)) − atan(0.02 / 0.4), long before the rear-top one
  // (0.4 sin φ − 0.3 cos φ = 0.1: φ = asin(0.2) + atan(0.3 / 0.4), 48°). Forward, the front-bottom
  // corner lies within the wheel (√(0.05² + 0.02²) < r) and never touches; the front-top corner
  // (0.05, 0.3) only past 90° (√(0.05² + 0.3²) cos(θ + atan(0.05 / 0.3)) = −0.1 at θ = 99.7°);
  // the rear ones, leaning forward, rise. So forward counts as 90°. All derived by hand.
  const double r = 0.1;
  const GroundContactTilt tilt = GroundContact(WithOutline(0.05, -0.4, -0.02, 0.3, r), 0);
  EXPECT_NEAR(tilt.backward_rad, std::asin(r / std::hypot(0.4, 0.02)) - std::atan(0.02 / 0.4),
              1e-12);
  EXPECT_NEAR(tilt.forward_rad, std::numbers::pi / 2, 1e-12);
  EXPECT_NEAR(tilt.smallest_rad(), tilt.backward_rad, 0);
}

TEST(GroundContact, IsMeasuredFromTheEquilibriumPitch) {
  // The contact pitches stay where the geometry puts them (±φ for the symmetric box); the tilts
  // are their distances from the equilibrium ε: φ − ε forward, φ + ε back.
  const double a = 0.32, b = 0.10, r = 0.16, eps = 0.05;
  const double phi = std::asin(r / std::hypot(a, b)) - std::atan(b / a);
  const GroundContactTilt tilt = GroundContact(WithOutline(a, -a, -b, 0.65, r), eps);
  EXPECT_NEAR(tilt.forward_rad, phi - eps, 1e-12);
  EXPECT_NEAR(tilt.backward_rad, phi + eps, 1e-12);
}

TEST(GroundContact, ACornerOnTheGroundAtTheEquilibriumLeavesNoTiltAndNoDefaultWeight) {
  // At ε = −0.5 rad the rear-bottom corner is 0.16 − 0.32 sin 0.5 − 0.10 cos 0.5 = −0.081 m
  // above the ground: below it.
  const model::RobotModel m = WithOutline(0.32, -0.32, -0.10, 0.65, 0.16);
  const GroundContactTilt tilt = GroundContact(m, -0.5);
  EXPECT_EQ(tilt.forward_rad, 0);
  EXPECT_EQ(tilt.backward_rad, 0);
  const Result<DesignWeights> weights = WeightsForRobot(DesignWeights{}, m, -0.5);
  ASSERT_FALSE(weights);
  EXPECT_NE(FailureOf(weights).find("set max_tilt_deg"), std::string::npos) << FailureOf(weights);
  // A tilt given needs nothing from the outline.
  DesignWeights given;
  given.max_tilt_deg = 4;
  ASSERT_TRUE(Succeeded(WeightsForRobot(given, m, -0.5)));
}

TEST(WeightsForRobot, TakesAFifthOfTheGroundContactTiltUnlessTheTiltIsGiven) {
  const double a = 0.32, b = 0.10, r = 0.16;
  const double phi = std::asin(r / std::hypot(a, b)) - std::atan(b / a);
  const model::RobotModel m = WithOutline(a, -a, -b, 0.65, r);
  DesignWeights asked;
  asked.max_drift_m = 0.7;
  const Result<DesignWeights> resolved = WeightsForRobot(asked, m, 0);
  ASSERT_TRUE(Succeeded(resolved));
  EXPECT_NEAR(resolved->max_tilt_deg, 0.2 * phi * 180 / std::numbers::pi, 1e-12);
  EXPECT_EQ(resolved->max_drift_m, 0.7);  // the other fields untouched
  EXPECT_EQ(resolved->max_input_fraction, asked.max_input_fraction);
  asked.max_tilt_deg = 4;
  EXPECT_EQ(WeightsForRobot(asked, m, 0).value().max_tilt_deg, 4);  // given: it wins
}

TEST(MotorCurrent, TorqueInputDrawsTheCurrentOfTheTorqueAndVoltageInputOhmsLaw) {
  // Torque drive: i = τ / (n η K_t); voltage: i = (V − n K_e ω_rel) / R, ω_rel the wheel's speed
  // relative to the chassis (DC motor equations, handbook, from memory) — the plant's motor
  // gives the same current for the same command and relative speed.
  const model::RobotModel m = Demo("courier.xml");
  const model::MotorModel& mo = m.motor;
  const CurrentMap torque = MotorCurrent(m, InputKind::kTorque);
  EXPECT_NEAR(torque.per_input,
              1 / (mo.gear_ratio * mo.gear_efficiency * mo.torque_constant_Nm_per_A), 1e-15);
  EXPECT_EQ(torque.per_state.norm(), 0);
  const CurrentMap voltage = MotorCurrent(m, InputKind::kVoltage);
  // A state rolling forward at 0.4 m/s, pitching at 0.3 rad/s and turning left at 0.5 rad/s.
  StateVector x;
  x << 0, 0.4, 0, 0.3, 0, 0.5;
  const double r = m.wheel.radius_m, d = m.wheel.track_m / 2;
  const double rel[2] = {(0.4 - d * 0.5) / r - 0.3, (0.4 + d * 0.5) / r - 0.3};
  const double volts = 3;
  for (int wheel : {model::kLeft, model::kRight}) {
    const double i = voltage.per_input * volts + voltage.per_state.row(wheel).dot(x);
    EXPECT_NEAR(i,
                (volts - mo.gear_ratio * mo.back_emf_V_s_per_rad * rel[wheel]) / mo.resistance_ohm,
                1e-12);
    const sim::MotorOutput plant =
        sim::EvaluateMotor(mo, sim::DriveMode::kVoltage, volts, rel[wheel], 1e-3);
    EXPECT_NEAR(i, plant.current_A, 1e-12) << "wheel " << wheel;
  }
}

}  // namespace
}  // namespace upright::design
