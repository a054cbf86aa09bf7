#include "upright/design/pid.hpp"

#include <cmath>
#include <numbers>
#include <sstream>

#include "upright/model/conventions.hpp"

namespace upright::design {

namespace {

// Coefficients c3..c0 of (s² + 2ζ₁ω₁ s + ω₁²)(s² + 2ζ₂ω₂ s + ω₂²) = s⁴ + c3 s³ + c2 s² + c1 s + c0.
Eigen::Vector4d TwoPairs(double w1, double z1, double w2, double z2) {
  const double a1 = 2 * z1 * w1, b1 = w1 * w1, a2 = 2 * z2 * w2, b2 = w2 * w2;
  return {a1 + a2, b1 + b2 + a1 * a2, a1 * b2 + a2 * b1, b1 * b2};
}

}  // namespace

Status PidPoles::Validate() const {
  // Any pairs can be placed on the linear model, but the gains read as a cascade only while the
  // speed loop is the slower one: it sets the tilt reference the tilt loop follows, and the tilt
  // reference clamp governs the speed loop alone. A factor of 2 at least between the pairs keeps
  // them apart (cascades are commonly tuned 3 to 10 times apart, common practice; the default
  // rule has 6). Damping is kept within [0.2, 1]: below 0.2 a pair overshoots a step by more than
  // half (e^(−πζ/√(1−ζ²)) = 0.53), and above 1 a pair splits into two real poles, the slower of
  // which would reach into the other pair's band and void the separation the rule keeps.
  std::ostringstream why;
  const auto damping_ok = [](double z) { return z >= 0.2 && z <= 1; };
  if (!(tilt_pole_factor > 0) || !std::isfinite(tilt_pole_factor)) {
    why << "PidPoles::tilt_pole_factor = " << tilt_pole_factor << ", must be > 0 and finite";
  } else if (!(speed_pole_factor > 0) || !std::isfinite(speed_pole_factor)) {
    why << "PidPoles::speed_pole_factor = " << speed_pole_factor << ", must be > 0 and finite";
  } else if (!(speed_pole_factor <= tilt_pole_factor / 2)) {
    why << "PidPoles::speed_pole_factor = " << speed_pole_factor
        << ", must be at most half of tilt_pole_factor = " << tilt_pole_factor
        << " (the speed loop slower than the tilt loop it steers)";
  } else if (!damping_ok(tilt_damping)) {
    why << "PidPoles::tilt_damping = " << tilt_damping << ", must be in [0.2, 1]";
  } else if (!damping_ok(speed_damping)) {
    why << "PidPoles::speed_damping = " << speed_damping << ", must be in [0.2, 1]";
  } else if (!(yaw_pole_factor > 0) || !std::isfinite(yaw_pole_factor)) {
    why << "PidPoles::yaw_pole_factor = " << yaw_pole_factor << ", must be > 0 and finite";
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

PidGains TunePid(const LinearModel& plant, const PidPoles& poles, double max_tilt_deg) {
  // The rule: the cascade's four gains are those of a state feedback u = k_ξ ξ + k_v v + k_θ θ +
  // k_ω θ̇ (ξ = ∫v, what the speed integrator holds) on the planar model, placing the closed-loop
  // poles at two pairs — by default the tilt pair at ω = 2λ, ζ = 0.7 (twice as fast as the robot
  // falls, well damped) and the speed pair at ω_s = λ/3, ζ_s = 0.9 (slow enough to stay apart
  // from the tilt loop); PidPoles moves them. Pole-placement rules of this kind are common
  // practice for balancing robots; a cascade tuned loop by loop, ignoring that a wheel torque
  // also drives the axle, is unstable on these robots. Per unit of the summed torque
  // u = τ_L + τ_R:
  //   ξ̇ = v, v̇ = a_xθ θ + b_x u, θ̈ = λ² θ + b_θ u.
  const double lambda = plant.fall_rate_1_s;
  const double b_theta = plant.B(kPitchRate, model::kLeft);
  const double a_x_theta = plant.A(kXDot, kPitch), b_x = plant.B(kXDot, model::kLeft);
  const double b_psi = plant.B(kYawRate, model::kRight);
  PidGains g;
  g.tilt_bandwidth_rad_s = poles.tilt_pole_factor * lambda;
  // λ divided by the factor's reciprocal: the default factor 1/3 gives λ/3 to the last bit.
  g.speed_bandwidth_rad_s = lambda / (1 / poles.speed_pole_factor);
  g.tilt_damping = poles.tilt_damping;
  g.speed_damping = poles.speed_damping;
  Eigen::Matrix4d a;
  a << 0, 1, 0, 0,  //
      0, 0, a_x_theta, 0,  //
      0, 0, 0, 1,  //
      0, 0, lambda * lambda, 0;
  const Eigen::Vector4d b(0, b_x, 0, b_theta);
  // Ackermann's formula (handbook, from memory): u = −K z with K = [0 0 0 1] 𝒞⁻¹ φ(A).
  Eigen::Matrix4d controllability;
  controllability << b, a * b, a * a * b, a * a * a * b;
  const Eigen::Vector4d c =
      TwoPairs(g.tilt_bandwidth_rad_s, g.tilt_damping, g.speed_bandwidth_rad_s, g.speed_damping);
  const Eigen::Matrix4d a2 = a * a;
  const Eigen::Matrix4d phi =
      a2 * a2 + c(0) * a2 * a + c(1) * a2 + c(2) * a + c(3) * Eigen::Matrix4d::Identity();
  const Eigen::RowVector4d k =
      -Eigen::RowVector4d(0, 0, 0, 1) * controllability.inverse() * phi;  // u = +k z
  // u = k_θ θ + k_ω θ̇ + k_θ (k_v/k_θ) v + k_θ (k_ξ/k_θ) ξ  ⇔  u = kp (θ − θ_ref) + kd θ̇,
  // θ_ref = speed_kp (0 − v) + speed_ki ∫(0 − v).
  g.tilt_kp_Nm_per_rad = k(2);
  g.tilt_kd_Nm_s_per_rad = k(3);
  g.speed_kp_rad_per_m_s = k(1) / k(2);
  g.speed_ki_rad_per_m = k(0) / k(2);
  g.max_tilt_ref_rad = max_tilt_deg * std::numbers::pi / 180;
  // Yaw-rate loop, PI on ψ̈ = b_ψ τ_diff (common practice): kp = ω_y / b_ψ alone would give a
  // first-order response at ω_y (by default λ); the integral, ki = kp ω_y / 4, trims offsets and
  // makes the closed loop ω_y (s + ω_y/4) / (s + ω_y/2)², a critically damped double pole at
  // −ω_y/2 with a zero at −ω_y/4. Its step response is 1 − e^{−at}(1 − at), a = ω_y/2: the zero
  // overshoots it by e⁻² ≈ 13.5 % at t = 4/ω_y (derived by hand); the open loop crosses over at
  // 1.03 ω_y.
  g.yaw_bandwidth_rad_s = poles.yaw_pole_factor * lambda;
  g.yaw_kp_Nm_s_per_rad = g.yaw_bandwidth_rad_s / b_psi;
  g.yaw_ki_Nm_per_rad = g.yaw_kp_Nm_s_per_rad * g.yaw_bandwidth_rad_s / 4;
  return g;
}

void PidAsLinearController(const PidGains& g, Measurement* meas, LinearController* ctrl) {
  // y = [θ, θ̇, ẋ, ψ̇]; controller states [∫(v_ref − v), ∫(r_ref − ψ̇)] with zero references.
  meas->Cy = Eigen::MatrixXd::Zero(4, kStates);
  meas->Cy(0, kPitch) = 1;
  meas->Cy(1, kPitchRate) = 1;
  meas->Cy(2, kXDot) = 1;
  meas->Cy(3, kYawRate) = 1;
  meas->Dy = Eigen::MatrixXd::Zero(4, kInputs);
  ctrl->Ac = Eigen::MatrixXd::Zero(2, 2);
  ctrl->Bc = Eigen::MatrixXd::Zero(2, 4);
  ctrl->Bc(0, 2) = -1;
  ctrl->Bc(1, 3) = -1;
  // τ_sum = kp θ + kd θ̇ + kp k_v ẋ − kp k_i ∫; τ_diff = −k_ψ ψ̇ + k_ψi ∫.
  const double kp = g.tilt_kp_Nm_per_rad, kd = g.tilt_kd_Nm_s_per_rad;
  const double kv = g.speed_kp_rad_per_m_s, ki = g.speed_ki_rad_per_m;
  const double ky = g.yaw_kp_Nm_s_per_rad, kyi = g.yaw_ki_Nm_per_rad;
  ctrl->Cc = Eigen::MatrixXd(kInputs, 2);
  ctrl->Cc << -kp * ki / 2, -kyi / 2,  //
      -kp * ki / 2, kyi / 2;
  ctrl->Dc = Eigen::MatrixXd(kInputs, 4);
  ctrl->Dc << kp / 2, kd / 2, kp * kv / 2, ky / 2,  //
      kp / 2, kd / 2, kp * kv / 2, -ky / 2;
}

}  // namespace upright::design
