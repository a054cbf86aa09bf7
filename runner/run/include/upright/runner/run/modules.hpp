// Controller modules for a set of runs: the scenarios' controller entries in, each distinct module
// file found and loaded once before any run starts, out as one shared handle per module (or why it
// would not load) for every run that names it.
#pragma once

#include <map>
#include <memory>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/host/module.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

// One controller's module as loaded (never null), or why it could not be.
using LoadedModule = Result<std::shared_ptr<host::Module>>;

// Every module the controllers of some scenarios name, each loaded once. Read-only once built, so
// worker threads may share it.
class ModuleSet {
 public:
  // Loads the module of every controller of `scenarios` (a built-in one looked up in
  // `module_dirs`; empty: host::DefaultModuleDirs()). A module that will not load is kept with
  // its error rather than refused.
  ModuleSet(std::span<const Scenario> scenarios, const std::vector<std::string>& module_dirs);

  // The module of `entry`, a controller of one of the scenarios given (UPRIGHT_CHECK otherwise).
  const LoadedModule& Get(const ControllerEntry& entry) const;

 private:
  std::map<std::pair<bool, std::string>, LoadedModule> loaded_;  // by (builtin, module)
};

}  // namespace upright::runner
