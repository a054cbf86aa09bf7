#include "held_out_batch.hpp"

#include <algorithm>

#include "upright/runner/run/run_one.hpp"

namespace upright::runner::internal {

BatchResult HeldOutBatch(const TuneResult& result, bool tuned) {
  const TunePlan& plan = result.plan;
  BatchResult batch;
  batch.tool_version = result.tool_version;
  batch.jobs = result.jobs;
  batch.trace_rate_hz = RunOptions{}.trace_rate_hz;
  // The controllers replayed on the held-out seeds, by their index in the plan.
  std::vector<std::size_t> replayed;
  for (std::size_t c = 0; c < result.controllers.size(); ++c) {
    if (result.controllers[c].held_out.size() == 2) replayed.push_back(c);
  }
  if (replayed.empty() || plan.holdout_runs == 0) return batch;
  std::size_t offset = 0;  // the scenario's first run in each held-out evaluation
  for (std::size_t s = 0; s < result.scenarios.size(); ++s) {
    std::vector<std::size_t> order = replayed;
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
      return plan.controllers[a].entry[s] < plan.controllers[b].entry[s];
    });
    ScenarioInfo info = result.scenarios[s];
    info.seeds = plan.holdout_seeds[s];
    info.controllers.clear();
    for (const std::size_t c : order) info.controllers.push_back(plan.controllers[c].name);
    if (std::find(info.controllers.begin(), info.controllers.end(), info.baseline) ==
        info.controllers.end()) {
      info.baseline = info.controllers.front();
    }
    for (const std::size_t c : order) {
      const std::vector<RunResult>& runs = result.controllers[c].held_out[tuned ? 1 : 0].runs;
      for (std::size_t k = 0; k < info.seeds.size() && offset + k < runs.size(); ++k) {
        RunResult run = runs[offset + k];
        run.baseline = run.controller == info.baseline;
        batch.wall_s += run.wall_s;
        batch.runs.push_back(std::move(run));
      }
    }
    offset += info.seeds.size();
    batch.scenarios.push_back(std::move(info));
  }
  return batch;
}

}  // namespace upright::runner::internal
