#include "upright/model/model_field.hpp"

#include <cmath>

#include "model_schema.hpp"

namespace upright::model {
namespace {

// The schema row for element.attribute that a RobotModel holds, or why there is none.
Result<const internal::FieldRule*> FindField(std::string_view element, std::string_view attribute) {
  for (const internal::FieldRule& rule : internal::FieldRules()) {
    if (rule.element != element || rule.attribute != attribute) continue;
    if (rule.file_only) {
      return Failure(std::string(element) + "." + std::string(attribute) +
                     " only shapes other fields when a file is read; vary those fields instead");
    }
    return &rule;
  }
  std::string known;
  for (const internal::FieldRule& rule : internal::FieldRules()) {
    if (rule.file_only) continue;
    known +=
        (known.empty() ? "" : ", ") + std::string(rule.element) + "." + std::string(rule.attribute);
  }
  return Failure("no robot model field " + std::string(element) + "." + std::string(attribute) +
                 " (fields: " + known + ")");
}

// A failure when the field's element is optional and absent from this model.
Status ElementPresent(const internal::FieldRule& rule, RobotModel& model) {
  const internal::ElementRule* element = internal::FindElementRule(rule.element);
  if (element == nullptr || element->present == nullptr || *element->present(model)) return {};
  return Failure("robot '" + model.name + "' has no <" + std::string(rule.element) +
                 "> element, so " + std::string(rule.element) + "." + std::string(rule.attribute) +
                 " cannot be set");
}

}  // namespace

Result<double> GetModelField(const RobotModel& model, std::string_view element,
                             std::string_view attribute) {
  const Result<const internal::FieldRule*> rule = FindField(element, attribute);
  if (!rule) return Failure(rule.error());
  internal::ModelDraft draft{.model = model};
  if (Status present = ElementPresent(**rule, draft.model); !present) {
    return Failure(present.error());
  }
  return *(*rule)->field(draft);
}

Status SetModelField(RobotModel* model, std::string_view element, std::string_view attribute,
                     double value) {
  const Result<const internal::FieldRule*> rule = FindField(element, attribute);
  if (!rule) return Failure(rule.error());
  internal::ModelDraft draft{.model = *model};
  if (Status present = ElementPresent(**rule, draft.model); !present) return present;
  if (!std::isfinite(value)) {
    return Failure(std::string(element) + " " + std::string(attribute) +
                   ": must be a finite number");
  }
  if (Status kept = internal::CheckField(**rule, value); !kept) return kept;
  *(*rule)->field(draft) = value;
  *model = draft.model;
  return {};
}

}  // namespace upright::model
