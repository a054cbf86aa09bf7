// The whole robot in the plant against the planar wheeled-inverted-pendulum equations: falling
// from a small tilt and answering a wheel-torque step, as the linearised model predicts within
// stated tolerances, and as the nonlinear equations (integrated finely here) predict with an
// error that shrinks when the physics step is halved.
#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <functional>

#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "test_robot.hpp"
#include "upright/sim/plant.hpp"

namespace upright::sim {
namespace {

constexpr double kG = model::kStandardGravity_m_s2;

// The plain test robot without motor friction (rolling resistance is already zero), so the
// plant obeys the same frictionless equations as the reference.
model::RobotModel PendulumRobot() { return testing::MakeFrictionlessTestRobot(); }

// Planar wheeled inverted pendulum, wheels rolling without slip, states [x, ẋ, θ, θ̇], total wheel
// torque u (derived by hand from Lagrange's equations, motor torque +τ on the wheel and −τ on the
// body; cross-check Pathak, Franch and Agrawal, IEEE Trans. Robotics 21(3), 2005, from memory):
//   M_x ẍ + m_b l (cosθ θ̈ − sinθ θ̇²) = u / r
//   m_b l cosθ ẍ + J_θ θ̈ − m_b g l sinθ = −u
struct Pendulum {
  double mb, l, jt, mx, r;
  explicit Pendulum(const model::RobotModel& m)
      : mb(m.chassis.mass_kg),
        l(m.chassis.com_height_m),
        jt(m.chassis.pitch_inertia_kgm2 + mb * l * l),
        mx(mb + 2 * m.wheel.mass_kg +
           2 * m.wheel.spin_inertia_kgm2 / (m.wheel.radius_m * m.wheel.radius_m)),
        r(m.wheel.radius_m) {}
  double delta() const { return mx * jt - mb * mb * l * l; }
  double lambda() const { return std::sqrt(mx * mb * kG * l / delta()); }  // falling rate, 1/s
  double b_pitch() const { return -(mx * r + mb * l) / (r * delta()); }    // θ̈ per unit u

  using State = std::array<double, 4>;
  State Derivative(const State& s, double u) const {
    const double c = std::cos(s[2]), sn = std::sin(s[2]);
    const double a11 = mx, a12 = mb * l * c, a22 = jt;
    const double f1 = u / r + mb * l * sn * s[3] * s[3], f2 = mb * kG * l * sn - u;
    const double det = a11 * a22 - a12 * a12;
    return {s[1], (a22 * f1 - a12 * f2) / det, s[3], (a11 * f2 - a12 * f1) / det};
  }
  // θ(t) by classical fourth-order Runge–Kutta with a 10 µs step.
  double PitchAt(double t_end, double theta0, double u) const {
    State s{0, 0, theta0, 0};
    const double h = 1e-5;
    for (long i = 0, n = std::lround(t_end / h); i < n; ++i) {
      auto add = [](const State& a, const State& b, double k) {
        return State{a[0] + k * b[0], a[1] + k * b[1], a[2] + k * b[2], a[3] + k * b[3]};
      };
      const State k1 = Derivative(s, u), k2 = Derivative(add(s, k1, h / 2), u);
      const State k3 = Derivative(add(s, k2, h / 2), u), k4 = Derivative(add(s, k3, h), u);
      for (int j = 0; j < 4; ++j) s[j] += h / 6 * (k1[j] + 2 * k2[j] + 2 * k3[j] + k4[j]);
    }
    return s[2];
  }
};

// Pitch of the plant robot after t_end with a constant torque per wheel, from pitch theta0.
double PlantPitchAt(double dt, double t_end, double theta0, double torque_per_wheel_Nm) {
  PlantOptions options;
  options.dt_s = dt;
  options.drive = DriveMode::kTorque;
  options.sensor_noise = false;
  options.initial.pitch_rad = theta0;
  auto plant = testing::MakePlant(PendulumRobot(), options);
  if (!plant) return NAN;
  plant->SetCommand(torque_per_wheel_Nm, torque_per_wheel_Nm);
  for (long i = 0, n = std::lround(t_end / dt); i < n; ++i) plant->Step();
  return plant->truth().pitch_rad;
}

TEST(RobotPhysics, UnpoweredRobotFallsAsThetaZeroCoshLambdaT) {
  // Linearised: θ(t) = θ0 cosh(λ t), λ² = M_x m_b g l / Δ (derived by hand from the equations
  // above with sinθ ≈ θ, cosθ ≈ 1, θ̇² ≈ 0). Tolerance 1 % at 0.25 s (common practice: a margin
  // over the linearisation and step errors together; seen: 0.26 %).
  const Pendulum p(PendulumRobot());
  const double theta0 = 0.01, t = 0.25;
  const double linear = theta0 * std::cosh(p.lambda() * t);
  EXPECT_NEAR(PlantPitchAt(0.001, t, theta0, 0) / linear, 1.0, 0.01);
}

TEST(RobotPhysics, WheelTorqueStepPitchesTheChassisBackAsTheLinearModelSays) {
  // Linearised with θ0 = 0: θ(t) = (b_θ u / λ²)(cosh λt − 1), b_θ < 0: a positive wheel torque
  // pitches the chassis back (derived by hand, as above). Tolerance 2 % at 0.1 s (common practice;
  // seen: 1.0 %).
  const Pendulum p(PendulumRobot());
  const double torque = 0.5, u = 2 * torque, t = 0.1;
  const double lambda = p.lambda();
  const double linear = p.b_pitch() * u / (lambda * lambda) * (std::cosh(lambda * t) - 1);
  const double pitch = PlantPitchAt(0.001, t, 0, torque);
  EXPECT_LT(pitch, 0);
  EXPECT_NEAR(pitch / linear, 1.0, 0.02);
}

TEST(RobotPhysics, PlantConvergesToTheNonlinearEquationsAsTheStepShrinks) {
  // Against the nonlinear equations, at a tilt where sinθ ≠ θ matters (θ ≈ 0.2 rad by 0.5 s), the
  // plant's error comes from its semi-implicit Euler step and shrinks when dt is halved.
  const Pendulum p(PendulumRobot());
  struct Case {
    double t, theta0, torque;
  };
  for (const Case c : {Case{0.5, 0.01, 0.0}, Case{0.25, 0.0, 0.5}}) {
    const double reference = p.PitchAt(c.t, c.theta0, 2 * c.torque);
    double error[2];
    for (int k = 0; k < 2; ++k) {
      const double dt = 0.001 / (1 << k);
      error[k] = std::abs(PlantPitchAt(dt, c.t, c.theta0, c.torque) / reference - 1);
      EXPECT_LT(error[k], 0.01) << "t = " << c.t << ", dt = " << dt;
    }
    EXPECT_LT(error[1], 0.6 * error[0]) << "t = " << c.t;  // seen: 3.0e-3 → 1.5e-3
  }
}

}  // namespace
}  // namespace upright::sim
