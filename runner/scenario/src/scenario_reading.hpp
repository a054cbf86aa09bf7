// Private to the scenario reader: what the parts of a scenario file (ground, timeline,
// controllers) share while they are read — the document that collects problems, the scenario's
// folder, duration and robot — and the message helpers that keep every error in one style.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "upright/model/robot_model.hpp"
#include "upright/model/xml_reader.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner::internal {

struct ReadContext {
  model::XmlDocument* doc = nullptr;
  std::string base_dir;               // relative file paths are taken from here
  std::optional<double> duration_s;   // set once the scenario's duration_s is valid
  std::optional<double> dt_s;         // set once the scenario's dt_s is valid
  const model::RobotModel* model = nullptr;  // set once the robot model has loaded without errors
  std::string model_file;             // the robot file attribute as written, for messages

  // "label: message" at the element's line.
  void Error(const model::XmlElement& element, const std::string& message) const;
  // "label attribute = value: rule" at the element's line.
  void FieldError(const model::XmlElement& element, std::string_view attribute,
                  const std::string& value, const std::string& rule) const;
  // "robot 'name' (file)", for messages about the robot the scenario names.
  std::string Robot() const;
};

// Reading helpers that note a bad value in *ok (the reader has already reported it) and return
// `fallback` (or 0) in its place, so reading can go on.
double RequiredNumber(model::XmlElement& element, std::string_view attribute, bool* ok);
double OptionalNumber(model::XmlElement& element, std::string_view attribute, double fallback,
                      bool* ok);
// "true" or "false".
bool OptionalBool(model::XmlElement& element, std::string_view attribute, bool fallback, bool* ok);

// A number as written in messages: whole numbers in plain digits, others in the shortest form
// that reads back exactly.
std::string Num(double value);
// A computed number for messages, to six significant digits.
std::string Approx(double value);
// A string value as written in messages: in single quotes.
std::string Quote(std::string_view text);

// `file` taken from `base_dir` when it is relative (no normalisation, so the path means exactly
// what the operating system will make of it).
std::string ResolvePath(const std::string& base_dir, const std::string& file);

// [A-Za-z0-9._-]+ and neither "." nor "..": safe as a folder or file name.
bool IsSafeName(std::string_view name);
// The rule IsSafeName checks, for messages.
inline constexpr std::string_view kSafeNameRule =
    "must be letters, digits, '.', '_' or '-' (not '.' or '..'), since it names files";

// The time an event starts: the required at_s, in [0, duration_s). nullopt when absent or bad.
std::optional<double> ReadEventStart(model::XmlElement& event, const ReadContext& context);

// Element readers; each reads every attribute and child it knows, even when it reports an error,
// so that a single pass finds every problem.
void ReadGround(model::XmlElement root, ReadContext& context, sim::Terrain* terrain);
void ReadTimeline(model::XmlElement root, ReadContext& context, Scenario* scenario);
void ReadControllers(model::XmlElement root, ReadContext& context, Scenario* scenario);

}  // namespace upright::runner::internal
