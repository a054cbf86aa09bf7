// The twin's linear robot stepped by an exact zero-order hold: the open-loop fall from a tilt
// against the inverted pendulum's cosh law, and a push's impulse against the momentum it must add.
#include "upright/runner/twin/twin_dynamics.hpp"

#include <gtest/gtest.h>

#include <Eigen/Eigenvalues>
#include <cmath>
#include <numbers>

#include "succeeded.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::runner {
namespace {

using design::kPitch, design::kPitchRate, design::kX, design::kXDot;

model::RobotModel Courier() {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(Succeeded(loaded));
  return loaded.value_or(model::RobotModel{});
}

// The unstable eigenvalue of A: its largest real part.
double UnstablePole(const design::StateMatrix& A) {
  const Eigen::EigenSolver<design::StateMatrix> solver(A);
  double largest = -1e300;
  for (int i = 0; i < design::kStates; ++i)
    largest = std::max(largest, solver.eigenvalues()(i).real());
  return largest;
}

TEST(TwinDynamics, AnUncontrolledTiltGrowsAsCoshOfTheUnstablePole) {
  const model::RobotModel model = Courier();
  const double dt_s = 0.001;
  const TwinDynamics twin(model, design::InputKind::kTorque, dt_s, {});
  const double lambda = UnstablePole(twin.linear().A);
  ASSERT_GT(lambda, 1.0);
  EXPECT_NEAR(lambda, twin.linear().fall_rate_1_s, 1e-9 * lambda);
  // An inverted pendulum released at rest from θ0 with no input: θ̈ = λ² θ, so
  // θ(t) = θ0 cosh(λ t) (the linearised inverted pendulum; any dynamics textbook, from memory).
  // With no wheel torque the pitch row of the linear robot does not depend on x, so the law holds
  // for the whole robot; the hold is exact, so only round-off separates the two.
  const double theta0_rad = 0.02;
  design::StateVector x = design::StateVector::Zero();
  x(kPitch) = theta0_rad;
  for (long step = 0; step < 500; ++step) {
    twin.Step(step, Eigen::Vector2d::Zero(), &x);
    const double t_s = static_cast<double>(step + 1) * dt_s;
    const double expected = theta0_rad * std::cosh(lambda * t_s);
    ASSERT_NEAR(x(kPitch), expected, 1e-6 * expected) << "t = " << t_s;
    ASSERT_NEAR(x(kPitchRate), theta0_rad * lambda * std::sinh(lambda * t_s),
                1e-6 * expected * lambda)
        << "t = " << t_s;
  }
}

// M_x ẋ + m_b L θ̇: the generalised momentum of the position coordinate. x is cyclic in the
// robot's Lagrangian, so with no wheel torque it changes only by the pushes' impulse along x
// (Lagrange's equations, d/dt ∂T/∂ẋ = Q_x; mechanics handbook, from memory).
double Momentum(const model::RobotModel& model, const design::StateVector& x) {
  const design::LumpedBody body = design::LumpBody(model);
  const model::WheelModel& w = model.wheel;
  const double mx =
      body.mass_kg + 2 * w.mass_kg + 2 * w.spin_inertia_kgm2 / (w.radius_m * w.radius_m);
  const double mbl = body.mass_kg * std::hypot(body.com_height_m, body.com_forward_m);
  return mx * x(kXDot) + mbl * x(kPitchRate);
}

TEST(TwinDynamics, APushAddsItsImpulseAlongXWhateverItsTimingAndHeight) {
  const model::RobotModel model = Courier();
  sim::Push shove;
  shove.shape = sim::PushShape::kHalfSine;
  shove.start_s = 0.0123;  // between physics steps
  shove.duration_s = 0.1;
  shove.peak_N = 100;
  shove.height_m = 0.5;
  sim::Push slanted = shove;
  slanted.start_s = 0.2;
  slanted.direction_deg = 60;  // half of it along x
  slanted.height_m = -0.05;    // below the axle
  const TwinDynamics twin(model, design::InputKind::kTorque, 0.001, {shove, slanted});
  // A half-sine of peak F over T delivers 2 F T / π (∫ sin).
  const double impulse_Ns = 2 * 100 * 0.1 / std::numbers::pi;
  design::StateVector x = design::StateVector::Zero();
  for (long step = 0; step < 150; ++step) twin.Step(step, Eigen::Vector2d::Zero(), &x);
  EXPECT_NEAR(Momentum(model, x), impulse_Ns, 1e-9 * impulse_Ns);
  for (long step = 150; step < 400; ++step) twin.Step(step, Eigen::Vector2d::Zero(), &x);
  EXPECT_NEAR(Momentum(model, x), 1.5 * impulse_Ns, 1e-9 * impulse_Ns);
}

TEST(TwinDynamics, EachPushEntersThroughTheLinearModelAtItsOwnHeight) {
  const model::RobotModel model = Courier();
  for (const auto input : {design::InputKind::kTorque, design::InputKind::kVoltage}) {
    sim::Push step_push;
    step_push.shape = sim::PushShape::kStep;
    step_push.start_s = 0;
    step_push.duration_s = 1;
    step_push.peak_N = 10;
    step_push.height_m = 0.42;
    const TwinDynamics twin(model, input, 0.001, {step_push});
    design::StateVector x = design::StateVector::Zero();
    x(kPitch) = 0.01;
    const Eigen::Vector2d u(0.5, -0.25);
    const design::LinearModel at_height = design::Linearise(model, input, 0.42);
    const design::StateVector expected =
        at_height.A * x + at_height.B * u + at_height.E.col(0) * 10;
    EXPECT_LT((twin.Derivative(x, u, 3) - expected).norm(), 1e-12 * expected.norm());
    // Before the first step nothing pushes.
    const design::StateVector quiet = at_height.A * x + at_height.B * u;
    EXPECT_LT((twin.Derivative(x, u, -1) - quiet).norm(), 1e-12 * quiet.norm());
  }
}

}  // namespace
}  // namespace upright::runner
