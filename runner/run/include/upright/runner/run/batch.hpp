// Batch: scenarios × controllers × seeds, run in parallel (one world per run, results in a fixed
// order whatever the number of jobs), with progress reported as runs finish. Also the seeds a
// scenario runs with and its manifest description, which envelopes and sweeps share.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

struct BatchOptions {
  int jobs = 0;        // worker threads; 0: one per hardware thread
  int seed_count = 0;  // > 0: seeds 1..seed_count for every scenario instead of the files' own
  RunOptions run;      // per-run options (trace rate)
  // Where built-in modules are looked for; empty: host::DefaultModuleDirs().
  std::vector<std::string> module_dirs;
  // Fine when valid (its RunOptions too); otherwise the broken rule, naming the field and value.
  Status Validate() const;
};

// Called after each finished run, from the worker that ran it, one call at a time.
using ProgressFn = std::function<void(std::size_t done, std::size_t total)>;

// Runs every scenario × controller × seed. Module files are loaded once each; a module that will
// not load makes its runs kSetupFailed results. `tool_version` and the scenarios' file hashes go
// into the result for the manifest.
BatchResult RunBatch(const std::vector<Scenario>& scenarios, const BatchOptions& options,
                     const std::string& tool_version, const ProgressFn& progress);

// The number of runs RunBatch would make.
std::size_t CountRuns(const std::vector<Scenario>& scenarios, const BatchOptions& options);

// The noise seeds a scenario runs with: 1..seed_count when seed_count > 0, else the file's own.
std::vector<std::uint64_t> RunSeeds(const Scenario& scenario, int seed_count);

// What a manifest says about `scenario` run with `seeds`: its name, its file and its robot model
// file with their SHA-256 (empty for a file that cannot be read), step, duration, controllers and
// baseline.
ScenarioInfo DescribeScenario(const Scenario& scenario, const std::vector<std::uint64_t>& seeds);

}  // namespace upright::runner
