// Timeline (internal): a scenario's timed events that the runner drives itself — the drive
// reference (and the commanded path it integrates into) and the payload carriage target — plus
// the list of disturbance starts and trace marks. Pushes and faults are handed to the plant,
// which times them to the physics step.
#pragma once

#include <cstddef>
#include <vector>

#include "upright/host/controller_host.hpp"
#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner::internal {

class Timeline {
 public:
  explicit Timeline(const Scenario& scenario);

  // Advances to physics step `step` (called once per step, in order): updates the reference and
  // the payload target. An event acts from sim::FirstStepAtOrAfter(its start, dt), the rule the
  // plant applies to faults. No allocation.
  void Advance(long step);
  // After the step of length dt_s: integrates the commanded path over it.
  void Integrate(double dt_s);

  const host::Reference& reference() const { return reference_; }
  double payload_target_m() const { return payload_target_m_; }
  bool payload_moving() const { return payload_moving_; }
  double path_x_m() const { return path_x_m_; }
  double path_y_m() const { return path_y_m_; }

  // When each disturbance began (pushes, payload shifts, faults, and t = 0 when the robot starts
  // away from rest upright), ascending, duplicates removed.
  static std::vector<double> DisturbanceStarts(const Scenario& scenario);
  // When every timed event has begun and ended (a step push or sensor fault counts from its
  // start: its effect is steady after that), provided the reference is then at rest; infinity
  // when the reference is still asking for motion at the end. Envelope probes stop early after it.
  static double QuietFrom(const Scenario& scenario);
  // One mark per event start, in time order, for traces; each at the time of the first physics
  // step the event acts on (sim::FirstStepAtOrAfter), the time of the trace row that shows it.
  static std::vector<EventMark> Marks(const Scenario& scenario);

 private:
  const Scenario& scenario_;
  // The step each drive change and payload shift starts on (sim::FirstStepAtOrAfter), found once.
  std::vector<long> drive_steps_, shift_steps_;
  std::size_t next_drive_ = 0;
  double ramp_start_s_ = 0, ramp_s_ = 0;
  double from_speed_ = 0, from_yaw_rate_ = 0, to_speed_ = 0, to_yaw_rate_ = 0;
  host::Reference reference_;
  double payload_base_m_ = 0, payload_target_m_ = 0;
  bool payload_moving_ = false;
  double path_x_m_ = 0, path_y_m_ = 0, path_yaw_rad_ = 0;
};

}  // namespace upright::runner::internal
