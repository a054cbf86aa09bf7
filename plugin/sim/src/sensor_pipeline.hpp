// SensorPipeline (internal): exact measurements at every physics step in, what the controller
// sees out — IMU sampled at its own rate with seeded white noise, bias and quantisation; encoders
// quantised to counts; everything delayed by the latency. No allocation after construction.
#pragma once

#include <array>
#include <cstdint>
#include <vector>

#include "upright/model/robot_model.hpp"
#include "upright/sim/plant.hpp"
#include "upright/sim/random.hpp"

namespace upright::sim::internal {

// The exact values the sensors would read at one physics step.
struct Measurement {
  std::array<double, 3> gyro_rad_s{};
  std::array<double, 3> accel_m_s2{};
  std::array<double, 2> wheel_angle_rad{};  // relative to the chassis
};

// Steps per sample for a rate, rounded to the nearest whole number of steps, at least 1.
long StepsPerSample(double rate_hz, double dt_s);

class SensorPipeline {
 public:
  SensorPipeline(const SensorModel& sensors, double control_rate_hz, double dt_s,
                 std::uint64_t seed, bool noise);
  // The exact measurement after physics step `step` (0 = the initial state, before any step).
  void Record(long step, const Measurement& exact);
  // What a controller reading at step `step` sees.
  SensorSample Read(long step) const;

  long latency_steps() const { return latency_steps_; }
  long imu_steps() const { return imu_steps_; }
  long control_steps() const { return control_steps_; }

 private:
  const Measurement& Delayed(long step, long extra_delay) const;
  double QuantiseEncoder(double angle_rad) const;

  SensorModel model_;
  double dt_s_;
  bool noise_;
  long latency_steps_, imu_steps_, control_steps_;
  double gyro_sigma_rad_s_, accel_sigma_m_s2_;
  Random random_;
  std::vector<Measurement> ring_;  // the last latency + control period + 1 steps
  std::array<double, 3> held_gyro_{}, held_accel_{};  // the IMU's latest output
};

}  // namespace upright::sim::internal
