#include "sensor_pipeline.hpp"

#include <algorithm>
#include <cmath>

#include "upright/model/conventions.hpp"

namespace upright::sim::internal {
namespace {

double Quantise(double value, double step) {
  return step > 0 ? step * std::round(value / step) : value;
}

}  // namespace

long StepsPerSample(double rate_hz, double dt_s) {
  return std::max(1L, std::lround(1.0 / (rate_hz * dt_s)));
}

SensorPipeline::SensorPipeline(const SensorModel& sensors, double control_rate_hz, double dt_s,
                               std::uint64_t seed, bool noise)
    : model_(sensors),
      dt_s_(dt_s),
      noise_(noise),
      latency_steps_(std::lround(sensors.latency_s / dt_s)),
      imu_steps_(StepsPerSample(sensors.imu_rate_hz, dt_s)),
      control_steps_(StepsPerSample(control_rate_hz, dt_s)),
      random_(seed),
      ring_(static_cast<size_t>(latency_steps_ + control_steps_ + 1)) {
  // White noise of density N sampled every T seconds has σ = N / √T (common practice for MEMS
  // IMU noise models, from memory). The IMU's own rate sets T, also when it samples faster than
  // the physics steps and only its latest sample is seen.
  gyro_sigma_rad_s_ = sensors.gyro_noise_rad_s_rthz * std::sqrt(sensors.imu_rate_hz);
  accel_sigma_m_s2_ = sensors.accel_noise_m_s2_rthz * std::sqrt(sensors.imu_rate_hz);
}

const Measurement& SensorPipeline::Delayed(long step, long extra_delay) const {
  const long k = std::max(0L, step - latency_steps_ - extra_delay);
  return ring_[static_cast<size_t>(k % static_cast<long>(ring_.size()))];
}

void SensorPipeline::Record(long step, const Measurement& exact) {
  if (step == 0) std::fill(ring_.begin(), ring_.end(), exact);
  ring_[static_cast<size_t>(step % static_cast<long>(ring_.size()))] = exact;
  if (step % imu_steps_ != 0) return;
  const Measurement& seen = Delayed(step, 0);
  const std::array<double, 3> gyro_bias{model_.gyro_bias_x_rad_s, model_.gyro_bias_y_rad_s,
                                        model_.gyro_bias_z_rad_s};
  const std::array<double, 3> accel_bias{model_.accel_bias_x_m_s2, model_.accel_bias_y_m_s2,
                                         model_.accel_bias_z_m_s2};
  for (int i = 0; i < 3; ++i) {
    double gyro = seen.gyro_rad_s[i] + gyro_bias[i];
    double accel = seen.accel_m_s2[i] + accel_bias[i];
    if (noise_) {
      gyro += gyro_sigma_rad_s_ * random_.Gaussian();
      accel += accel_sigma_m_s2_ * random_.Gaussian();
    }
    held_gyro_[i] = Quantise(gyro, model_.gyro_resolution_rad_s);
    held_accel_[i] = Quantise(accel, model_.accel_resolution_m_s2);
  }
}

double SensorPipeline::QuantiseEncoder(double angle_rad) const {
  const double count_rad = 2.0 * kPi / model_.encoder_counts_per_rev;
  return count_rad * std::floor(angle_rad / count_rad);
}

SensorSample SensorPipeline::Read(long step) const {
  SensorSample s;
  s.time_s = static_cast<double>(step) * dt_s_;
  s.gyro_rad_s = held_gyro_;
  s.accel_m_s2 = held_accel_;
  const Measurement& now = Delayed(step, 0);
  const Measurement& before = Delayed(step, control_steps_);
  const double period_s = static_cast<double>(control_steps_) * dt_s_;
  for (int i = 0; i < 2; ++i) {
    s.encoder_angle_rad[i] = QuantiseEncoder(now.wheel_angle_rad[i]);
    s.encoder_rate_rad_s[i] =
        (s.encoder_angle_rad[i] - QuantiseEncoder(before.wheel_angle_rad[i])) / period_s;
  }
  return s;
}

}  // namespace upright::sim::internal
