#include "load_scenario.hpp"

#include <iostream>
#include <utility>

#include "upright/runner/scenario_file.hpp"

namespace upright::cli {

bool LoadScenarioOrSayWhy(const std::string& path, runner::Scenario* scenario) {
  runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
  if (!loaded) {
    for (const auto& e : loaded.error()) std::cerr << e.ToString() << "\n";
    std::cerr << path << ": invalid; nothing was run\n";
    return false;
  }
  *scenario = std::move(*loaded);
  return true;
}

}  // namespace upright::cli
