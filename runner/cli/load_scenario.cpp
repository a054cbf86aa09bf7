#include "load_scenario.hpp"

#include <utility>

#include "upright/runner/scenario/scenario_file.hpp"

namespace upright::cli {

Result<runner::Scenario> LoadScenarioForRun(const std::string& path) {
  runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
  if (loaded) return std::move(*loaded);
  std::string lines;
  for (const auto& e : loaded.error()) lines += e.ToString() + "\n";
  return Failure(lines + path + ": invalid; nothing was run");
}

}  // namespace upright::cli
