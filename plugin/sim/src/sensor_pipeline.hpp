// SensorPipeline (internal): exact measurements at every physics step in, what the controller
// sees out — IMU sampled at its own rate with seeded white noise, bias and quantisation; encoders
// quantised to counts; sensor faults (faults.hpp) on the samples they cover; everything delayed
// by the latency. No allocation after construction except when a fault is added.
#pragma once

#include <array>
#include <cstdint>
#include <vector>

#include "upright/model/robot_model.hpp"
#include "upright/sim/faults.hpp"
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
  SensorPipeline(const model::SensorModel& sensors, double control_rate_hz, double dt_s,
                 std::uint64_t seed, bool noise);
  // The exact measurement after physics step `step` (0 = the initial state, before any step).
  void Record(long step, const Measurement& exact);
  // What a controller reading at step `step` sees.
  SensorSample Read(long step) const;
  // Adds a valid fault (the caller checks IsValid). A fault whose window covers the latest IMU
  // sample also acts on it; one added after its start holds, if stuck, the reading at that moment.
  void AddFault(const SensorFault& fault);

  long latency_steps() const { return latency_steps_; }
  long imu_steps() const { return imu_steps_; }
  long control_steps() const { return control_steps_; }

 private:
  // A fault with its window in measurement steps: it acts on samples of the states after m
  // steps for first_step <= m < end_step.
  struct ChannelFault {
    SensorFault fault;
    long first_step = 0, end_step = 0;
    double held = 0;  // kStuck: the reading it holds, the channel's last one before first_step
  };

  // The measurement step a reading at `step` sees, `extra_delay` steps further back.
  long MeasuredStep(long step, long extra_delay) const;
  const Measurement& Delayed(long step, long extra_delay) const;
  double QuantiseEncoder(double angle_rad) const;
  // The fault acting on `channel` for the sample of measurement step m, or null.
  const ChannelFault* ActingFault(SensorChannel channel, long m) const;
  // A reading of measurement step m from its value before faults and quantisation.
  double ImuReading(SensorChannel channel, long m, double unquantised, double resolution) const;
  double EncoderReading(int side, long m, double angle_rad) const;
  // The held IMU outputs from the latest sample's values, under the faults now known.
  void UpdateImuOutputs();

  model::SensorModel model_;
  double dt_s_;
  bool noise_;
  long latency_steps_, imu_steps_, control_steps_;
  double gyro_sigma_rad_s_, accel_sigma_m_s2_;
  Random random_;
  std::vector<Measurement> ring_;  // the last latency + control period + 1 steps
  long last_step_ = 0;             // the latest step recorded
  // The IMU's latest sample with noise and bias, before faults and quantisation, and the
  // measurement step it samples.
  std::array<double, 3> raw_gyro_{}, raw_accel_{};
  long imu_step_ = 0;
  std::array<double, 3> held_gyro_{}, held_accel_{};  // the IMU's latest output
  std::vector<ChannelFault> faults_;
};

}  // namespace upright::sim::internal
