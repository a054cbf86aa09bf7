// <timeline>: pushes, payload shifts, drive changes, motor and sensor faults, each list sorted by
// start time.
#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numbers>
#include <string>
#include <utility>
#include <vector>

#include "scenario_reading.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/edge_compare.hpp"

namespace upright::runner::internal {
namespace {

constexpr double kDegToRad = std::numbers::pi / 180.0;

template <typename Enum, std::size_t N>
std::array<std::string_view, N> Names(const std::array<Enum, N>& values) {
  std::array<std::string_view, N> names;
  for (std::size_t i = 0; i < N; ++i) names[i] = sim::ToString(values[i]);
  return names;
}

constexpr std::array<sim::PushShape, 3> kShapes = {sim::PushShape::kImpulse, sim::PushShape::kStep,
                                                   sim::PushShape::kHalfSine};
constexpr std::array<sim::MotorSide, 3> kSides = {sim::MotorSide::kLeft, sim::MotorSide::kRight,
                                                  sim::MotorSide::kBoth};
constexpr std::array<sim::SensorChannel, 8> kChannels = {
    sim::SensorChannel::kGyroX,       sim::SensorChannel::kGyroY,       sim::SensorChannel::kGyroZ,
    sim::SensorChannel::kAccelX,      sim::SensorChannel::kAccelY,      sim::SensorChannel::kAccelZ,
    sim::SensorChannel::kEncoderLeft, sim::SensorChannel::kEncoderRight};
constexpr std::array<sim::SensorFaultKind, 3> kFaultKinds = {
    sim::SensorFaultKind::kBias, sim::SensorFaultKind::kDropout, sim::SensorFaultKind::kStuck};

template <typename Event>
void SortByStart(std::vector<Event>& events) {
  std::stable_sort(events.begin(), events.end(),
                   [](const Event& a, const Event& b) { return a.start_s < b.start_s; });
}

void ReadPush(model::XmlElement element, const ReadContext& context,
              std::vector<sim::Push>* pushes) {
  static const auto kShapeNames = Names(kShapes);
  bool ok = true;
  sim::Push push;
  const std::optional<double> start = ReadEventStart(element, context);
  ok = ok && start.has_value();
  push.start_s = start.value_or(0);
  const std::optional<std::size_t> shape =
      element.Choice("shape", kShapeNames, model::Presence::kRequired);
  ok = ok && shape.has_value();
  if (shape) push.shape = kShapes[*shape];
  push.peak_N = RequiredNumber(element, "peak_N", &ok);
  // A step may run to the end; the other shapes are pulses and need a length.
  if (shape && push.shape != sim::PushShape::kStep) {
    push.duration_s = RequiredNumber(element, "duration_s", &ok);
  } else {
    push.duration_s =
        OptionalNumber(element, "duration_s", std::numeric_limits<double>::infinity(), &ok);
  }
  push.direction_deg = OptionalNumber(element, "direction_deg", 0, &ok);
  const double default_height_m =
      context.model != nullptr ? context.model->chassis.com_height_m : push.height_m;
  push.height_m = OptionalNumber(element, "height_m", default_height_m, &ok);
  if (ok) {
    if (Status valid = push.Validate(); !valid) context.Error(element, valid.error());
  }
  if (ok && context.model != nullptr) {
    const model::ChassisModel& chassis = context.model->chassis;
    const double scale_m = std::abs(chassis.outline_bottom_m) + std::abs(chassis.outline_top_m);
    if (!model::NoMoreThan(chassis.outline_bottom_m, push.height_m, scale_m) ||
        !model::NoMoreThan(push.height_m, chassis.outline_top_m, scale_m)) {
      context.FieldError(element, "height_m", Num(push.height_m),
                         "must be within the chassis outline [" + Num(chassis.outline_bottom_m) +
                             ", " + Num(chassis.outline_top_m) + "] of " + context.Robot() +
                             " (bottom_m to top_m, above the axle)");
    }
  }
  pushes->push_back(push);
}

// The carriage target of `shifts` (in start order) at time t: each shift adds its share of its
// distance. With `jumps_at_t` false, shifts of zero duration starting exactly at t are left out,
// giving the value just before t. *scale_m gets the sum of the magnitudes added, for comparing the
// target with a travel limit (edge_compare.hpp).
double CarriageTarget(double home_m, const std::vector<PayloadShift>& shifts, double t_s,
                      bool jumps_at_t, double* scale_m) {
  double target_m = home_m;
  *scale_m = std::abs(home_m);
  for (const PayloadShift& shift : shifts) {
    double share = 0;
    if (shift.duration_s > 0) {
      share = std::clamp((t_s - shift.start_s) / shift.duration_s, 0.0, 1.0);
    } else if (t_s > shift.start_s || (jumps_at_t && t_s == shift.start_s)) {
      share = 1;
    }
    target_m += share * shift.distance_m;
    *scale_m += std::abs(share * shift.distance_m);
  }
  return target_m;
}

// The target is piecewise linear in time, so its extremes lie at the shifts' starts and ends
// (just before or at each). Reports the first time it leaves the travel, at the line of the shift
// that starts or ends there.
void CheckPayloadTravel(const std::vector<std::pair<PayloadShift, model::XmlElement>>& shifts,
                        const ReadContext& context) {
  const model::PayloadModel& payload = context.model->payload;
  std::vector<PayloadShift> plain;
  std::vector<std::pair<double, std::size_t>> breakpoints;  // time, shift
  for (std::size_t i = 0; i < shifts.size(); ++i) {
    plain.push_back(shifts[i].first);
    breakpoints.emplace_back(shifts[i].first.start_s, i);
    breakpoints.emplace_back(shifts[i].first.start_s + shifts[i].first.duration_s, i);
  }
  std::stable_sort(breakpoints.begin(), breakpoints.end(),
                   [](const auto& a, const auto& b) { return a.first < b.first; });
  for (const auto& [t_s, i] : breakpoints) {
    for (const bool jumps_at_t : {false, true}) {
      double scale_m = 0;
      const double target_m = CarriageTarget(payload.x_m, plain, t_s, jumps_at_t, &scale_m);
      if (model::NoMoreThan(payload.min_x_m, target_m, scale_m) &&
          model::NoMoreThan(target_m, payload.max_x_m, scale_m)) {
        continue;
      }
      context.FieldError(shifts[i].second, "distance_m", Num(shifts[i].first.distance_m),
                         "the carriage target reaches " + Num(target_m) + " m at t = " +
                             Approx(t_s) + " s, outside the travel [" + Num(payload.min_x_m) +
                             ", " + Num(payload.max_x_m) + "] m of " + context.Robot() +
                             " (the plant would clamp it; the scenario is refused instead)");
      return;
    }
  }
}

void ReadPayloadShifts(model::XmlElement& timeline, const ReadContext& context,
                       std::vector<PayloadShift>* payload_shifts) {
  std::vector<std::pair<PayloadShift, model::XmlElement>> shifts;
  bool ok = true;
  for (model::XmlElement element : timeline.Children("payload_shift")) {
    PayloadShift shift;
    const std::optional<double> start = ReadEventStart(element, context);
    ok = ok && start.has_value();
    shift.start_s = start.value_or(0);
    shift.distance_m = RequiredNumber(element, "distance_m", &ok);
    shift.duration_s = OptionalNumber(element, "duration_s", 0, &ok);
    if (shift.duration_s < 0) {
      context.FieldError(element, "duration_s", Num(shift.duration_s), "must be >= 0");
      ok = false;
    }
    if (context.model != nullptr && !context.model->payload.present && shifts.empty()) {
      context.Error(element, context.Robot() + " has no payload to shift");
      ok = false;
    }
    shifts.emplace_back(shift, element);
  }
  std::stable_sort(shifts.begin(), shifts.end(),
                   [](const auto& a, const auto& b) { return a.first.start_s < b.first.start_s; });
  if (ok && context.model != nullptr) CheckPayloadTravel(shifts, context);
  for (const auto& shift : shifts) payload_shifts->push_back(shift.first);
}

void ReadDrive(model::XmlElement element, const ReadContext& context,
               std::vector<DriveChange>* drives) {
  bool ok = true;
  DriveChange drive;
  drive.start_s = ReadEventStart(element, context).value_or(0);
  drive.speed_m_s = OptionalNumber(element, "speed_m_s", 0, &ok);
  drive.yaw_rate_rad_s = OptionalNumber(element, "yaw_rate_deg_s", 0, &ok) * kDegToRad;
  drive.ramp_s = OptionalNumber(element, "ramp_s", 0, &ok);
  if (drive.ramp_s < 0) context.FieldError(element, "ramp_s", Num(drive.ramp_s), "must be >= 0");
  drives->push_back(drive);
}

void ReadMotorFault(model::XmlElement element, const ReadContext& context,
                    std::vector<sim::MotorFault>* faults) {
  static const auto kSideNames = Names(kSides);
  bool ok = true;
  sim::MotorFault fault;
  const std::optional<double> start = ReadEventStart(element, context);
  ok = ok && start.has_value();
  fault.start_s = start.value_or(0);
  const std::optional<std::size_t> side =
      element.Choice("side", kSideNames, model::Presence::kRequired);
  ok = ok && side.has_value();
  if (side) fault.side = kSides[*side];
  bool scale_read = true;
  fault.torque_scale = RequiredNumber(element, "torque_scale", &scale_read);
  if (scale_read && !(fault.torque_scale >= 0 && fault.torque_scale <= 1)) {
    context.FieldError(element, "torque_scale", Num(fault.torque_scale),
                       "must be in [0, 1] (1 healthy, 0 dead)");
  }
  ok = ok && scale_read && fault.torque_scale >= 0 && fault.torque_scale <= 1;
  if (ok) {
    if (Status valid = fault.Validate(); !valid) context.Error(element, valid.error());
  }
  faults->push_back(fault);
}

void ReadSensorFault(model::XmlElement element, const ReadContext& context,
                     std::vector<sim::SensorFault>* faults) {
  static const auto kChannelNames = Names(kChannels);
  static const auto kKindNames = Names(kFaultKinds);
  bool ok = true;
  sim::SensorFault fault;
  const std::optional<double> start = ReadEventStart(element, context);
  ok = ok && start.has_value();
  fault.start_s = start.value_or(0);
  const std::optional<std::size_t> channel =
      element.Choice("channel", kChannelNames, model::Presence::kRequired);
  ok = ok && channel.has_value();
  if (channel) fault.channel = kChannels[*channel];
  const std::optional<std::size_t> kind =
      element.Choice("kind", kKindNames, model::Presence::kRequired);
  ok = ok && kind.has_value();
  if (kind) fault.kind = kFaultKinds[*kind];
  // Only a bias has a value; a dropout reads 0 and a stuck channel holds its last reading.
  if (kind && fault.kind == sim::SensorFaultKind::kBias) {
    fault.value = RequiredNumber(element, "value", &ok);
  } else {
    fault.value = OptionalNumber(element, "value", 0, &ok);
    if (kind && element.Has("value")) {
      context.FieldError(element, "value", Num(fault.value),
                         "only with kind = 'bias' (kind is " + Quote(kKindNames[*kind]) + ")");
      ok = false;
    }
  }
  fault.duration_s =
      OptionalNumber(element, "duration_s", std::numeric_limits<double>::infinity(), &ok);
  if (!(fault.duration_s > 0)) {
    context.FieldError(element, "duration_s", Num(fault.duration_s),
                       "must be > 0 (leave it out for a fault that lasts to the end)");
    ok = false;
  }
  if (ok) {
    if (Status valid = fault.Validate(); !valid) context.Error(element, valid.error());
  }
  faults->push_back(fault);
}

}  // namespace

void ReadTimeline(model::XmlElement root, ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> timeline = root.Child("timeline", model::Presence::kOptional);
  if (!timeline) return;
  for (model::XmlElement element : timeline->Children("push")) {
    ReadPush(element, context, &scenario->pushes);
  }
  ReadPayloadShifts(*timeline, context, &scenario->payload_shifts);
  for (model::XmlElement element : timeline->Children("drive")) {
    ReadDrive(element, context, &scenario->drives);
  }
  for (model::XmlElement element : timeline->Children("motor_fault")) {
    ReadMotorFault(element, context, &scenario->motor_faults);
  }
  for (model::XmlElement element : timeline->Children("sensor_fault")) {
    ReadSensorFault(element, context, &scenario->sensor_faults);
  }
  SortByStart(scenario->pushes);
  SortByStart(scenario->drives);
  SortByStart(scenario->motor_faults);
  SortByStart(scenario->sensor_faults);
}

}  // namespace upright::runner::internal
