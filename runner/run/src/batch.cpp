#include "upright/runner/run/batch.hpp"

#include <algorithm>
#include <chrono>
#include <sstream>

#include "upright/runner/common/sha256.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/parallel_for.hpp"

namespace upright::runner {
namespace {

struct RunSlot {
  std::size_t scenario = 0;
  std::size_t controller = 0;
  std::uint64_t seed = 0;
};

}  // namespace

Status BatchOptions::Validate() const {
  std::ostringstream why;
  if (jobs < 0) {
    why << "BatchOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else if (seed_count < 0) {
    why << "BatchOptions::seed_count = " << seed_count << ", must be >= 0 (0: the files' seeds)";
  } else {
    return run.Validate();
  }
  return Failure(why.str());
}

std::vector<std::uint64_t> RunSeeds(const Scenario& scenario, int seed_count) {
  if (seed_count <= 0) return scenario.seeds;
  std::vector<std::uint64_t> seeds;
  for (int i = 1; i <= seed_count; ++i) seeds.push_back(static_cast<std::uint64_t>(i));
  return seeds;
}

ScenarioInfo DescribeScenario(const Scenario& scenario, const std::vector<std::uint64_t>& seeds) {
  ScenarioInfo info;
  info.name = scenario.name;
  info.path = scenario.path;
  // An unreadable file leaves its hash empty in the manifest.
  info.sha256 = Sha256OfFile(scenario.path).value_or("");
  info.model_name = scenario.model.name;
  info.model_path = scenario.model_path;
  info.model_sha256 = Sha256OfFile(scenario.model_path).value_or("");
  info.dt_s = scenario.dt_s;
  info.duration_s = scenario.duration_s;
  for (const auto& c : scenario.controllers) info.controllers.push_back(c.name);
  info.baseline = scenario.controllers.at(scenario.baseline).name;
  info.seeds = seeds;
  return info;
}

std::size_t CountRuns(const std::vector<Scenario>& scenarios, const BatchOptions& options) {
  std::size_t n = 0;
  for (const auto& s : scenarios)
    n += s.controllers.size() * RunSeeds(s, options.seed_count).size();
  return n;
}

BatchResult RunBatch(const std::vector<Scenario>& scenarios, const BatchOptions& options,
                     const std::string& tool_version, const ProgressFn& progress) {
  const auto wall_start = std::chrono::steady_clock::now();
  BatchResult batch;
  batch.tool_version = tool_version;
  batch.trace_rate_hz = options.run.trace_rate_hz;
  batch.linear_twin = options.run.linear_twin;

  // Every module file once, before any thread starts.
  const ModuleSet modules(scenarios, options.module_dirs);
  std::vector<RunSlot> slots;
  for (std::size_t s = 0; s < scenarios.size(); ++s) {
    const Scenario& scenario = scenarios[s];
    const auto seeds = RunSeeds(scenario, options.seed_count);
    batch.scenarios.push_back(DescribeScenario(scenario, seeds));
    for (std::size_t c = 0; c < scenario.controllers.size(); ++c) {
      for (const auto seed : seeds) slots.push_back({s, c, seed});
    }
  }

  const std::size_t jobs =
      std::max<std::size_t>(1, std::min(JobsWanted(options.jobs), slots.size()));
  batch.jobs = static_cast<int>(jobs);
  batch.runs.resize(slots.size());

  std::size_t done = 0;
  ParallelFor(
      slots.size(), jobs,
      [&](std::size_t i) {
        const RunSlot& slot = slots[i];
        const Scenario& scenario = scenarios[slot.scenario];
        batch.runs[i] =
            RunOneSafely(scenario, slot.controller, slot.seed,
                         modules.Get(scenario.controllers[slot.controller]), options.run);
      },
      [&] {
        ++done;
        if (progress) progress(done, slots.size());
      });

  batch.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return batch;
}

}  // namespace upright::runner
