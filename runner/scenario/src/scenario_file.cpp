#include "upright/runner/scenario/scenario_file.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <numbers>
#include <optional>
#include <set>
#include <string>
#include <system_error>
#include <utility>

#include "scenario_dispersions.hpp"
#include "scenario_reading.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/model/seconds_hint.hpp"
#include "upright/model/xml_reader.hpp"

namespace upright::runner {
namespace {

using internal::Num;
using internal::Quote;
using internal::ReadContext;

constexpr long long kSchemaVersion = 1;
// More seeds than this in one scenario is far more likely a typo than a plan (each seed is one
// run per controller).
constexpr long long kMaxSeeds = 10000;

// duration_s, dt_s, solver_iterations and sensor_noise on the root.
void ReadRunSettings(model::XmlElement& root, ReadContext& context, Scenario* scenario) {
  bool ok = true;
  const bool dt_given = root.Has("dt_s");
  scenario->dt_s = internal::OptionalNumber(root, "dt_s", scenario->dt_s, &ok);
  if (dt_given && ok && !(scenario->dt_s > 0 && scenario->dt_s <= 0.01)) {
    // Too long a step is most often milliseconds written where seconds belong.
    context.FieldError(root, "dt_s", Num(scenario->dt_s),
                       scenario->dt_s > 0.01
                           ? "must be in (0, 0.01]; " + model::SecondsHint(scenario->dt_s)
                           : std::string("must be in (0, 0.01]"));
  } else if (ok) {
    context.dt_s = scenario->dt_s;
  }

  if (const std::optional<double> duration =
          root.Double("duration_s", model::Presence::kRequired)) {
    scenario->duration_s = *duration;
    if (!(*duration > 0)) {
      context.FieldError(root, "duration_s", Num(*duration), "must be > 0");
    } else if (context.dt_s) {
      const double steps = *duration / *context.dt_s;
      const double whole = std::round(steps);
      if (whole < 1 || std::abs(steps - whole) > 1e-9 * whole) {
        context.FieldError(
            root, "duration_s", Num(*duration),
            "must be a whole number of physics steps of dt_s = " + Num(*context.dt_s) + " (it is " +
                internal::Approx(steps) + " steps)");
      } else if (whole > kMaxRunSteps) {
        context.FieldError(root, "duration_s", Num(*duration),
                           "is " + Num(whole) + " physics steps of dt_s = " + Num(*context.dt_s) +
                               "; a run takes at most 1e7 (its metrics and trace are held in "
                               "memory): shorten it or lengthen dt_s");
      } else {
        context.duration_s = *duration;
      }
    } else {
      context.duration_s = *duration;
    }
  }

  if (const std::optional<long long> iterations =
          root.Integer("solver_iterations", model::Presence::kOptional)) {
    if (*iterations < 1 || *iterations > 1000) {
      context.FieldError(root, "solver_iterations", std::to_string(*iterations),
                         "must be in [1, 1000]");
    } else {
      scenario->solver_iterations = static_cast<int>(*iterations);
    }
  }
  bool unused = true;
  scenario->sensor_noise = internal::OptionalBool(root, "sensor_noise", true, &unused);
}

// <description>: one or two sentences of text.
void ReadDescription(model::XmlElement& root, const ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> description =
      root.Child("description", model::Presence::kRequired);
  if (!description) return;
  scenario->description = description->Text(model::Presence::kOptional).value_or("");
  if (scenario->description.empty()) {
    context.Error(*description,
                  "empty (expected one or two sentences saying what the scenario represents)");
  }
}

// <robot file>: resolved against the scenario's folder, then loaded. True when the model loaded;
// the model file's own problems go to *model_errors, to be listed after the scenario's.
bool ReadRobot(model::XmlElement& root, ReadContext& context, Scenario* scenario,
               std::vector<model::FileError>* model_errors) {
  std::optional<model::XmlElement> robot = root.Child("robot", model::Presence::kRequired);
  if (!robot) return false;
  const std::optional<std::string> file = robot->String("file", model::Presence::kRequired);
  if (!file) return false;
  context.model_file = *file;
  scenario->model_path = internal::ResolvePath(context.base_dir, *file);
  std::error_code error;
  if (!std::filesystem::is_regular_file(scenario->model_path, error)) {
    context.FieldError(*robot, "file", Quote(*file),
                       "no such file (resolved to " + Quote(scenario->model_path) + ")");
    return false;
  }
  // The robot's rates are checked against this scenario's own step (CheckRobotRates), not the
  // default one.
  auto loaded = model::LoadModelFile(scenario->model_path,
                                     model::ModelLoadOptions{.check_default_step = false});
  if (!loaded) {
    context.FieldError(*robot, "file", Quote(*file),
                       "the robot model has " + std::to_string(loaded.error().size()) +
                           (loaded.error().size() == 1 ? " problem" : " problems") +
                           " (listed after this file's)");
    *model_errors = std::move(loaded.error());
    return false;
  }
  scenario->model = std::move(*loaded);
  return true;
}

void ReadStart(model::XmlElement& root, const ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> start = root.Child("start", model::Presence::kOptional);
  if (!start) return;
  bool ok = true;
  sim::InitialState& initial = scenario->initial;
  initial.x_m = internal::OptionalNumber(*start, "x_m", 0, &ok);
  initial.speed_m_s = internal::OptionalNumber(*start, "speed_m_s", 0, &ok);
  bool pitch_read = true;
  const double pitch_deg = internal::OptionalNumber(*start, "pitch_deg", 0, &pitch_read);
  if (pitch_read && !(std::abs(pitch_deg) < 90)) {
    context.FieldError(*start, "pitch_deg", Num(pitch_deg), "must be in (-90, 90)");
  }
  initial.pitch_rad = pitch_deg * std::numbers::pi / 180.0;
}

// Whitespace-separated whole numbers >= 1, each once.
void ReadSeedList(model::XmlElement& seeds, const std::string& list, const ReadContext& context,
                  Scenario* scenario) {
  std::vector<std::uint64_t> values;
  std::set<std::uint64_t> seen;
  std::size_t at = 0;
  while (true) {
    at = list.find_first_not_of(" \t\r\n", at);
    if (at == std::string::npos) break;
    const std::size_t end = std::min(list.find_first_of(" \t\r\n", at), list.size());
    const std::string token = list.substr(at, end - at);
    at = end;
    std::uint64_t value = 0;
    const auto [stop, status] = std::from_chars(token.data(), token.data() + token.size(), value);
    if (status != std::errc{} || stop != token.data() + token.size() || value < 1) {
      context.FieldError(seeds, "list", Quote(list), Quote(token) + " is not a whole number >= 1");
      return;
    }
    if (!seen.insert(value).second) {
      context.FieldError(seeds, "list", Quote(list), "seed " + token + " is given twice");
      return;
    }
    values.push_back(value);
  }
  if (values.empty()) {
    context.FieldError(seeds, "list", Quote(list), "must hold at least one seed");
  } else if (static_cast<long long>(values.size()) > kMaxSeeds) {
    context.FieldError(seeds, "list", std::to_string(values.size()) + " seeds",
                       "must hold at most " + std::to_string(kMaxSeeds) + " seeds");
  } else {
    scenario->seeds = std::move(values);
  }
}

// <seeds list="1 2 3"/> or <seeds count="N" first="K"/>; absent: the one seed 1.
void ReadSeeds(model::XmlElement& root, const ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> seeds = root.Child("seeds", model::Presence::kOptional);
  if (!seeds) return;
  const std::optional<std::string> list = seeds->String("list", model::Presence::kOptional);
  const bool count_given = seeds->Has("count");
  const std::optional<long long> count = seeds->Integer("count", model::Presence::kOptional);
  const bool first_given = seeds->Has("first");
  const std::optional<long long> first = seeds->Integer("first", model::Presence::kOptional);
  if (list && count_given) {
    context.Error(*seeds, "give either list or count (with first), not both");
    return;
  }
  if (!list && !count_given) {
    context.Error(*seeds, "needs list=\"1 2 3\" or count=\"N\" (with first=\"K\", default 1)");
    return;
  }
  if (list) {
    if (first) context.FieldError(*seeds, "first", std::to_string(*first), "only with count");
    ReadSeedList(*seeds, *list, context, scenario);
    return;
  }
  bool ok = count.has_value() && (!first_given || first.has_value());
  if (count && (*count < 1 || *count > kMaxSeeds)) {
    context.FieldError(*seeds, "count", std::to_string(*count),
                       "must be in [1, " + std::to_string(kMaxSeeds) + "]");
    ok = false;
  }
  if (first && *first < 1) {
    context.FieldError(*seeds, "first", std::to_string(*first), "must be >= 1");
    ok = false;
  }
  if (!ok) return;
  const std::uint64_t start = static_cast<std::uint64_t>(first.value_or(1));
  scenario->seeds.clear();
  for (long long i = 0; i < *count; ++i) {
    scenario->seeds.push_back(start + static_cast<std::uint64_t>(i));
  }
}

void ReadMetrics(model::XmlElement& root, const ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> metrics = root.Child("metrics", model::Presence::kOptional);
  if (!metrics) return;
  bool ok = true;
  MetricSettings& m = scenario->metrics;
  m.fall_tilt_deg = internal::OptionalNumber(*metrics, "fall_tilt_deg", m.fall_tilt_deg, &ok);
  m.tilt_band_deg = internal::OptionalNumber(*metrics, "tilt_band_deg", m.tilt_band_deg, &ok);
  m.drift_band_m = internal::OptionalNumber(*metrics, "drift_band_m", m.drift_band_m, &ok);
  m.window_s = internal::OptionalNumber(*metrics, "window_s", m.window_s, &ok);
  m.slip_threshold = internal::OptionalNumber(*metrics, "slip_threshold", m.slip_threshold, &ok);
  if (!ok) return;
  if (const Status valid = m.Validate(); !valid) context.Error(*metrics, valid.error());
}

// The plant needs the robot's control and IMU periods to be whole numbers of physics steps (an
// IMU faster than the physics is sampled every step); same tolerance as the plant.
void CheckRobotRates(model::XmlElement& root, const ReadContext& context) {
  if (context.model == nullptr || !context.dt_s) return;
  const double dt_s = *context.dt_s;
  auto whole_steps = [dt_s](double rate_hz) {
    const double steps = 1.0 / (rate_hz * dt_s);
    return std::abs(steps - std::round(steps)) < 1e-6 * steps;
  };
  const model::RobotModel& model = *context.model;
  if (!whole_steps(model.control_rate_hz)) {
    context.FieldError(root, "dt_s", Num(dt_s),
                       "the control period of " + context.Robot() +
                           " (control rate_hz = " + Num(model.control_rate_hz) +
                           ") must be a whole number of physics steps");
  }
  if (model.sensors.imu_rate_hz * dt_s < 1 && !whole_steps(model.sensors.imu_rate_hz)) {
    context.FieldError(root, "dt_s", Num(dt_s),
                       "the IMU period of " + context.Robot() +
                           " (imu rate_hz = " + Num(model.sensors.imu_rate_hz) +
                           ") must be a whole number of physics steps, or the IMU at least as "
                           "fast as the physics");
  }
}

ScenarioLoadResult Load(model::XmlDocument doc, const std::string& path,
                        const std::string& base_dir) {
  if (!doc.parsed()) return Failure(doc.errors());
  model::XmlElement root = doc.Root();
  if (root.name() != "scenario") {
    doc.AddError(root.line(), "root element is <" + root.name() + ">, expected <scenario>");
    return Failure(doc.errors());
  }
  const std::optional<long long> schema = root.Integer("schema", model::Presence::kRequired);
  if (schema && *schema != kSchemaVersion) {
    doc.AddError(root.line(), "scenario schema = " + std::to_string(*schema) +
                                  ": unsupported schema version (supported: " +
                                  std::to_string(kSchemaVersion) + ")");
    return Failure(doc.errors());
  }

  Scenario scenario;
  scenario.path = path;
  ReadContext context;
  context.doc = &doc;
  context.base_dir = base_dir;
  if (std::optional<std::string> name = root.String("name", model::Presence::kRequired)) {
    scenario.name = *name;
    if (!internal::IsSafeName(*name)) {
      context.FieldError(root, "name", Quote(*name), std::string(internal::kSafeNameRule));
    }
  }
  ReadRunSettings(root, context, &scenario);
  ReadDescription(root, context, &scenario);
  std::vector<model::FileError> model_errors;
  if (ReadRobot(root, context, &scenario, &model_errors)) context.model = &scenario.model;
  internal::ReadGround(root, context, &scenario.terrain);
  ReadStart(root, context, &scenario);
  internal::ReadTimeline(root, context, &scenario);
  internal::ReadControllers(root, context, &scenario);
  ReadSeeds(root, context, &scenario);
  ReadMetrics(root, context, &scenario);
  CheckRobotRates(root, context);
  internal::ReadDispersions(root, context, &scenario);  // last: it needs the whole scenario
  doc.ReportUnread();

  std::vector<model::FileError> errors = doc.errors();
  errors.insert(errors.end(), model_errors.begin(), model_errors.end());
  if (!errors.empty()) return Failure(std::move(errors));
  return scenario;
}

}  // namespace

ScenarioLoadResult LoadScenarioFile(const std::string& path) {
  return Load(model::XmlDocument::Open(path), path,
              std::filesystem::path(path).parent_path().string());
}

ScenarioLoadResult ParseScenarioText(std::string_view xml_text, const std::string& path,
                                     const std::string& base_dir) {
  return Load(model::XmlDocument::Parse(xml_text, path), path, base_dir);
}

}  // namespace upright::runner
