#include <string>

#include "model_schema.hpp"
#include "upright/base/number_text.hpp"
#include "upright/model/model_file.hpp"

namespace upright::model {
namespace {

std::string OccursText(const internal::ElementRule& rule) {
  switch (rule.occurs) {
    case internal::Occurs::kRequired:
      return "required";
    case internal::Occurs::kOptional:
      return "optional";
    case internal::Occurs::kOneOf: {
      std::string members;
      for (const internal::ElementRule& other : internal::ElementRules()) {
        if (other.occurs != internal::Occurs::kOneOf || other.group != rule.group) continue;
        members += (members.empty() ? "`" : " or `") + std::string(other.path) + "`";
      }
      return "exactly one of " + members;
    }
  }
  return "";
}

std::string DefaultText(const internal::FieldRule& rule) {
  if (!rule.default_text.empty()) return std::string(rule.default_text);
  if (rule.required) return "required";
  return WholeOrShortestText(rule.default_value);
}

}  // namespace

std::string ModelSchemaMarkdown() {
  std::string text = "Elements, each at most once, below the root `<" +
                     std::string(internal::kModelRootElement) + " name=\"...\" schema=\"" +
                     std::to_string(internal::kModelSchemaVersion) + "\">`:\n\n";
  text += "| element | occurs | meaning |\n| --- | --- | --- |\n";
  for (const internal::ElementRule& rule : internal::ElementRules()) {
    text += "| `" + std::string(rule.path) + "` | " + OccursText(rule) + " | " +
            std::string(rule.meaning) + " |\n";
  }
  text +=
      "\nAttributes (a field of an absent optional element takes its default; "
      "\"any\" means any finite number):\n\n";
  text += "| element | attribute | unit | default | allowed | meaning |\n";
  text += "| --- | --- | --- | --- | --- | --- |\n";
  for (const internal::FieldRule& rule : internal::FieldRules()) {
    text += "| `" + std::string(rule.element) + "` | `" + std::string(rule.attribute) + "` | " +
            std::string(rule.unit) + " | " + DefaultText(rule) + " | " + internal::RangeText(rule) +
            " | " + std::string(rule.meaning) + " |\n";
  }
  text +=
      "\nRules across fields, checked once every field keeps its own rule (a message carries the "
      "line of the element named):\n\n";
  text += "| element | rule |\n| --- | --- |\n";
  for (const internal::CrossRule& rule : internal::CrossRules()) {
    text += "| `" + std::string(rule.element) + "` | " + std::string(rule.rule) + " |\n";
  }
  text += "\nRules against the default physics step of " +
          WholeOrShortestText(kDefaultPhysicsStep_s * 1000) +
          " ms, checked last; a scenario with its own `dt_s` checks the robot against that step "
          "instead:\n\n";
  text += "| element | rule |\n| --- | --- |\n";
  for (const internal::StepRule& rule : internal::StepRules()) {
    text += "| `" + std::string(rule.element) + "` | " + std::string(rule.rule) + " |\n";
  }
  return text;
}

}  // namespace upright::model
