#include "kit/speed_filter.hpp"

#include <cmath>

namespace upright::controllers {

SpeedGains SpeedGains::ForTrackingIndex(double lambda) {
  const double root = std::sqrt(lambda * lambda + 8 * lambda);
  SpeedGains g;
  g.position = -(lambda * lambda + 8 * lambda - (lambda + 4) * root) / 8;
  g.speed = (lambda * lambda + 4 * lambda - lambda * root) / 4;
  return g;
}

double SpeedGains::SpeedNoiseRatio() const {
  return 2 * speed * speed / (position * (4 - 2 * position - speed));
}

SpeedFilter::SpeedFilter(double period_s, const SpeedGains& gains)
    : period_s_(period_s), gains_(gains) {}

void SpeedFilter::Start(double travel_m, double speed_m_s, double accel_m_s2) {
  travel_m_ = travel_m;
  speed_m_s_ = speed_m_s;
  accel_m_s2_ = accel_m_s2;
  correction_m_s2_ = 0;
}

void SpeedFilter::Update(double travel_m, double accel_m_s2) {
  const double T = period_s_;
  const double speed = speed_m_s_ + T * (accel_m_s2_ + accel_m_s2) / 2;
  const double travel = travel_m_ + T * speed_m_s_ + T * T * (2 * accel_m_s2_ + accel_m_s2) / 6;
  const double innovation = travel_m - travel;
  travel_m_ = travel + gains_.position * innovation;
  correction_m_s2_ = gains_.speed / (T * T) * innovation;
  speed_m_s_ = speed + T * correction_m_s2_;
  accel_m_s2_ = accel_m_s2;
}

}  // namespace upright::controllers
