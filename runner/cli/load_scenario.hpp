// One scenario file for a command that runs it: a path in, the validated scenario out, or its
// problems on stderr (each as path:line: message, then "<path>: invalid; nothing was run").
#pragma once

#include <string>

#include "upright/runner/scenario.hpp"

namespace upright::cli {

// Loads and validates `path` into *scenario. False, with the problems printed, when the file is
// invalid; the command then exits with kExitBadInput.
bool LoadScenarioOrSayWhy(const std::string& path, runner::Scenario* scenario);

}  // namespace upright::cli
