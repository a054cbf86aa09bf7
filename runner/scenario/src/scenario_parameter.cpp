// Scenario parameters by path: parse "a/b[2].attr", find the number it names, and check what a new
// value touches.
#include "upright/runner/scenario/scenario_parameter.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <functional>
#include <numbers>
#include <sstream>

#include "upright/base/number_text.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/edge_compare.hpp"
#include "upright/model/model_field.hpp"
#include "upright/model/model_file.hpp"

namespace upright::runner {
namespace {

constexpr double kDeg = std::numbers::pi / 180;

struct Path {
  std::string element;    // "timeline/push", "robot/sensors/gyro", "ground"
  std::size_t index = 0;  // 1-based index of the last element, 0 when none was written
  std::string attribute;  // "peak_N"
};

Result<Path> ParsePath(const std::string& text) {
  const auto dot = text.rfind('.');
  if (dot == std::string::npos || dot == 0 || dot + 1 == text.size()) {
    return Failure("parameter '" + text + "': expected element path '.' attribute, as in " +
                   "timeline/push[1].peak_N");
  }
  Path path;
  path.attribute = text.substr(dot + 1);
  std::string element = text.substr(0, dot);
  const auto open = element.find('[');
  if (open != std::string::npos) {
    const auto close = element.find(']', open);
    const std::string digits = element.substr(open + 1, close - open - 1);
    // An index too large for a count of elements is refused like any other bad index.
    std::size_t index = 0;
    const char* end = digits.data() + digits.size();
    const auto [stop, error] = std::from_chars(digits.data(), end, index);
    if (close != element.size() - 1 || digits.empty() ||
        !std::all_of(digits.begin(), digits.end(), [](char c) { return c >= '0' && c <= '9'; }) ||
        error != std::errc() || stop != end || index == 0) {
      return Failure("parameter '" + text + "': an index is [1], [2], ... after the last element");
    }
    path.index = index;
    element = element.substr(0, open);
  }
  path.element = element;
  return path;
}

// A number inside the scenario: where it lives, how the file's unit converts to SI.
struct Slot {
  double* si = nullptr;
  double per_file_unit = 1;  // SI value of one file unit (kDeg for degrees)
};

// A value as messages print it: exactly, so a value just past a limit never reads as on it.
std::string Num(double value) { return WholeOrShortestText(value); }

// The element of the list a timeline path names, or why the list is too short for its index.
template <typename T>
Result<T*> Pick(std::vector<T>& list, const Path& path) {
  const std::size_t i = path.index == 0 ? 1 : path.index;
  if (i > list.size()) {
    const std::string name = path.element.substr(path.element.rfind('/') + 1);
    std::ostringstream why;
    why << path.element << "[" << i << "]." << path.attribute << ": the scenario has "
        << list.size() << " <" << name << "> element" << (list.size() == 1 ? "" : "s");
    return Failure(why.str());
  }
  return &list[i - 1];
}

tl::unexpected<std::string> Unknown(const Path& path, const std::string& choices) {
  return Failure("no parameter " + path.element + "." + path.attribute + " (" + choices + ")");
}

// Finds the slot for a scenario (not robot) path.
Result<Slot> FindSlot(Scenario& s, const Path& p) {
  const std::string& a = p.attribute;
  const auto choose = [&](std::initializer_list<std::pair<const char*, Slot>> slots,
                          const std::string& list) -> Result<Slot> {
    for (const auto& [name, candidate] : slots) {
      if (a == name) return candidate;
    }
    return Unknown(p, list);
  };
  if (p.element == "start") {
    return choose({{"x_m", {&s.initial.x_m}},
                   {"pitch_deg", {&s.initial.pitch_rad, kDeg}},
                   {"speed_m_s", {&s.initial.speed_m_s}}},
                  "start: x_m, pitch_deg, speed_m_s");
  }
  if (p.element == "ground") {
    if (s.terrain.kind != sim::TerrainKind::kSlope || a != "slope_deg") {
      return Unknown(p, "ground: slope_deg, on a slope");
    }
    return Slot{&s.terrain.slope_deg};
  }
  if (p.element == "ground/friction") {
    return Pick(s.terrain.friction_regions, p).and_then([&](auto* r) {
      return choose({{"friction", {&r->friction}},
                     {"start_x_m", {&r->start_x_m}},
                     {"end_x_m", {&r->end_x_m}}},
                    "ground/friction: friction, start_x_m, end_x_m");
    });
  }
  if (p.element == "timeline/push") {
    return Pick(s.pushes, p).and_then([&](auto* e) {
      return choose({{"at_s", {&e->start_s}},
                     {"peak_N", {&e->peak_N}},
                     {"duration_s", {&e->duration_s}},
                     {"height_m", {&e->height_m}},
                     {"direction_deg", {&e->direction_deg}}},
                    "timeline/push: at_s, peak_N, duration_s, height_m, direction_deg");
    });
  }
  if (p.element == "timeline/payload_shift") {
    return Pick(s.payload_shifts, p).and_then([&](auto* e) {
      return choose({{"at_s", {&e->start_s}},
                     {"distance_m", {&e->distance_m}},
                     {"duration_s", {&e->duration_s}}},
                    "timeline/payload_shift: at_s, distance_m, duration_s");
    });
  }
  if (p.element == "timeline/drive") {
    return Pick(s.drives, p).and_then([&](auto* e) {
      return choose({{"at_s", {&e->start_s}},
                     {"speed_m_s", {&e->speed_m_s}},
                     {"yaw_rate_deg_s", {&e->yaw_rate_rad_s, kDeg}},
                     {"ramp_s", {&e->ramp_s}}},
                    "timeline/drive: at_s, speed_m_s, yaw_rate_deg_s, ramp_s");
    });
  }
  if (p.element == "timeline/motor_fault") {
    return Pick(s.motor_faults, p).and_then([&](auto* e) {
      return choose({{"at_s", {&e->start_s}}, {"torque_scale", {&e->torque_scale}}},
                    "timeline/motor_fault: at_s, torque_scale");
    });
  }
  if (p.element == "timeline/sensor_fault") {
    return Pick(s.sensor_faults, p).and_then([&](auto* e) {
      return choose(
          {{"at_s", {&e->start_s}}, {"value", {&e->value}}, {"duration_s", {&e->duration_s}}},
          "timeline/sensor_fault: at_s, value, duration_s");
    });
  }
  return Failure("no parameter element '" + p.element +
                 "' (elements: start, ground, ground/friction, timeline/push, "
                 "timeline/payload_shift, timeline/drive, timeline/motor_fault, "
                 "timeline/sensor_fault, robot/...)");
}

// The carriage target at the breakpoints of the payload shifts, each side of any jump, must stay
// within the travel (the plant would clamp it; a scenario asking for more is wrong).
Status PayloadWithinTravel(const Scenario& s) {
  const model::RobotModel& robot = s.built_model();
  if (s.payload_shifts.empty()) return {};
  if (!robot.payload.present) return Failure("robot '" + robot.name + "' has no payload to shift");
  std::vector<double> times;
  for (const auto& p : s.payload_shifts) {
    times.push_back(p.start_s);
    times.push_back(p.start_s + p.duration_s);
  }
  for (const double t : times) {
    for (const bool jumps_included : {false, true}) {
      double target = robot.payload.x_m;
      double scale = std::abs(target);  // summed magnitudes, for the edge comparison
      for (const auto& p : s.payload_shifts) {
        double f = 0;
        if (p.duration_s > 0) {
          f = std::clamp((t - p.start_s) / p.duration_s, 0.0, 1.0);
        } else {
          f = (t > p.start_s || (jumps_included && t == p.start_s)) ? 1.0 : 0.0;
        }
        target += f * p.distance_m;
        scale += std::abs(f * p.distance_m);
      }
      if (!model::NoMoreThan(robot.payload.min_x_m, target, scale) ||
          !model::NoMoreThan(target, robot.payload.max_x_m, scale)) {
        std::ostringstream why;
        why << "the payload target reaches " << Num(target) << " m at " << t
            << " s, outside the carriage travel [" << Num(robot.payload.min_x_m) << ", "
            << Num(robot.payload.max_x_m) << "] m";
        return Failure(why.str());
      }
    }
  }
  return {};
}

// An event's start within the run: [0, duration_s).
Status InRun(double start_s, double duration_s, const char* what) {
  if (start_s >= 0 && start_s < duration_s) return {};
  std::ostringstream why;
  why << what << " at_s = " << start_s << ": must be in [0, " << duration_s << ")";
  return Failure(why.str());
}

// The timeline's events: each one's own rules and its start within the run.
Status CheckEvents(const Scenario& s) {
  const model::ChassisModel& chassis = s.built_model().chassis;
  for (const auto& p : s.pushes) {
    if (Status valid = p.Validate(); !valid) return valid;
    if (Status in_run = InRun(p.start_s, s.duration_s, "push"); !in_run) return in_run;
    const double scale_m = std::abs(chassis.outline_bottom_m) + std::abs(chassis.outline_top_m);
    if (!model::NoMoreThan(chassis.outline_bottom_m, p.height_m, scale_m) ||
        !model::NoMoreThan(p.height_m, chassis.outline_top_m, scale_m)) {
      return Failure("push height_m = " + Num(p.height_m) +
                     ": must be within the chassis outline [" + Num(chassis.outline_bottom_m) +
                     ", " + Num(chassis.outline_top_m) + "] m");
    }
  }
  for (const auto& p : s.payload_shifts) {
    if (Status in_run = InRun(p.start_s, s.duration_s, "payload shift"); !in_run) return in_run;
    if (!(p.duration_s >= 0)) return Failure("payload shift duration_s must be >= 0");
  }
  for (const auto& d : s.drives) {
    if (Status in_run = InRun(d.start_s, s.duration_s, "drive change"); !in_run) return in_run;
    if (!(d.ramp_s >= 0)) return Failure("drive change ramp_s must be >= 0");
  }
  for (const auto& f : s.motor_faults) {
    if (Status valid = f.Validate(); !valid) return valid;
    if (Status in_run = InRun(f.start_s, s.duration_s, "motor fault"); !in_run) return in_run;
  }
  for (const auto& f : s.sensor_faults) {
    if (Status valid = f.Validate(); !valid) return valid;
    if (Status in_run = InRun(f.start_s, s.duration_s, "sensor fault"); !in_run) return in_run;
  }
  return {};
}

// What a changed scenario must still keep; its timeline lists sorted by start time again.
Status Check(Scenario& s) {
  if (Status valid = s.terrain.Validate(); !valid) return valid;
  if (Status events = CheckEvents(s); !events) return events;
  if (!(std::abs(s.initial.pitch_rad) < std::numbers::pi / 2)) {
    return Failure("start pitch_deg must be in (-90, 90)");
  }
  if (s.plant_model) {
    const auto valid_model = model::ValidateModel(*s.plant_model);
    if (!valid_model) return Failure("robot: " + valid_model.error().front());
  }
  if (Status travel = PayloadWithinTravel(s); !travel) return travel;
  // Keep every timeline list in start-time order, as the timeline expects.
  const auto by_start = [](const auto& a, const auto& b) { return a.start_s < b.start_s; };
  std::stable_sort(s.pushes.begin(), s.pushes.end(), by_start);
  std::stable_sort(s.payload_shifts.begin(), s.payload_shifts.end(), by_start);
  std::stable_sort(s.drives.begin(), s.drives.end(), by_start);
  std::stable_sort(s.motor_faults.begin(), s.motor_faults.end(), by_start);
  std::stable_sort(s.sensor_faults.begin(), s.sensor_faults.end(), by_start);
  return {};
}

// "robot/chassis" → "chassis"; false when the path is not a robot path.
bool RobotElement(const Path& p, std::string* element) {
  const std::string prefix = "robot/";
  if (p.element.rfind(prefix, 0) != 0 || p.index != 0) return false;
  *element = p.element.substr(prefix.size());
  return true;
}

}  // namespace

const std::vector<std::string>& ScenarioParameterHelp() {
  static const std::vector<std::string> help{
      "start.x_m | pitch_deg | speed_m_s",
      "ground.slope_deg (a slope)",
      "ground/friction[i].friction | start_x_m | end_x_m",
      "timeline/push[i].at_s | peak_N | duration_s | height_m | direction_deg",
      "timeline/payload_shift[i].at_s | distance_m | duration_s",
      "timeline/drive[i].at_s | speed_m_s | yaw_rate_deg_s | ramp_s",
      "timeline/motor_fault[i].at_s | torque_scale",
      "timeline/sensor_fault[i].at_s | value | duration_s",
      "robot/<element>.<attribute>: any numeric robot model field (models/README.md), e.g. "
      "robot/chassis.mass_kg, robot/wheels.friction, robot/sensors/gyro.bias_y_rad_s",
  };
  return help;
}

Result<double> GetScenarioParameter(const Scenario& scenario, const std::string& path) {
  const Result<Path> p = ParsePath(path);
  if (!p) return Failure(p.error());
  std::string element;
  if (RobotElement(*p, &element)) {
    return model::GetModelField(scenario.built_model(), element, p->attribute);
  }
  Scenario copy = scenario;  // FindSlot hands out pointers into a scenario it may change
  const Result<Slot> slot = FindSlot(copy, *p);
  if (!slot) return Failure(slot.error());
  return *slot->si / slot->per_file_unit;
}

Status SetScenarioParameter(Scenario* scenario, const std::string& path, double value) {
  const Result<Path> p = ParsePath(path);
  if (!p) return Failure(p.error());
  if (!std::isfinite(value))
    return Failure(path + " = " + Num(value) + ": must be a finite number");
  Scenario changed = *scenario;
  std::string element;
  if (RobotElement(*p, &element)) {
    model::RobotModel robot = changed.built_model();
    if (Status set = model::SetModelField(&robot, element, p->attribute, value); !set) {
      return Failure(path + " = " + Num(value) + ": " + set.error());
    }
    changed.plant_model = robot;
  } else {
    const Result<Slot> slot = FindSlot(changed, *p);
    if (!slot) return Failure(slot.error());
    *slot->si = value * slot->per_file_unit;
  }
  if (Status checked = Check(changed); !checked) {
    return Failure(path + " = " + Num(value) + ": " + checked.error());
  }
  *scenario = std::move(changed);
  return {};
}

}  // namespace upright::runner
