// A Monte Carlo sweep: one scenario with dispersions in; N sampled scenarios, each run by every
// controller (the same sample for all, noise seed = sample index + 1), out. Runs go on worker
// threads; the result is the same whatever the number of jobs.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/common/sample_statistics.hpp"
#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/tables/paired_tests.hpp"

namespace upright::runner {

struct SweepOptions {
  int samples = 100;       // N, >= 1
  std::uint64_t seed = 1;  // sweep seed S: fixes every sample's draws
  int jobs = 0;            // worker threads; 0: one per hardware thread
  // Where built-in modules are looked for; empty: host::DefaultModuleDirs().
  std::vector<std::string> module_dirs;
  // Fine when valid; otherwise the broken rule, naming the field and value.
  Status Validate() const;
};

// One sample: its draws, or why it could not be drawn.
struct SweepSample {
  std::size_t index = 0;         // 0-based
  std::uint64_t noise_seed = 0;  // index + 1
  std::vector<double> values;    // per dispersion, file units (NaN: not drawn)
  std::vector<int> redraws;      // per dispersion, draws rejected before the accepted one
  std::string error;             // "": drawn; else every run of the sample is kSetupFailed
};

struct SweepResult {
  std::string tool_version;
  ScenarioInfo scenario;  // name, file hashes, controllers, baseline (seeds: the noise seeds)
  std::vector<Dispersion> dispersions;
  std::uint64_t seed = 0;
  std::vector<SweepSample> samples;
  // Sample by sample, controller by controller (scenario order): runs[i · C + c].
  std::vector<RunResult> runs;
  int jobs = 1;
  double wall_s = 0;  // manifest only

  std::size_t controller_count() const { return scenario.controllers.size(); }
  const RunResult& run(std::size_t sample, std::size_t controller) const {
    return runs[sample * controller_count() + controller];
  }
};

// Runs `scenario`'s sweep. Needs at least one dispersion (UPRIGHT_CHECK). Module files are loaded
// once each before any run; one that will not load stops the sweep before it starts, the message
// naming the controller ("controller 'pid': ..."). `progress` is called after each finished run,
// one call at a time. No traces are recorded.
Result<SweepResult> RunSweepSamples(const Scenario& scenario, const SweepOptions& options,
                                    const std::string& tool_version, const ProgressFn& progress);

// How many samples controller `controller` survived (status ok; a failed set-up counts as not).
std::size_t CountSurvived(const SweepResult& result, std::size_t controller);

// Controller `controller` against the scenario's baseline, sample by sample.
PairedCounts PairWithBaseline(const SweepResult& result, std::size_t controller);

// The index of the baseline controller in result.scenario.controllers.
std::size_t BaselineIndex(const SweepResult& result);

}  // namespace upright::runner
