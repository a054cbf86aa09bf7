// MetricRecorder: one run's physics steps in (a StepSample each), its RunMetrics out. Running
// figures accumulate as the run goes; tilt and drift are buffered (allocated once, up front) so
// settling and rebound can be judged after each disturbance. Add() never allocates.
#pragma once

#include <array>
#include <string>
#include <vector>

#include "upright/runner/metrics/metric_settings.hpp"
#include "upright/runner/metrics/run_metrics.hpp"

namespace upright::runner {

// What the recorder reads after each physics step. Arrays are [left, right].
struct StepSample {
  double time_s = 0;
  double tilt_rad = 0;                // pitch − the robot's equilibrium pitch
  double drift_m = 0;                 // horizontal distance of the axle from the commanded path
  std::array<double, 2> torque_Nm{};  // wheel torques
  std::array<double, 2> current_A{};  // motor currents
  std::array<double, 2> power_W{};    // electrical power V·i (negative when regenerating)
  bool saturated = false;             // either motor voltage- or current-limited this step
  bool command_at_limit = false;      // either wheel's command at or beyond the drive's limit
  std::array<double, 2> slip_ratio{};
  std::array<bool, 2> touching{};  // wheel in contact with the ground
};

class MetricRecorder {
 public:
  // dt_s: the physics step; duration_s: the longest the run can last (sizes the buffers);
  // disturbance_starts_s: when each disturbance began, ascending (settling is judged after each).
  MetricRecorder(const MetricSettings& settings, double dt_s, double duration_s,
                 std::vector<double> disturbance_starts_s);
  // One physics step's readings, in time order, dt_s apart. Never allocates: past the
  // ceil(duration_s / dt_s) + 2 samples reserved up front, tilt and drift are no longer
  // buffered (settling then sees only the buffered part) but every running figure still counts.
  void Add(const StepSample& sample);
  // The figures for the steps added so far (definitions in the README, "Metrics"). `status`
  // and `message` say how the run ended; fall_time_s is the last sample's time when the status
  // is kFell. Settling and rebound are judged only when the status is kOk (else NaN). With no
  // step added every figure, end_time_s included, is NaN.
  RunMetrics Finish(RunStatus status, const std::string& message) const;

 private:
  // Fills the settling and rebound figures of `metrics` from the buffered tilt and drift.
  void JudgeSettling(RunMetrics* metrics) const;

  MetricSettings settings_;
  double dt_s_;
  double duration_s_;
  std::vector<double> disturbances_s_;
  std::vector<double> tilt_rad_, drift_m_;  // one entry per step added, up to their capacity
  long samples_ = 0;                        // steps added, buffered or not
  double first_time_s_ = 0, last_time_s_ = 0;
  double max_tilt_rad_ = 0, max_drift_m_ = 0, sum_tilt2_ = 0, sum_abs_tilt_ = 0;
  double effort_ = 0, peak_torque_ = 0, peak_current_ = 0, energy_J_ = 0;
  long saturated_steps_ = 0, command_limited_steps_ = 0, slipping_steps_ = 0;
  double max_slip_ = 0;
};

}  // namespace upright::runner
