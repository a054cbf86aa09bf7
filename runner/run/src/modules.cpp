#include "upright/runner/run/modules.hpp"

#include <memory>
#include <string>
#include <utility>

#include "upright/model/check.hpp"

namespace upright::runner {
namespace {

LoadedModule Load(const ControllerEntry& entry, const std::vector<std::string>& dirs) {
  std::string path = entry.module;
  if (entry.builtin) {
    Result<std::string> found = host::FindBuiltinModule(entry.module, dirs);
    if (!found) return Failure(std::move(found.error()));
    path = std::move(*found);
  }
  return host::Module::Load(path);
}

}  // namespace

ModuleSet::ModuleSet(std::span<const Scenario> scenarios,
                     const std::vector<std::string>& module_dirs) {
  const std::vector<std::string> dirs =
      module_dirs.empty() ? host::DefaultModuleDirs() : module_dirs;
  for (const Scenario& scenario : scenarios) {
    for (const ControllerEntry& entry : scenario.controllers) {
      const auto key = std::make_pair(entry.builtin, entry.module);
      if (!loaded_.count(key)) loaded_.emplace(key, Load(entry, dirs));
    }
  }
}

const LoadedModule& ModuleSet::Get(const ControllerEntry& entry) const {
  const auto found = loaded_.find({entry.builtin, entry.module});
  UPRIGHT_CHECK(found != loaded_.end(), "module '%s' was not loaded", entry.module.c_str());
  return found->second;
}

}  // namespace upright::runner
