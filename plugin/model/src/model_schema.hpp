// The model file schema as data: elements, fields (attribute → RobotModel member, default, range)
// and rules across fields. One set of tables drives loading (model_file.cpp), validation of models
// built in code (model_validate.cpp) and the documentation (model_schema_markdown.cpp).
#pragma once

#include <span>
#include <string>
#include <string_view>

#include "upright/base/result.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::model::internal {

// The root element of a model file and the schema version it states. Schema 2 renamed the root
// (formerly <robot>) and the chassis inertia elements (formerly <inertia> and <box>).
inline constexpr std::string_view kModelRootElement = "balancer";
inline constexpr long long kModelSchemaVersion = 2;

// A latency beyond this many control periods is rejected: it keeps the plant's delay line short,
// and a value that large is far more likely a unit slip (ms written as s) than a real sensor chain.
inline constexpr double kMaxLatencyControlPeriods = 50;

// A model while it is being read: the RobotModel plus the fields a file may give that only feed
// other fields (the chassis's uniform block, from which the chassis inertia follows).
struct ModelDraft {
  RobotModel model;
  double block_length_m = 0;
  double block_width_m = 0;
  double block_height_m = 0;
};

enum class Bound { kNone, kOpen, kClosed };

struct Limit {
  Bound bound = Bound::kNone;
  double value = 0;
};

enum class Occurs {
  kRequired,
  kOptional,
  kOneOf,  // exactly one element of the same one-of group under the same parent
};

struct ElementRule {
  std::string_view path;  // below the root, "chassis/outline"
  Occurs occurs = Occurs::kRequired;
  std::string_view group = {};              // the one-of group, for Occurs::kOneOf
  bool* (*present)(RobotModel&) = nullptr;  // set true when the element is given, if any
  std::string_view meaning = {};
};

struct FieldRule {
  std::string_view element;    // path below the root
  std::string_view attribute;  // unit in the name
  std::string_view unit;       // for the documentation
  double* (*field)(ModelDraft&);
  bool required = false;  // must be given when its element is
  double default_value = 0;
  // A default that depends on other fields; also fills a required field whose element is absent
  // (chassis inertia from the uniform block).
  double (*derive)(const ModelDraft&) = nullptr;
  std::string_view default_text = {};  // how the documentation states a derived default
  Limit min = {};
  Limit max = {};
  bool whole = false;
  bool file_only = false;  // not a RobotModel member; ValidateModel skips it
  std::string_view meaning = {};
};

// A rule relating several fields. `check` fails with the message when the rule is broken; it is
// run only once every field keeps its own rule.
struct CrossRule {
  std::string_view element;  // whose line a file message carries
  std::string_view rule;     // for the documentation
  Status (*check)(const RobotModel&);
};

// A rule between the model and the default physics step (kDefaultPhysicsStep_s), which every
// scenario without its own dt_s runs at. Model files are checked against it; a scenario checks the
// robot it names against its own step instead. `check` fails with the message when the rule is
// broken; it is run only once the field and cross rules hold.
struct StepRule {
  std::string_view element;  // whose line a file message carries
  std::string_view rule;     // for the documentation
  Status (*check)(const RobotModel&);
};

std::span<const ElementRule> ElementRules();
std::span<const FieldRule> FieldRules();
std::span<const CrossRule> CrossRules();
std::span<const StepRule> StepRules();

// The rule of an element for `path`, or nullptr.
const ElementRule* FindElementRule(std::string_view path);

// Fails with "chassis mass_kg = -3: must be > 0" when `value` breaks the field's rule.
Status CheckField(const FieldRule& rule, double value);

// The allowed values as the documentation shows them: "> 0", "(0, 1]", "whole, >= 1", "any".
std::string RangeText(const FieldRule& rule);

}  // namespace upright::model::internal
