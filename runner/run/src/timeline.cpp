#include "timeline.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <string>

#include "upright/base/number_text.hpp"
#include "upright/model/conventions.hpp"

namespace upright::runner::internal {
namespace {

// 0 before start, rising linearly to 1 over `length` (at once when length is 0).
double Ramp(double time_s, double start_s, double length_s) {
  if (time_s < start_s) return 0;
  if (length_s <= 0 || time_s >= start_s + length_s) return 1;
  return (time_s - start_s) / length_s;
}

}  // namespace

Timeline::Timeline(const Scenario& scenario) : scenario_(scenario) {
  const model::RobotModel& robot = scenario.built_model();
  payload_base_m_ = robot.payload.present ? robot.payload.x_m : 0.0;
  payload_target_m_ = payload_base_m_;
  path_x_m_ = scenario.initial.x_m;
  for (const auto& d : scenario.drives) {
    drive_steps_.push_back(sim::FirstStepAtOrAfter(d.start_s, scenario.dt_s));
  }
  for (const auto& p : scenario.payload_shifts) {
    shift_steps_.push_back(sim::FirstStepAtOrAfter(p.start_s, scenario.dt_s));
  }
}

void Timeline::Advance(long step) {
  const auto& drives = scenario_.drives;
  const double time_s = static_cast<double>(step) * scenario_.dt_s;
  while (next_drive_ < drives.size() && drive_steps_[next_drive_] <= step) {
    const DriveChange& d = drives[next_drive_++];
    from_speed_ = reference_.forward_speed_m_s;
    from_yaw_rate_ = reference_.yaw_rate_rad_s;
    to_speed_ = d.speed_m_s;
    to_yaw_rate_ = d.yaw_rate_rad_s;
    ramp_start_s_ = d.start_s;
    ramp_s_ = d.ramp_s;
  }
  if (next_drive_ > 0) {
    const double f = Ramp(std::max(time_s, ramp_start_s_), ramp_start_s_, ramp_s_);
    reference_.forward_speed_m_s = from_speed_ + f * (to_speed_ - from_speed_);
    reference_.yaw_rate_rad_s = from_yaw_rate_ + f * (to_yaw_rate_ - from_yaw_rate_);
  }
  if (!shift_steps_.empty()) {
    double target = payload_base_m_;
    payload_moving_ = false;
    for (std::size_t i = 0; i < shift_steps_.size(); ++i) {
      const PayloadShift& p = scenario_.payload_shifts[i];
      const double f = shift_steps_[i] <= step
                           ? Ramp(std::max(time_s, p.start_s), p.start_s, p.duration_s)
                           : 0.0;
      target += f * p.distance_m;
      payload_moving_ = payload_moving_ || (f > 0 && f < 1);
    }
    payload_target_m_ = target;
  }
}

void Timeline::Integrate(double dt_s) {
  // Forward Euler on the reference held over the step, as the controller's own integrator does.
  path_x_m_ += reference_.forward_speed_m_s * std::cos(path_yaw_rad_) * dt_s;
  path_y_m_ += reference_.forward_speed_m_s * std::sin(path_yaw_rad_) * dt_s;
  path_yaw_rad_ += reference_.yaw_rate_rad_s * dt_s;
}

std::vector<double> Timeline::DisturbanceStarts(const Scenario& s) {
  std::vector<double> starts;
  if (s.initial.pitch_rad != 0 || s.initial.speed_m_s != 0) starts.push_back(0);
  for (const auto& p : s.pushes) starts.push_back(p.start_s);
  for (const auto& p : s.payload_shifts) starts.push_back(p.start_s);
  for (const auto& f : s.motor_faults) starts.push_back(f.start_s);
  for (const auto& f : s.sensor_faults) starts.push_back(f.start_s);
  std::sort(starts.begin(), starts.end());
  starts.erase(std::unique(starts.begin(), starts.end()), starts.end());
  return starts;
}

double Timeline::QuietFrom(const Scenario& s) {
  if (!s.drives.empty()) {
    const DriveChange& last = s.drives.back();
    if (last.speed_m_s != 0 || last.yaw_rate_rad_s != 0) {
      return std::numeric_limits<double>::infinity();
    }
  }
  double from = 0;
  const auto after = [&](double t) { from = std::max(from, t); };
  for (const auto& p : s.pushes) after(std::isfinite(p.end_s()) ? p.end_s() : p.start_s);
  for (const auto& p : s.payload_shifts) after(p.start_s + p.duration_s);
  for (const auto& d : s.drives) after(d.start_s + d.ramp_s);
  for (const auto& f : s.motor_faults) after(f.start_s);
  for (const auto& f : s.sensor_faults) {
    after(std::isfinite(f.duration_s) ? f.start_s + f.duration_s : f.start_s);
  }
  return from;
}

std::vector<EventMark> Timeline::Marks(const Scenario& s) {
  std::vector<EventMark> marks;
  // The time of the first physics step an event acts on, computed as the plant computes a step's
  // time, so that a trace row at that step compares equal.
  const auto acts_at = [&](double start_s) {
    return static_cast<double>(sim::FirstStepAtOrAfter(start_s, s.dt_s)) * s.dt_s;
  };
  for (const auto& p : s.pushes) {
    marks.push_back({acts_at(p.start_s), "push " + FixedText(p.peak_N, 0) + " N " +
                                             sim::ToString(p.shape) + " " +
                                             SignificantText(p.duration_s, 3) + " s"});
  }
  for (const auto& p : s.payload_shifts) {
    marks.push_back({acts_at(p.start_s), "payload shift " + SignedSignificantText(p.distance_m, 3) +
                                             " m over " + SignificantText(p.duration_s, 3) + " s"});
  }
  for (const auto& d : s.drives) {
    marks.push_back(
        {acts_at(d.start_s), "drive " + SignificantText(d.speed_m_s, 3) + " m/s, " +
                                 SignificantText(d.yaw_rate_rad_s * 180 / std::numbers::pi, 3) +
                                 " deg/s over " + SignificantText(d.ramp_s, 3) + " s"});
  }
  for (const auto& f : s.motor_faults) {
    marks.push_back({acts_at(f.start_s), std::string("motor fault ") + sim::ToString(f.side) +
                                             " torque x" + SignificantText(f.torque_scale, 3)});
  }
  for (const auto& f : s.sensor_faults) {
    std::string label =
        std::string("sensor fault ") + sim::ToString(f.channel) + " " + sim::ToString(f.kind);
    if (f.kind == sim::SensorFaultKind::kBias) {
      label += ' ';
      label += SignedSignificantText(f.value, 3);
    }
    marks.push_back({acts_at(f.start_s), label});
  }
  std::stable_sort(marks.begin(), marks.end(),
                   [](const EventMark& a, const EventMark& b) { return a.time_s < b.time_s; });
  return marks;
}

}  // namespace upright::runner::internal
