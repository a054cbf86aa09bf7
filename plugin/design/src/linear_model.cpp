#include "upright/design/linear_model.hpp"

#include <cmath>

#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

// Constants of the equations of motion (derived by hand from Lagrange's equations of the planar
// wheeled pendulum, wheels rolling without slip, motor torque +τ on the wheel and −τ on the body;
// cross-check Pathak, Franch and Agrawal, IEEE Trans. Robotics 21(3), 2005, from memory). The
// COM sits at distance L from the axle, at angle α ahead of the body's z axis, so the pendulum
// angle is φ = θ + α.
struct Constants {
  double mb, L, alpha, j_pitch, mx, r, half_track, j_yaw;
};

Constants ConstantsOf(const model::RobotModel& model) {
  const LumpedBody body = LumpBody(model);
  const model::WheelModel& w = model.wheel;
  Constants c;
  c.mb = body.mass_kg;
  c.L = std::hypot(body.com_height_m, body.com_forward_m);
  c.alpha = std::atan2(body.com_forward_m, body.com_height_m);
  c.j_pitch = body.pitch_inertia_kgm2 + c.mb * c.L * c.L;
  c.r = w.radius_m;
  c.mx = c.mb + 2 * w.mass_kg + 2 * w.spin_inertia_kgm2 / (c.r * c.r);
  c.half_track = w.track_m / 2;
  // Body about the vertical through the axle midpoint (its COM is over the axle at equilibrium),
  // wheels as point masses at ±d plus their diameter inertia, and the spin inertia the wheels'
  // counter-rotation adds: 2 I_w d² / r².
  c.j_yaw = body.yaw_inertia_kgm2 + 2 * w.mass_kg * c.half_track * c.half_track +
            2 * w.diameter_inertia_kgm2 +
            2 * w.spin_inertia_kgm2 * c.half_track * c.half_track / (c.r * c.r);
  return c;
}

}  // namespace

LumpedBody LumpBody(const model::RobotModel& model) {
  const model::ChassisModel& c = model.chassis;
  LumpedBody b;
  b.mass_kg = c.mass_kg;
  b.com_height_m = c.com_height_m;
  b.com_forward_m = c.com_forward_m;
  b.pitch_inertia_kgm2 = c.pitch_inertia_kgm2;
  b.roll_inertia_kgm2 = c.roll_inertia_kgm2;
  b.yaw_inertia_kgm2 = c.yaw_inertia_kgm2;
  if (!model.payload.present) return b;
  // Parallel-axis theorem (mechanics handbook, from memory); the payload is a uniform box.
  const model::PayloadModel& p = model.payload;
  const double m = c.mass_kg + p.mass_kg;
  const double z = (c.mass_kg * c.com_height_m + p.mass_kg * p.z_m) / m;
  const double x = (c.mass_kg * c.com_forward_m + p.mass_kg * p.x_m) / m;
  auto sq = [](double v) { return v * v; };
  const double box_pitch = p.mass_kg * (sq(p.length_m) + sq(p.height_m)) / 12;
  const double box_roll = p.mass_kg * (sq(p.width_m) + sq(p.height_m)) / 12;
  const double box_yaw = p.mass_kg * (sq(p.length_m) + sq(p.width_m)) / 12;
  b.mass_kg = m;
  b.com_height_m = z;
  b.com_forward_m = x;
  b.pitch_inertia_kgm2 = c.pitch_inertia_kgm2 + c.mass_kg * (sq(c.com_height_m - z) + sq(c.com_forward_m - x)) +
                         box_pitch + p.mass_kg * (sq(p.z_m - z) + sq(p.x_m - x));
  b.roll_inertia_kgm2 = c.roll_inertia_kgm2 + c.mass_kg * sq(c.com_height_m - z) + box_roll +
                        p.mass_kg * sq(p.z_m - z);
  b.yaw_inertia_kgm2 = c.yaw_inertia_kgm2 + c.mass_kg * sq(c.com_forward_m - x) + box_yaw +
                       p.mass_kg * sq(p.x_m - x);
  return b;
}

LinearModel Linearise(const model::RobotModel& model, InputKind input, double push_height_m) {
  const Constants c = ConstantsOf(model);
  const double g = model::kStandardGravity_m_s2;
  LinearModel lm;
  lm.input = input;
  lm.body = LumpBody(model);
  lm.push_height_m = push_height_m < 0 ? lm.body.com_height_m : push_height_m;
  lm.equilibrium_pitch_rad = -c.alpha;
  const double mbl = c.mb * c.L;
  const double delta = c.mx * c.j_pitch - mbl * mbl;
  lm.fall_rate_1_s = std::sqrt(c.mx * mbl * g / delta);

  // [ẍ; θ̈] = M⁻¹ (generalised forces), M = [M_x, m_b L; m_b L, J], about φ = 0:
  //   x:  u/r + F,    θ:  m_b g L (θ − θ_eq) − u + F h cos θ_eq + T.
  auto accelerations = [&](double fx, double ftheta) {  // M⁻¹ [fx; fθ]
    return Eigen::Vector2d((c.j_pitch * fx - mbl * ftheta) / delta,
                           (-mbl * fx + c.mx * ftheta) / delta);
  };
  lm.A.setZero();
  lm.B.setZero();
  lm.E.setZero();
  lm.A(kX, kXDot) = 1;
  lm.A(kPitch, kPitchRate) = 1;
  lm.A(kYaw, kYawRate) = 1;
  const Eigen::Vector2d per_pitch = accelerations(0, mbl * g);
  lm.A(kXDot, kPitch) = per_pitch(0);
  lm.A(kPitchRate, kPitch) = per_pitch(1);
  const Eigen::Vector2d per_torque = accelerations(1 / c.r, -1);  // per N·m on one wheel
  const double yaw_per_torque = c.half_track / (c.r * c.j_yaw);   // ψ̈ per N·m, right wheel
  for (int wheel : {model::kLeft, model::kRight}) {
    lm.B(kXDot, wheel) = per_torque(0);
    lm.B(kPitchRate, wheel) = per_torque(1);
    lm.B(kYawRate, wheel) = wheel == model::kRight ? yaw_per_torque : -yaw_per_torque;
  }
  const Eigen::Vector2d per_push = accelerations(1, lm.push_height_m * std::cos(c.alpha));
  const Eigen::Vector2d per_pitch_torque = accelerations(0, 1);
  lm.E.col(0) << 0, per_push(0), 0, per_push(1), 0, 0;
  lm.E.col(1) << 0, per_pitch_torque(0), 0, per_pitch_torque(1), 0, 0;

  if (input == InputKind::kVoltage) {
    // τ = k_V V − c_m ω_rel with ω_rel the wheel speed relative to the chassis (back-EMF and
    // viscous friction): left (ẋ − d ψ̇)/r − θ̇, right (ẋ + d ψ̇)/r − θ̇ (DC motor equations,
    // handbook, from memory).
    const model::MotorModel& m = model.motor;
    const double k_v = m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A / m.resistance_ohm;
    const double c_m = m.gear_ratio * m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A *
                           m.back_emf_V_s_per_rad / m.resistance_ohm +
                       m.viscous_friction_Nm_s_per_rad;
    Eigen::Matrix<double, kInputs, kStates> rel_speed = Eigen::Matrix<double, kInputs, kStates>::Zero();
    rel_speed.row(model::kLeft) << 0, 1 / c.r, 0, -1, 0, -c.half_track / c.r;
    rel_speed.row(model::kRight) << 0, 1 / c.r, 0, -1, 0, c.half_track / c.r;
    lm.A -= c_m * lm.B * rel_speed;
    lm.B *= k_v;
  }
  return lm;
}

StateVector NonlinearDerivative(const model::RobotModel& model, const StateVector& x,
                                const Eigen::Vector2d& torque_Nm, const Eigen::Vector2d& w,
                                double push_height_m) {
  const Constants c = ConstantsOf(model);
  const double g = model::kStandardGravity_m_s2;
  const double phi = x(kPitch) + c.alpha, phi_dot = x(kPitchRate);
  const double mbl = c.mb * c.L;
  const double u = torque_Nm(model::kLeft) + torque_Nm(model::kRight);
  //   M_x ẍ + m_b L (cos φ φ̈ − sin φ φ̇²) = u/r + F
  //   m_b L cos φ ẍ + J φ̈ − m_b g L sin φ = −u + F h cos θ + T
  const double m11 = c.mx, m12 = mbl * std::cos(phi), m22 = c.j_pitch;
  const double f1 = u / c.r + w(0) + mbl * std::sin(phi) * phi_dot * phi_dot;
  const double f2 = mbl * g * std::sin(phi) - u + w(0) * push_height_m * std::cos(x(kPitch)) + w(1);
  const double det = m11 * m22 - m12 * m12;
  StateVector dx;
  dx << x(kXDot), (m22 * f1 - m12 * f2) / det, x(kPitchRate), (m11 * f2 - m12 * f1) / det,
      x(kYawRate),
      c.half_track * (torque_Nm(model::kRight) - torque_Nm(model::kLeft)) / (c.r * c.j_yaw);
  return dx;
}

const char* StateName(int index) {
  static constexpr const char* kNames[kStates] = {"x_m",         "xdot_m_s", "pitch_rad",
                                                  "pitchrate_rad_s", "yaw_rad", "yawrate_rad_s"};
  return index >= 0 && index < kStates ? kNames[index] : "?";
}

}  // namespace upright::design
