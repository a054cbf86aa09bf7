// <tune>: per controller its knobs, and the objective with its bounds; every problem collected
// with its line, then all of them returned at once.
#include "upright/runner/tune/tune_file.hpp"

#include <array>
#include <optional>
#include <set>
#include <string_view>

#include "upright/base/number_text.hpp"
#include "upright/model/xml_reader.hpp"

namespace upright::runner {
namespace {

constexpr long long kSchemaVersion = 1;

std::string Joined(const std::vector<model::FileError>& errors) {
  std::string text;
  for (const model::FileError& e : errors) {
    if (!text.empty()) text += '\n';
    text += e.ToString();
  }
  return text;
}

void ReadKnobs(model::XmlElement& controller, model::XmlDocument& doc, const std::string& name,
               TuneSpec* spec) {
  std::vector<Knob> knobs;
  std::set<std::string> seen;
  for (model::XmlElement element : controller.Children("knob")) {
    Knob knob;
    knob.line = element.line();
    const std::optional<std::string> setting =
        element.String("setting", model::Presence::kRequired);
    const std::optional<double> lo = element.Double("lo", model::Presence::kRequired);
    const std::optional<double> hi = element.Double("hi", model::Presence::kRequired);
    constexpr std::array<std::string_view, 2> kScales = {"log", "linear"};
    const std::optional<std::size_t> scale =
        element.Choice("scale", kScales, model::Presence::kOptional);
    if (!setting || !lo || !hi || (element.Has("scale") && !scale)) continue;
    knob.setting = *setting;
    knob.lo = *lo;
    knob.hi = *hi;
    knob.scale = scale && *scale == 1 ? KnobScale::kLinear : KnobScale::kLog;
    if (Status valid = knob.Validate(); !valid) {
      doc.AddError(knob.line, valid.error());
      continue;
    }
    if (!seen.insert(knob.setting).second) {
      doc.AddError(knob.line, "knob " + knob.setting + ": given twice for controller " + name);
      continue;
    }
    knobs.push_back(knob);
  }
  if (knobs.empty() && seen.empty()) {
    doc.AddError(controller.line(), "controller " + name + ": no <knob> (give at least one)");
  }
  spec->knobs[name] = std::move(knobs);
}

void ReadObjective(model::XmlElement& element, model::XmlDocument& doc, Objective* objective) {
  Objective read;
  for (model::XmlElement term : element.Children("term")) {
    const std::optional<std::string> metric = term.String("metric", model::Presence::kRequired);
    const std::optional<double> weight = term.Double("weight", model::Presence::kOptional);
    if (!metric || (term.Has("weight") && !weight)) continue;
    read.terms.push_back({*metric, weight.value_or(1), term.line()});
  }
  for (model::XmlElement bound : element.Children("bound")) {
    const std::optional<std::string> metric = bound.String("metric", model::Presence::kRequired);
    const bool has_max = bound.Has("max"), has_min = bound.Has("min");
    const std::optional<double> max = bound.Double("max", model::Presence::kOptional);
    const std::optional<double> min = bound.Double("min", model::Presence::kOptional);
    if (has_max == has_min) {
      doc.AddError(bound.line(), std::string("bound: give exactly one of max or min (") +
                                     (has_max ? "both" : "neither") + " given)");
      continue;
    }
    if (!metric || (has_max && !max) || (has_min && !min)) continue;
    read.bounds.push_back({*metric,
                           has_max ? MetricBound::Kind::kAtMost : MetricBound::Kind::kAtLeast,
                           has_max ? *max : *min, bound.line()});
  }
  if (read.terms.empty()) {
    // Bounds alone: the default terms.
    read.terms = DefaultObjective().terms;
  }
  // Each rule on the line that breaks it.
  for (const ObjectiveTerm& term : read.terms) {
    Objective one;
    one.terms = {term};
    if (Status valid = one.Validate(); !valid) doc.AddError(term.line, valid.error());
  }
  for (const MetricBound& bound : read.bounds) {
    Objective one;
    one.terms = DefaultObjective().terms;
    one.bounds = {bound};
    if (Status valid = one.Validate(); !valid) doc.AddError(bound.line, valid.error());
  }
  *objective = std::move(read);
}

Result<TuneSpec> Load(model::XmlDocument doc, const std::string& path) {
  if (!doc.parsed()) return Failure(Joined(doc.errors()));
  model::XmlElement root = doc.Root();
  if (root.name() != "tune") {
    doc.AddError(root.line(), "root element is <" + root.name() + ">, expected <tune>");
    return Failure(Joined(doc.errors()));
  }
  const std::optional<long long> schema = root.Integer("schema", model::Presence::kRequired);
  if (schema && *schema != kSchemaVersion) {
    doc.AddError(root.line(), "tune schema = " + std::to_string(*schema) +
                                  ": unsupported schema version (supported: " +
                                  std::to_string(kSchemaVersion) + ")");
    return Failure(Joined(doc.errors()));
  }
  TuneSpec spec;
  spec.path = path;
  for (model::XmlElement controller : root.Children("controller")) {
    const std::optional<std::string> name = controller.String("name", model::Presence::kRequired);
    if (!name) continue;
    if (const auto [first, inserted] = spec.controller_lines.emplace(*name, controller.line());
        !inserted) {
      doc.AddError(controller.line(), "controller " + *name + ": given twice (first at line " +
                                          std::to_string(first->second) + ")");
      continue;
    }
    ReadKnobs(controller, doc, *name, &spec);
  }
  if (std::optional<model::XmlElement> objective =
          root.Child("objective", model::Presence::kOptional)) {
    ReadObjective(*objective, doc, &spec.objective);
  }
  doc.ReportUnread();
  if (doc.HasErrors()) return Failure(Joined(doc.errors()));
  return spec;
}

}  // namespace

Result<TuneSpec> ReadTuneFile(const std::string& path) {
  return Load(model::XmlDocument::Open(path), path);
}

Result<TuneSpec> ParseTuneText(const std::string& text, const std::string& path) {
  return Load(model::XmlDocument::Parse(text, path), path);
}

}  // namespace upright::runner
