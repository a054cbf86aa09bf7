// <controllers>: the controllers to compare, their settings, and which one is the baseline.
#include <array>
#include <cmath>
#include <filesystem>
#include <map>
#include <string>
#include <system_error>

#include "scenario_reading.hpp"

namespace upright::runner::internal {
namespace {

// The built-in modules a scenario may name. Only the names are checked here: finding and loading
// the module (and its refusal of bad settings) is the runner's job, so that reading a scenario
// never loads code.
constexpr std::array<std::string_view, 4> kBuiltinNames = {"lqr", "hinf", "lqg", "pid"};

// A controller period (1 / rate_hz) must be a whole number (>= 1) of physics steps, as the
// controller host requires; same tolerance as the host.
bool WholeStepsPeriod(double rate_hz, double dt_s) {
  const double steps = 1 / (rate_hz * dt_s);
  return steps >= 1 && std::abs(steps - std::round(steps)) <= 1e-6 * steps;
}

void ReadSettings(model::XmlElement& element, const ReadContext& context, ControllerEntry* entry) {
  std::map<std::string, int> first_line;
  for (model::XmlElement setting : element.Children("setting")) {
    const std::optional<std::string> key = setting.String("key", model::Presence::kRequired);
    const std::optional<std::string> value = setting.String("value", model::Presence::kRequired);
    if (!key) continue;
    if (key->empty()) {
      context.FieldError(setting, "key", "''", "must not be empty");
      continue;
    }
    const auto [first, inserted] = first_line.emplace(*key, setting.line());
    if (!inserted) {
      context.FieldError(
          setting, "key", Quote(*key),
          "given twice in this controller (first at line " + std::to_string(first->second) + ")");
      continue;
    }
    if (value) entry->config.emplace_back(*key, *value);
  }
}

ControllerEntry ReadController(model::XmlElement element, const ReadContext& context,
                               std::map<std::string, int>* first_line) {
  ControllerEntry entry;
  entry.line = element.line();
  if (std::optional<std::string> name = element.String("name", model::Presence::kRequired)) {
    entry.name = *name;
    if (!IsSafeName(*name)) {
      context.FieldError(element, "name", Quote(*name), std::string(kSafeNameRule));
    } else if (const auto [first, inserted] = first_line->emplace(*name, element.line());
               !inserted) {
      context.FieldError(element, "name", Quote(*name),
                         "given twice (first at line " + std::to_string(first->second) + ")");
    }
  }
  const bool builtin_given = element.Has("builtin");
  const bool file_given = element.Has("file");
  const std::optional<std::size_t> builtin =
      element.Choice("builtin", kBuiltinNames, model::Presence::kOptional);
  const std::optional<std::string> file = element.String("file", model::Presence::kOptional);
  if (builtin_given == file_given) {
    context.Error(element, std::string("give exactly one of builtin or file (") +
                               (builtin_given ? "both" : "neither") + " given)");
  } else if (builtin) {
    entry.module = kBuiltinNames[*builtin];
    entry.builtin = true;
  } else if (file) {
    entry.module = ResolvePath(context.base_dir, *file);
    entry.builtin = false;
    std::error_code error;
    if (!std::filesystem::is_regular_file(entry.module, error)) {
      context.FieldError(element, "file", Quote(*file),
                         "no such file (resolved to " + Quote(entry.module) + ")");
    }
  }
  bool rate_read = true;
  entry.rate_hz = OptionalNumber(element, "rate_hz", 0, &rate_read);
  if (rate_read && element.Has("rate_hz")) {
    if (!(entry.rate_hz > 0)) {
      context.FieldError(element, "rate_hz", Num(entry.rate_hz),
                         "must be > 0 (leave it out for the robot's control rate)");
    } else if (context.duration_s && !(entry.rate_hz * *context.duration_s >= 1)) {
      context.FieldError(element, "rate_hz", Num(entry.rate_hz),
                         "its period is longer than the run (duration_s = " +
                             Num(*context.duration_s) + "): the controller would never act");
    } else if (context.dt_s && !WholeStepsPeriod(entry.rate_hz, *context.dt_s)) {
      context.FieldError(element, "rate_hz", Num(entry.rate_hz),
                         "its period must be a whole number (>= 1) of physics steps of dt_s = " +
                             Num(*context.dt_s));
    }
  }
  bool unused = true;
  entry.true_state = OptionalBool(element, "true_state", false, &unused);
  ReadSettings(element, context, &entry);
  return entry;
}

}  // namespace

void ReadControllers(model::XmlElement root, ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> controllers =
      root.Child("controllers", model::Presence::kRequired);
  if (!controllers) return;
  const std::optional<std::string> baseline =
      controllers->String("baseline", model::Presence::kOptional);
  std::map<std::string, int> first_line;
  for (model::XmlElement element : controllers->Children("controller")) {
    scenario->controllers.push_back(ReadController(element, context, &first_line));
  }
  if (scenario->controllers.empty()) {
    context.Error(*controllers, "needs at least one <controller>");
    return;
  }
  scenario->baseline = 0;
  if (!baseline) return;
  std::string names;
  for (std::size_t i = 0; i < scenario->controllers.size(); ++i) {
    const std::string& name = scenario->controllers[i].name;
    if (name == *baseline) {
      scenario->baseline = i;
      return;
    }
    names += (names.empty() ? "" : ", ") + name;
  }
  context.FieldError(*controllers, "baseline", Quote(*baseline),
                     "names no controller (expected one of: " + names + ")");
}

}  // namespace upright::runner::internal
