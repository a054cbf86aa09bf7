// Robot model files (models/*.xml, schema in models/README.md) → a validated RobotModel.
// Every problem found is reported as `path:line: message` naming the field, the value and the
// rule broken; unknown elements and attributes are errors.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "upright/model/file_error.hpp"
#include "upright/model/robot_model.hpp"

namespace upright {

struct ModelLoadResult {
  RobotModel model;               // meaningful only when ok()
  std::vector<FileError> errors;  // every problem found, in file order
  bool ok() const { return errors.empty(); }
};

// Reads and validates a model file.
ModelLoadResult LoadModelFile(const std::string& path);

// Same, from text already in memory; `path` is used only in messages.
ModelLoadResult ParseModelText(std::string_view xml_text, const std::string& path);

// Checks a model built in code against the same rules as the file loader. Returns one message per
// broken rule ("chassis mass_kg = -1: must be > 0"); empty when valid.
std::vector<std::string> ValidateModel(const RobotModel& model);

// The schema as a Markdown table (element, attribute, unit, default, allowed range, meaning),
// generated from the same table the loader uses; models/README.md embeds it.
std::string ModelSchemaMarkdown();

}  // namespace upright
