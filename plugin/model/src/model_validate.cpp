#include <string>
#include <utility>
#include <vector>

#include "model_schema.hpp"
#include "upright/model/model_file.hpp"

namespace upright::model {

Result<void, std::vector<std::string>> ValidateModel(const RobotModel& model) {
  internal::ModelDraft draft{.model = model};
  std::vector<std::string> problems;
  if (model.name.empty()) {
    problems.push_back(std::string(internal::kModelRootElement) + " name = '': must not be empty");
  }
  for (const internal::FieldRule& rule : internal::FieldRules()) {
    if (rule.file_only) continue;
    const internal::ElementRule* element = internal::FindElementRule(rule.element);
    if (element != nullptr && element->present != nullptr && !*element->present(draft.model)) {
      continue;
    }
    if (Status kept = internal::CheckField(rule, *rule.field(draft)); !kept) {
      problems.push_back(kept.error());
    }
  }
  if (problems.empty()) {
    for (const internal::CrossRule& rule : internal::CrossRules()) {
      if (Status kept = rule.check(model); !kept) problems.push_back(kept.error());
    }
  }
  if (!problems.empty()) return Failure(std::move(problems));
  return {};
}

}  // namespace upright::model
