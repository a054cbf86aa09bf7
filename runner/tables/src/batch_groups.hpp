// A batch's runs gathered by scenario and controller, with each group's survival count and the
// mean of every figure over its seeds: what summary.md, the comparison and the ranking read.
// Groups keep the batch's order (scenarios, then controllers, as they first appear in the runs).
#pragma once

#include <string>
#include <vector>

#include "upright/runner/run_result.hpp"

namespace upright::runner::internal {

// True for a run that was played (it may have fallen or faulted); false for one not run or whose
// set-up failed, whose figures are only defaults. Means are taken over played runs only.
bool WasPlayed(const RunResult& run);

// The mean of `field` over the played runs where it is not NaN, summed in `runs` order; NaN
// when there is none. *count (when given) receives how many values went into it.
double MeanOver(const std::vector<const RunResult*>& runs, double RunMetrics::*field,
                int* count = nullptr);

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

// The batch's runs by scenario and controller. Pointers refer into `batch`, which must outlive
// the result.
std::vector<ScenarioGroup> GroupBatch(const BatchResult& batch);

}  // namespace upright::runner::internal
