// Robot model files (models/*.xml, schema in models/README.md) → a validated RobotModel.
// Every problem found is reported as `path:line: message` naming the field, the value and the
// rule broken; unknown elements and attributes are errors.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/model/file_error.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::model {

// The physics step of a scenario that gives no dt_s, and of sim::PlantOptions by default.
inline constexpr double kDefaultPhysicsStep_s = 0.001;

struct ModelLoadOptions {
  // Also check that the control and IMU rates fit the default physics step (models/README.md).
  // A scenario turns this off and checks the robot it names against its own dt_s.
  bool check_default_step = true;
};

// Reads and validates a model file: the model, or every problem found, in file order.
Result<RobotModel, std::vector<FileError>> LoadModelFile(const std::string& path,
                                                         const ModelLoadOptions& options = {});

// Same, from text already in memory; `path` is used only in messages.
Result<RobotModel, std::vector<FileError>> ParseModelText(std::string_view xml_text,
                                                          const std::string& path,
                                                          const ModelLoadOptions& options = {});

// Checks a model built in code against the same rules as the file loader, but for the default
// step's (a plant checks the rates against its own step). Fails with one message per broken rule
// ("chassis mass_kg = -1: must be > 0").
Result<void, std::vector<std::string>> ValidateModel(const RobotModel& model);

// The schema as a Markdown table (element, attribute, unit, default, allowed range, meaning),
// generated from the same table the loader uses; models/README.md embeds it.
std::string ModelSchemaMarkdown();

}  // namespace upright::model
