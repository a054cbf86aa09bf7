// The linearised robot against its own nonlinear equations (finite differences) and against the
// Bullet plant (small motions), plus its structure: decoupled yaw, pendulum limit, voltage input.
#include "upright/design/linear_model.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/model/conventions.hpp"
#include "upright/sim/plant.hpp"

namespace upright::design {
namespace {

// The demo robot without the losses the linear model leaves out (motor friction, rolling
// resistance), for comparisons with the plant.
model::RobotModel Lossless(model::RobotModel m) {
  m.motor.coulomb_friction_Nm = 0;
  m.motor.viscous_friction_Nm_s_per_rad = 0;
  m.wheel.rolling_resistance = 0;
  return m;
}

// A robot with round numbers and a forward COM offset, so the equilibrium is tilted.
model::RobotModel OffsetRobot() {
  model::RobotModel m = Demo("tabletop.xml");
  m.chassis.com_forward_m = 0.01;
  return m;
}

TEST(LinearModel, MatchesFiniteDifferencesOfTheNonlinearEquations) {
  // Central differences of f(x, u, w) about the equilibrium (h = 1e-6) against (A, B, E): the
  // analytic linearisation must agree to the differencing error, ~1e-8 relative.
  for (const model::RobotModel& model : {Demo("courier.xml"), OffsetRobot()}) {
    const LinearModel lm = Linearise(model, InputKind::kTorque, 0.2);
    StateVector x0 = StateVector::Zero();
    x0(kPitch) = lm.equilibrium_pitch_rad;
    const Eigen::Vector2d u0 = Eigen::Vector2d::Zero(), w0 = Eigen::Vector2d::Zero();
    const StateVector f0 = NonlinearDerivative(model, x0, u0, w0, 0.2);
    EXPECT_LT(f0.norm(), 1e-12) << "the equilibrium must be one";
    const double h = 1e-6;
    auto expect_column = [&](const StateVector& fd, const StateVector& analytic, const char* what) {
      EXPECT_LT((fd - analytic).norm(), 1e-7 * std::max(1.0, analytic.norm())) << what;
    };
    for (int j = 0; j < kStates; ++j) {
      StateVector dx = StateVector::Zero();
      dx(j) = h;
      const StateVector fd = (NonlinearDerivative(model, x0 + dx, u0, w0, 0.2) -
                              NonlinearDerivative(model, x0 - dx, u0, w0, 0.2)) / (2 * h);
      expect_column(fd, lm.A.col(j), StateName(j));
    }
    for (int j = 0; j < kInputs; ++j) {
      const Eigen::Vector2d du = Eigen::Vector2d::Unit(j) * h;
      const StateVector fd = (NonlinearDerivative(model, x0, u0 + du, w0, 0.2) -
                              NonlinearDerivative(model, x0, u0 - du, w0, 0.2)) / (2 * h);
      expect_column(fd, lm.B.col(j), "input");
    }
    for (int j = 0; j < kDisturbances; ++j) {
      const Eigen::Vector2d dw = Eigen::Vector2d::Unit(j) * h;
      const StateVector fd = (NonlinearDerivative(model, x0, u0, w0 + dw, 0.2) -
                              NonlinearDerivative(model, x0, u0, w0 - dw, 0.2)) / (2 * h);
      expect_column(fd, lm.E.col(j), "disturbance");
    }
  }
}

TEST(LinearModel, OpenLoopPolesAreZeroZeroAndPlusMinusTheFallRate) {
  // Open-loop poles 0, 0, ±√(M_x m_b g l / Δ) for the pitch/drive block, and 0, 0 for yaw
  // (derived by hand from the linearised equations of motion in linear_model.cpp: the A block
  // [0 1 0 0; 0 0 a 0; 0 0 0 1; 0 0 λ² 0] has characteristic polynomial s²(s² − λ²)).
  const LinearModel lm = Linearise(Demo("courier.xml"), InputKind::kTorque);
  Eigen::VectorXcd poles = lm.A.eigenvalues();
  std::vector<double> re;
  for (int i = 0; i < poles.size(); ++i) {
    EXPECT_NEAR(poles(i).imag(), 0, 1e-9);
    re.push_back(poles(i).real());
  }
  std::sort(re.begin(), re.end());
  EXPECT_NEAR(re.front(), -lm.fall_rate_1_s, 1e-9);
  EXPECT_NEAR(re.back(), lm.fall_rate_1_s, 1e-9);
  for (int i = 1; i < 5; ++i) EXPECT_NEAR(re[i], 0, 1e-9);
}

TEST(LinearModel, YawIsDecoupledFromPitchAndDrive) {
  // Equal torques do not turn the robot; opposite torques do not drive or pitch it.
  const LinearModel lm = Linearise(Demo("courier.xml"), InputKind::kTorque);
  EXPECT_NEAR(lm.B(kYawRate, model::kLeft) + lm.B(kYawRate, model::kRight), 0, 1e-12);
  EXPECT_NEAR(lm.B(kXDot, model::kLeft) - lm.B(kXDot, model::kRight), 0, 1e-12);
  EXPECT_NEAR(lm.B(kPitchRate, model::kLeft) - lm.B(kPitchRate, model::kRight), 0, 1e-12);
  EXPECT_GT(lm.B(kYawRate, model::kRight), 0);  // right wheel forward turns left (conventions.hpp)
  for (int i : {kX, kXDot, kPitch, kPitchRate}) {
    EXPECT_EQ(lm.A(i, kYaw), 0);
    EXPECT_EQ(lm.A(i, kYawRate), 0);
    EXPECT_EQ(lm.A(kYawRate, i), 0);
  }
}

TEST(LinearModel, HeavyWheelsLeaveAPendulumOnAFixedAxle) {
  // As M_x → ∞ the axle stops moving and the pitch equation becomes a pendulum on a fixed pivot:
  // λ² → m_b g l / (I_b + m_b l²) (compound pendulum on a fixed pivot, mechanics handbook, from
  // memory).
  model::RobotModel m = Demo("tabletop.xml");
  m.wheel.mass_kg = 1e9;
  m.wheel.spin_inertia_kgm2 = 0.5 * 1e9 * m.wheel.radius_m * m.wheel.radius_m;
  m.wheel.diameter_inertia_kgm2 = 1e9;
  const LinearModel lm = Linearise(m, InputKind::kTorque);
  const LumpedBody& b = lm.body;
  const double pendulum = b.mass_kg * model::kStandardGravity_m_s2 * b.com_height_m /
                          (b.pitch_inertia_kgm2 + b.mass_kg * b.com_height_m * b.com_height_m);
  EXPECT_NEAR(lm.fall_rate_1_s * lm.fall_rate_1_s / pendulum, 1.0, 1e-6);
}

TEST(LinearModel, VoltageInputAddsBackEmfDampingOnTheRelativeWheelSpeed) {
  // τ = (n η K_t / R) V − (n² η K_t K_e / R + b) ω_rel, ω_rel = ẋ/r − θ̇ for both wheels in
  // straight motion (DC motor equations, handbook, from memory). A state that moves the wheel
  // relative to the chassis must brake it; tilting the chassis with the axle still must also.
  const model::RobotModel model = Demo("courier.xml");
  const LinearModel torque = Linearise(model, InputKind::kTorque);
  const LinearModel voltage = Linearise(model, InputKind::kVoltage);
  const model::MotorModel& m = model.motor;
  const double k_v = m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A / m.resistance_ohm;
  const double c_m = m.gear_ratio * m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A *
                         m.back_emf_V_s_per_rad / m.resistance_ohm + m.viscous_friction_Nm_s_per_rad;
  EXPECT_NEAR(voltage.B(kXDot, model::kLeft) / torque.B(kXDot, model::kLeft), k_v, 1e-12 * k_v);
  const double r = model.wheel.radius_m;
  // d(ẍ)/d(ẋ) = −2 c_m / r · B_τ(ẍ); d(ẍ)/d(θ̇) = +2 c_m · B_τ(ẍ).
  EXPECT_NEAR(voltage.A(kXDot, kXDot), -2 * c_m / r * torque.B(kXDot, model::kLeft), 1e-12);
  EXPECT_NEAR(voltage.A(kXDot, kPitchRate), 2 * c_m * torque.B(kXDot, model::kLeft), 1e-12);
  EXPECT_LT(voltage.A(kYawRate, kYawRate), 0);
}

// Runs the plant from rest with constant wheel torques and returns the true state after t_s.
sim::TrueState PlantAfter(const model::RobotModel& model, double t_s, double left_Nm,
                          double right_Nm) {
  sim::PlantOptions options;
  options.drive = sim::DriveMode::kTorque;
  options.sensor_noise = false;
  auto built = sim::Plant::Create(model, options);
  EXPECT_TRUE(Succeeded(built));
  const std::unique_ptr<sim::Plant> plant = std::move(built.value());
  plant->SetCommand(left_Nm, right_Nm);
  for (long i = 0, n = std::lround(t_s / options.dt_s); i < n; ++i) plant->Step();
  return plant->truth();
}

TEST(LinearModel, PredictsThePlantsYawResponseToOppositeTorques) {
  // Opposite torques ±τ turn the robot at ψ̈ = 2 d τ / (r J_ψ); after t, ψ = ½ ψ̈ t². The plant
  // (rolling wheels with friction, rigid bodies) must agree within 2 % (common practice: the
  // margin the torque-step check in robot_physics_test.cpp allows).
  const model::RobotModel model = Lossless(Demo("tabletop.xml"));
  const LinearModel lm = Linearise(model, InputKind::kTorque);
  const double tau = 0.005, t = 0.2;
  const double predicted = 0.5 * 2 * lm.B(kYawRate, model::kRight) * tau * t * t;
  const sim::TrueState s = PlantAfter(model, t, -tau, tau);
  EXPECT_GT(s.yaw_rad, 0);
  EXPECT_NEAR(s.yaw_rad / predicted, 1.0, 0.02);
}

TEST(LinearModel, PredictsThePlantsPitchResponseToATorqueStep) {
  // θ(t) = b_θ u / λ² (cosh λt − 1) from rest (linear model); tolerance 2 % at 0.1 s (common
  // practice, as in robot_physics_test.cpp). The demo courier's parcel rides on its carriage, as
  // the lumped body assumes.
  const model::RobotModel model = Lossless(Demo("courier.xml"));
  const LinearModel lm = Linearise(model, InputKind::kTorque);
  const double tau = 1.0, t = 0.1, lambda = lm.fall_rate_1_s;
  const double b_theta = lm.B(kPitchRate, model::kLeft) + lm.B(kPitchRate, model::kRight);
  const double predicted = b_theta * tau / (lambda * lambda) * (std::cosh(lambda * t) - 1);
  const sim::TrueState s = PlantAfter(model, t, tau, tau);
  EXPECT_NEAR(s.pitch_rad / predicted, 1.0, 0.02);
}

}  // namespace
}  // namespace upright::design
