#include "load_scenario.hpp"

#include <utility>

#include "log.hpp"
#include "upright/runner/scenario_file.hpp"

namespace upright::cli {

bool LoadScenarioOrSayWhy(const std::string& path, runner::Scenario* scenario) {
  runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
  if (!loaded.ok()) {
    for (const auto& e : loaded.errors) Log().Error(e.ToString());
    Log().Error(path + ": invalid; nothing was run");
    return false;
  }
  *scenario = std::move(loaded.scenario);
  return true;
}

}  // namespace upright::cli
