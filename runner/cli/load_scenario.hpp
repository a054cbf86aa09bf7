// One scenario file for a command that runs it: a path in, the validated scenario out, or what to
// tell the user (each problem as path:line: message, then "<path>: invalid; nothing was run").
#pragma once

#include <string>

#include "upright/base/result.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::cli {

// Loads and validates `path`. When the file is invalid, the lines for stderr (without the last
// line break); the command then exits with kExitBadInput.
Result<runner::Scenario> LoadScenarioForRun(const std::string& path);

}  // namespace upright::cli
