#include "kit/tilt_filter.hpp"

#include <cmath>

namespace upright::controllers {

TiltFilter::TiltFilter(double period_s, double tilt_time_constant_s, double bias_time_constant_s,
                       double gate_rad)
    : period_s_(period_s),
      gate_rad_(gate_rad),
      hold_ticks_(std::lround(tilt_time_constant_s / period_s)) {
  const double p1 = std::exp(-period_s / tilt_time_constant_s);
  const double p2 = std::exp(-period_s / bias_time_constant_s);
  tilt_gain_ = 1 - p1 * p2;
  bias_gain_ = (1 - p1) * (1 - p2);
}

void TiltFilter::Start(double pitch_rad) {
  pitch_rad_ = pitch_rad;
  bias_rad_s_ = 0;
  gated_ticks_ = 0;
  gated_ = false;
}

void TiltFilter::Update(double gyro_rad_s, double accel_pitch_rad) {
  const double predicted = pitch_rad_ + period_s_ * (gyro_rad_s - bias_rad_s_);
  const double innovation = accel_pitch_rad - predicted;
  const bool outside = !(std::abs(innovation) <= gate_rad_);
  gated_ticks_ = outside ? gated_ticks_ + 1 : 0;
  gated_ = outside && (gated_ticks_ <= hold_ticks_ || !std::isfinite(innovation));
  if (gated_) {
    pitch_rad_ = predicted;
    return;
  }
  pitch_rad_ = predicted + tilt_gain_ * innovation;
  bias_rad_s_ -= bias_gain_ / period_s_ * innovation;
}

}  // namespace upright::controllers
