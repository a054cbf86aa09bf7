// Reference tracking of the built-in modules: the speed reference limited in acceleration and
// integrated, and the steady motion (lean and inputs) a reference asks for, against the equations
// of motion written out by hand.
#include "kit/tracking.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <string>

#include "succeeded.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::controllers {
namespace {

model::RobotModel Courier() {
  auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(Succeeded(loaded));
  return loaded.value_or(model::RobotModel{});
}

upright_reference Reference(double speed, double yaw_rate) {
  upright_reference r{};
  r.struct_size = sizeof r;
  r.forward_speed_m_s = speed;
  r.yaw_rate_rad_s = yaw_rate;
  return r;
}

TEST(ReferenceTracker, RampsTheSpeedAtTheAccelerationLimitAndIntegratesIt) {
  const double period = 0.01, accel = 0.5;
  ReferenceTracker tracker(period, accel);
  double x_ref = 0, speed = 0;
  for (int k = 0; k < 300; ++k) {
    ASSERT_EQ(tracker.Follow(Reference(1.0, 0.2)), nullptr);
    EXPECT_NEAR(tracker.x_ref_m(), x_ref, 1e-12) << "tick " << k;
    speed = std::min(1.0, speed + accel * period);
    EXPECT_NEAR(tracker.speed_m_s(), speed, 1e-12) << "tick " << k;
    EXPECT_NEAR(tracker.accel_m_s2(), k < 200 ? accel : 0, 1e-9) << "tick " << k;
    EXPECT_NEAR(tracker.yaw_ref_rad(), 0.2 * period * k, 1e-12) << "tick " << k;
    x_ref += speed * period;
  }
  design::StateVector state, error;
  state << 3, 1.2, 0.01, 0.02, 0.7, 0.3;
  tracker.Error(state, &error);
  design::StateVector expected;
  expected << 3 - tracker.x_ref_m(), 0.2, 0.01, 0.02, 0.7 - tracker.yaw_ref_rad(), 0.1;
  EXPECT_LT((error - expected).norm(), 1e-12);
}

TEST(ReferenceTracker, RefusesANonFiniteReference) {
  ReferenceTracker tracker(0.01, 0.5);
  EXPECT_NE(tracker.Follow(Reference(std::nan(""), 0)), nullptr);
  EXPECT_NE(tracker.Follow(Reference(0, INFINITY)), nullptr);
}

TEST(SteadyMotion, LeansAndPushesAsTheEquationsOfMotionSayWhileAccelerating) {
  // Planar robot, θ̈ = 0 and ẍ = a (linear_model.hpp's equations, by hand):
  //   M_x a = u / r and m_b L a = m_b g L θ − u, so u = M_x r a, θ = a / g (1 + M_x r / (m_b L)),
  // with M_x = m_b + 2 m_w + 2 I_w / r² and m_b, L the lumped chassis and parcel.
  const model::RobotModel model = Courier();
  const design::LinearModel plant = design::Linearise(model, design::InputKind::kTorque);
  const double mb = model.chassis.mass_kg + model.payload.mass_kg;
  const double L = (model.chassis.mass_kg * model.chassis.com_height_m +
                    model.payload.mass_kg * model.payload.z_m) /
                   mb;
  const double r = model.wheel.radius_m;
  const double mx = mb + 2 * model.wheel.mass_kg + 2 * model.wheel.spin_inertia_kgm2 / (r * r);
  const double a = 0.5;
  double pitch = 0;
  Eigen::Vector2d input;
  SteadyMotion::Of(plant).value().For(0.3, a, 0, &pitch, &input);
  EXPECT_NEAR(pitch, a / model::kStandardGravity_m_s2 * (1 + mx * r / (mb * L)), 1e-9);
  EXPECT_NEAR(input(0), mx * r * a / 2, 1e-9);
  EXPECT_NEAR(input(1), mx * r * a / 2, 1e-9);
}

TEST(SteadyMotion, NeedsNoTorqueAtConstantSpeedAndTheBackEmfVoltageOnTheVoltageModel) {
  const model::RobotModel model = Courier();
  double pitch = 1;
  Eigen::Vector2d input;
  SteadyMotion::Of(design::Linearise(model, design::InputKind::kTorque))
      .value()
      .For(0.5, 0, 0.4, &pitch, &input);
  EXPECT_NEAR(pitch, 0, 1e-12);
  EXPECT_LT(input.norm(), 1e-12);
  // Rolling at v, each motor turns at n v / r: zero torque needs V = (n K_e + b R / (n η K_t))
  // v / r (DC motor equations of motor.hpp, b the viscous friction at the wheel) = 3.7806 V
  // for the courier at 0.5 m/s.
  const model::MotorModel& m = model.motor;
  const double v = 0.5, r = model.wheel.radius_m;
  const double volts = (m.gear_ratio * m.back_emf_V_s_per_rad +
                        m.viscous_friction_Nm_s_per_rad * m.resistance_ohm /
                            (m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A)) *
                       v / r;
  ASSERT_NEAR(volts, 3.7806, 1e-4);
  SteadyMotion::Of(design::Linearise(model, design::InputKind::kVoltage))
      .value()
      .For(v, 0, 0, &pitch, &input);
  EXPECT_NEAR(pitch, 0, 1e-9);
  EXPECT_NEAR(input(0), volts, 1e-9);
  EXPECT_NEAR(input(1), volts, 1e-9);
}

}  // namespace
}  // namespace upright::controllers
