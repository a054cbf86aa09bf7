#include "upright/model/model_field.hpp"

#include <cmath>

#include "model_schema.hpp"

namespace upright {
namespace {

// The schema row for element.attribute that a RobotModel holds, or nullptr and *error.
const internal::FieldRule* FindField(std::string_view element, std::string_view attribute,
                                     std::string* error) {
  for (const internal::FieldRule& rule : internal::FieldRules()) {
    if (rule.element != element || rule.attribute != attribute) continue;
    if (rule.file_only) {
      *error = std::string(element) + "." + std::string(attribute) +
               " only shapes other fields when a file is read; vary those fields instead";
      return nullptr;
    }
    return &rule;
  }
  std::string known;
  for (const internal::FieldRule& rule : internal::FieldRules()) {
    if (rule.file_only) continue;
    known +=
        (known.empty() ? "" : ", ") + std::string(rule.element) + "." + std::string(rule.attribute);
  }
  *error = "no robot model field " + std::string(element) + "." + std::string(attribute) +
           " (fields: " + known + ")";
  return nullptr;
}

// False and *error when the field's element is optional and absent from this model.
bool ElementPresent(const internal::FieldRule& rule, RobotModel& model, std::string* error) {
  const internal::ElementRule* element = internal::FindElementRule(rule.element);
  if (element == nullptr || element->present == nullptr || *element->present(model)) return true;
  *error = "robot '" + model.name + "' has no <" + std::string(rule.element) + "> element, so " +
           std::string(rule.element) + "." + std::string(rule.attribute) + " cannot be set";
  return false;
}

}  // namespace

bool GetModelField(const RobotModel& model, std::string_view element, std::string_view attribute,
                   double* value, std::string* error) {
  const internal::FieldRule* rule = FindField(element, attribute, error);
  if (rule == nullptr) return false;
  internal::ModelDraft draft{.model = model};
  if (!ElementPresent(*rule, draft.model, error)) return false;
  *value = *rule->field(draft);
  return true;
}

bool SetModelField(RobotModel* model, std::string_view element, std::string_view attribute,
                   double value, std::string* error) {
  const internal::FieldRule* rule = FindField(element, attribute, error);
  if (rule == nullptr) return false;
  internal::ModelDraft draft{.model = *model};
  if (!ElementPresent(*rule, draft.model, error)) return false;
  if (!std::isfinite(value)) {
    *error = std::string(element) + " " + std::string(attribute) + ": must be a finite number";
    return false;
  }
  if (auto problem = internal::CheckField(*rule, value)) {
    *error = *problem;
    return false;
  }
  *rule->field(draft) = value;
  *model = draft.model;
  return true;
}

}  // namespace upright
