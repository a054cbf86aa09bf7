// A batch's runs gathered by scenario and controller, with each group's survival count, every
// figure's mean and spread over its seeds, and two controllers' runs paired by seed: what
// summary.md, the comparison and the ranking read.
// Groups keep the batch's order (scenarios, then controllers, as they first appear in the runs).
#pragma once

#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/tables/played_run.hpp"

namespace upright::runner::internal {

// One figure over a controller's runs: the played runs where it is not NaN, in `runs` order.
struct FigureStats {
  int runs = 0;    // runs of the group, played or not
  int values = 0;  // of them, played runs with a value: the others are skipped
  double mean = std::numeric_limits<double>::quiet_NaN();  // NaN without values
  double min = std::numeric_limits<double>::quiet_NaN();
  double max = std::numeric_limits<double>::quiet_NaN();
  // Sample standard deviation (n − 1 denominator); NaN with fewer than 2 values.
  double sd = std::numeric_limits<double>::quiet_NaN();
};

// `field` over the played runs (WasPlayed) of `runs`, summed in `runs` order.
FigureStats StatsOver(const std::vector<const RunResult*>& runs, double RunMetrics::*field);

struct ControllerGroup {
  std::string name;
  bool baseline = false;               // any of its runs is marked as the scenario's baseline
  std::vector<const RunResult*> runs;  // in batch (seed) order
  int played = 0;                      // runs that were played (WasPlayed)
  int survived = 0;                    // runs whose status is ok

  int size() const { return static_cast<int>(runs.size()); }
  // survived / runs; NaN for a group without runs.
  double SurvivalRate() const;
};

struct ScenarioGroup {
  std::string name;
  const ScenarioInfo* info = nullptr;        // the batch's entry for it; null when it has none
  std::vector<ControllerGroup> controllers;  // in order of first appearance
  std::vector<std::uint64_t> seeds;          // distinct seeds, in order of first appearance

  // The baseline controller's group, or null when no run is marked baseline.
  const ControllerGroup* Baseline() const;
};

// Two controllers' runs of one scenario paired by seed: the seeds both ran, in the scenario's seed
// order, with each side's run (never null).
struct SeedPair {
  std::uint64_t seed = 0;
  const RunResult* baseline = nullptr;
  const RunResult* other = nullptr;
};

// The runs of `baseline` and `other` (groups of `scenario`) that share a seed.
std::vector<SeedPair> PairBySeed(const ScenarioGroup& scenario, const ControllerGroup& baseline,
                                 const ControllerGroup& other);

// The batch's runs by scenario and controller. Pointers refer into `batch`, which must outlive
// the result.
std::vector<ScenarioGroup> GroupBatch(const BatchResult& batch);

}  // namespace upright::runner::internal
