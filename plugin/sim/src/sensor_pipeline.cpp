#include "sensor_pipeline.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

#include "upright/model/conventions.hpp"

namespace upright::sim::internal {
namespace {

double Quantise(double value, double step) {
  return step > 0 ? step * std::round(value / step) : value;
}

constexpr std::array<SensorChannel, 3> kGyro{SensorChannel::kGyroX, SensorChannel::kGyroY,
                                             SensorChannel::kGyroZ};
constexpr std::array<SensorChannel, 3> kAccel{SensorChannel::kAccelX, SensorChannel::kAccelY,
                                              SensorChannel::kAccelZ};
constexpr std::array<SensorChannel, 2> kEncoder{SensorChannel::kEncoderLeft,
                                                SensorChannel::kEncoderRight};
constexpr size_t kFaultCapacity = 16;  // reserved up front; more faults are rare

}  // namespace

long StepsPerSample(double rate_hz, double dt_s) {
  return std::max(1L, std::lround(1.0 / (rate_hz * dt_s)));
}

SensorPipeline::SensorPipeline(const model::SensorModel& sensors, double control_rate_hz,
                               double dt_s, std::uint64_t seed, bool noise)
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
  faults_.reserve(kFaultCapacity);
}

long SensorPipeline::MeasuredStep(long step, long extra_delay) const {
  return std::max(0L, step - latency_steps_ - extra_delay);
}

const Measurement& SensorPipeline::Delayed(long step, long extra_delay) const {
  const long k = MeasuredStep(step, extra_delay);
  return ring_[static_cast<size_t>(k % static_cast<long>(ring_.size()))];
}

void SensorPipeline::Record(long step, const Measurement& exact) {
  if (step == 0) std::fill(ring_.begin(), ring_.end(), exact);
  ring_[static_cast<size_t>(step % static_cast<long>(ring_.size()))] = exact;
  last_step_ = step;
  // Encoders sample every step: a stuck fault still to come remembers this reading.
  for (ChannelFault& f : faults_) {
    for (int side = 0; side < 2; ++side) {
      if (f.fault.channel == kEncoder[side] && f.fault.kind == SensorFaultKind::kStuck &&
          step < f.first_step) {
        f.held = EncoderReading(side, step, exact.wheel_angle_rad[side]);
      }
    }
  }
  if (step % imu_steps_ != 0) return;
  const Measurement& seen = Delayed(step, 0);
  imu_step_ = MeasuredStep(step, 0);
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
    raw_gyro_[i] = gyro;
    raw_accel_[i] = accel;
  }
  UpdateImuOutputs();
  // A stuck fault still to come remembers this sample's reading.
  for (ChannelFault& f : faults_) {
    if (f.fault.kind != SensorFaultKind::kStuck || imu_step_ >= f.first_step) continue;
    for (int i = 0; i < 3; ++i) {
      if (f.fault.channel == kGyro[i]) f.held = held_gyro_[i];
      if (f.fault.channel == kAccel[i]) f.held = held_accel_[i];
    }
  }
}

void SensorPipeline::UpdateImuOutputs() {
  if (faults_.empty()) {  // the common case, without a fault lookup per channel
    for (int i = 0; i < 3; ++i) {
      held_gyro_[i] = Quantise(raw_gyro_[i], model_.gyro_resolution_rad_s);
      held_accel_[i] = Quantise(raw_accel_[i], model_.accel_resolution_m_s2);
    }
    return;
  }
  for (int i = 0; i < 3; ++i) {
    held_gyro_[i] = ImuReading(kGyro[i], imu_step_, raw_gyro_[i], model_.gyro_resolution_rad_s);
    held_accel_[i] =
        ImuReading(kAccel[i], imu_step_, raw_accel_[i], model_.accel_resolution_m_s2);
  }
}

const SensorPipeline::ChannelFault* SensorPipeline::ActingFault(SensorChannel channel,
                                                                long m) const {
  const ChannelFault* acting = nullptr;
  for (const ChannelFault& f : faults_) {
    if (f.fault.channel != channel || m < f.first_step || m >= f.end_step) continue;
    if (acting == nullptr || f.fault.start_s >= acting->fault.start_s) acting = &f;
  }
  return acting;
}

double SensorPipeline::ImuReading(SensorChannel channel, long m, double unquantised,
                                  double resolution) const {
  const ChannelFault* f = ActingFault(channel, m);
  if (f == nullptr) return Quantise(unquantised, resolution);
  switch (f->fault.kind) {
    case SensorFaultKind::kBias: return Quantise(unquantised + f->fault.value, resolution);
    case SensorFaultKind::kDropout: return 0;
    case SensorFaultKind::kStuck: return f->held;
  }
  return Quantise(unquantised, resolution);
}

double SensorPipeline::EncoderReading(int side, long m, double angle_rad) const {
  const ChannelFault* f = ActingFault(kEncoder[side], m);
  if (f == nullptr) return QuantiseEncoder(angle_rad);
  switch (f->fault.kind) {
    case SensorFaultKind::kBias: return QuantiseEncoder(angle_rad + f->fault.value);
    case SensorFaultKind::kDropout: return 0;
    case SensorFaultKind::kStuck: return f->held;
  }
  return QuantiseEncoder(angle_rad);
}

void SensorPipeline::AddFault(const SensorFault& fault) {
  ChannelFault f;
  f.fault = fault;
  f.first_step = FirstStepAtOrAfter(fault.start_s, dt_s_);
  f.end_step = std::isinf(fault.duration_s)
                   ? std::numeric_limits<long>::max()
                   : FirstStepAtOrAfter(fault.start_s + fault.duration_s, dt_s_);
  // Until a sample before its start replaces it: the channel's reading now.
  for (int i = 0; i < 3; ++i) {
    if (fault.channel == kGyro[i]) f.held = held_gyro_[i];
    if (fault.channel == kAccel[i]) f.held = held_accel_[i];
  }
  const Measurement& latest =
      ring_[static_cast<size_t>(last_step_ % static_cast<long>(ring_.size()))];
  for (int side = 0; side < 2; ++side) {
    if (fault.channel == kEncoder[side]) {
      f.held = EncoderReading(side, last_step_, latest.wheel_angle_rad[side]);
    }
  }
  faults_.push_back(f);
  UpdateImuOutputs();
}

double SensorPipeline::QuantiseEncoder(double angle_rad) const {
  const double count_rad = 2.0 * std::numbers::pi / model_.encoder_counts_per_rev;
  return count_rad * std::floor(angle_rad / count_rad);
}

SensorSample SensorPipeline::Read(long step) const {
  SensorSample s;
  s.time_s = static_cast<double>(step) * dt_s_;
  s.gyro_rad_s = held_gyro_;
  s.accel_m_s2 = held_accel_;
  const Measurement& now = Delayed(step, 0);
  const Measurement& before = Delayed(step, control_steps_);
  const long now_step = MeasuredStep(step, 0), before_step = MeasuredStep(step, control_steps_);
  const double period_s = static_cast<double>(control_steps_) * dt_s_;
  for (int i = 0; i < 2; ++i) {
    s.encoder_angle_rad[i] = EncoderReading(i, now_step, now.wheel_angle_rad[i]);
    s.encoder_rate_rad_s[i] =
        (s.encoder_angle_rad[i] - EncoderReading(i, before_step, before.wheel_angle_rad[i])) /
        period_s;
  }
  return s;
}

}  // namespace upright::sim::internal
