#include "batch_groups.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace upright::runner::internal {

FigureStats StatsOver(const std::vector<const RunResult*>& runs, double RunMetrics::*field) {
  FigureStats stats;
  stats.runs = static_cast<int>(runs.size());
  double sum = 0;
  for (const RunResult* run : runs) {
    if (!WasPlayed(*run)) continue;
    const double value = run->metrics.*field;
    if (std::isnan(value)) continue;
    sum += value;
    if (stats.values == 0 || value < stats.min) stats.min = value;
    if (stats.values == 0 || value > stats.max) stats.max = value;
    ++stats.values;
  }
  if (stats.values == 0) return stats;
  stats.mean = sum / stats.values;
  if (stats.values < 2) return stats;
  double squares = 0;
  for (const RunResult* run : runs) {
    const double value = run->metrics.*field;
    if (!WasPlayed(*run) || std::isnan(value)) continue;
    squares += (value - stats.mean) * (value - stats.mean);
  }
  stats.sd = std::sqrt(squares / (stats.values - 1));
  return stats;
}

double ControllerGroup::SurvivalRate() const {
  if (runs.empty()) return std::numeric_limits<double>::quiet_NaN();
  return static_cast<double>(survived) / static_cast<double>(runs.size());
}

const ControllerGroup* ScenarioGroup::Baseline() const {
  for (const ControllerGroup& controller : controllers) {
    if (controller.baseline) return &controller;
  }
  return nullptr;
}

std::vector<SeedPair> PairBySeed(const ScenarioGroup& scenario, const ControllerGroup& baseline,
                                 const ControllerGroup& other) {
  const auto run_of = [](const ControllerGroup& group, std::uint64_t seed) -> const RunResult* {
    for (const RunResult* run : group.runs) {
      if (run->seed == seed) return run;
    }
    return nullptr;
  };
  std::vector<SeedPair> pairs;
  for (const std::uint64_t seed : scenario.seeds) {
    const RunResult* b = run_of(baseline, seed);
    const RunResult* o = run_of(other, seed);
    if (b != nullptr && o != nullptr) pairs.push_back({seed, b, o});
  }
  return pairs;
}

std::vector<ScenarioGroup> GroupBatch(const BatchResult& batch) {
  std::vector<ScenarioGroup> groups;
  for (const RunResult& run : batch.runs) {
    auto scenario = std::find_if(groups.begin(), groups.end(),
                                 [&](const ScenarioGroup& g) { return g.name == run.scenario; });
    if (scenario == groups.end()) {
      ScenarioGroup group;
      group.name = run.scenario;
      for (const ScenarioInfo& info : batch.scenarios) {
        if (info.name == run.scenario) {
          group.info = &info;
          break;
        }
      }
      groups.push_back(std::move(group));
      scenario = groups.end() - 1;
    }
    if (std::find(scenario->seeds.begin(), scenario->seeds.end(), run.seed) ==
        scenario->seeds.end()) {
      scenario->seeds.push_back(run.seed);
    }
    auto controller =
        std::find_if(scenario->controllers.begin(), scenario->controllers.end(),
                     [&](const ControllerGroup& g) { return g.name == run.controller; });
    if (controller == scenario->controllers.end()) {
      ControllerGroup group;
      group.name = run.controller;
      scenario->controllers.push_back(std::move(group));
      controller = scenario->controllers.end() - 1;
    }
    controller->baseline = controller->baseline || run.baseline;
    controller->runs.push_back(&run);
    if (WasPlayed(run)) ++controller->played;
    if (run.metrics.status == RunStatus::kOk) ++controller->survived;
  }
  return groups;
}

}  // namespace upright::runner::internal
