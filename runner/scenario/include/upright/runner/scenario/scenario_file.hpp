// Scenario files (scenarios/*.xml, schema in scenarios/README.md) → a validated Scenario, with
// its robot model loaded. Every problem is reported as `path:line: message`; unknown elements and
// attributes are errors, as in robot model files. Controller module files are checked to exist,
// never loaded here.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/model/file_error.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

// The scenario, or every problem found in one pass: the scenario file's in line order, then the
// robot model file's (which carry the model's path); never an empty list.
using ScenarioLoadResult = Result<Scenario, std::vector<model::FileError>>;

// Reads and validates a scenario file and the robot model it names (relative model and module
// paths are taken from the scenario file's folder).
ScenarioLoadResult LoadScenarioFile(const std::string& path);

// Same, from text in memory; `path` is used in messages and kept as Scenario::path, and relative
// model and module paths are resolved against `base_dir` ("" : the working folder).
ScenarioLoadResult ParseScenarioText(std::string_view xml_text, const std::string& path,
                                     const std::string& base_dir);

}  // namespace upright::runner
