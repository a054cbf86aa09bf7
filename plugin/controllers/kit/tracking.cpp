#include "kit/tracking.hpp"

#include <algorithm>
#include <cmath>

#include "kit/module_context.hpp"

namespace upright::controllers {

ReferenceTracker::ReferenceTracker(double period_s, double max_accel_m_s2)
    : period_s_(period_s), max_step_m_s_(max_accel_m_s2 * period_s) {}

void ReferenceTracker::Reset() {
  speed_m_s_ = accel_m_s2_ = yaw_rate_rad_s_ = x_ref_m_ = yaw_ref_rad_ = 0;
}

const char* ReferenceTracker::Follow(const upright_reference& reference) {
  const double v = reference.forward_speed_m_s, r = reference.yaw_rate_rad_s;
  if (!std::isfinite(v) || !std::isfinite(r)) return "the reference is not finite";
  x_ref_m_ += speed_m_s_ * period_s_;
  yaw_ref_rad_ += yaw_rate_rad_s_ * period_s_;
  const double step = std::clamp(v - speed_m_s_, -max_step_m_s_, max_step_m_s_);
  speed_m_s_ += step;
  accel_m_s2_ = step / period_s_;
  yaw_rate_rad_s_ = r;
  return nullptr;
}

void ReferenceTracker::Error(const design::StateVector& state, design::StateVector* error) const {
  *error = state;
  (*error)(design::kX) -= x_ref_m_;
  (*error)(design::kXDot) -= speed_m_s_;
  (*error)(design::kYaw) -= yaw_ref_rad_;
  (*error)(design::kYawRate) -= yaw_rate_rad_s_;
}

Result<SteadyMotion, ModuleError> SteadyMotion::Of(const design::LinearModel& plant) {
  using design::kPitch;
  SteadyMotion steady;
  const int rows[3] = {design::kXDot, design::kPitchRate, design::kYawRate};
  Eigen::Matrix3d n;
  for (int i = 0; i < 3; ++i) {
    n.row(i) << plant.A(rows[i], kPitch), plant.B(rows[i], 0), plant.B(rows[i], 1);
    steady.speed_terms_.row(i) << plant.A(rows[i], design::kXDot),
        plant.A(rows[i], design::kYawRate);
  }
  const Eigen::FullPivLU<Eigen::Matrix3d> lu(n);
  if (!lu.isInvertible()) {
    return Failure(ModuleError{UPRIGHT_UNSUPPORTED,
                               "the linear model cannot hold the robot in a steady lean (its "
                               "pitch, speed and yaw rows are dependent)"});
  }
  steady.solve_ = lu.inverse();
  return steady;
}

void SteadyMotion::For(double speed_m_s, double accel_m_s2, double yaw_rate_rad_s,
                       double* pitch_rad, Eigen::Vector2d* input) const {
  const Eigen::Vector3d z = solve_ * (Eigen::Vector3d(accel_m_s2, 0, 0) -
                                      speed_terms_ * Eigen::Vector2d(speed_m_s, yaw_rate_rad_s));
  *pitch_rad = z(0);
  *input = z.tail<2>();
}

}  // namespace upright::controllers
