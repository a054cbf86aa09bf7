// Batch: scenarios × controllers × seeds, run in parallel (one world per run, results in a fixed
// order whatever the number of jobs), with progress reported as runs finish.
#pragma once

#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "upright/runner/run_one.hpp"
#include "upright/runner/run_result.hpp"
#include "upright/runner/scenario.hpp"

namespace upright::runner {

struct BatchOptions {
  int jobs = 0;        // worker threads; 0: one per hardware thread
  int seed_count = 0;  // > 0: seeds 1..seed_count for every scenario instead of the files' own
  RunOptions run;      // per-run options (trace rate)
  // Where built-in modules are looked for; empty: host::DefaultModuleDirs().
  std::vector<std::string> module_dirs;
  bool IsValid(std::string* error) const;
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

}  // namespace upright::runner
