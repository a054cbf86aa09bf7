// The sweep: every sample drawn first (cheap, in order), the modules loaded once, then
// samples × controllers run on worker threads into fixed slots.
#include "upright/runner/sweep/sweep.hpp"

#include <algorithm>
#include <chrono>
#include <sstream>
#include <utility>

#include "upright/model/check.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/parallel_for.hpp"
#include "upright/runner/sweep/sweep_sampling.hpp"

namespace upright::runner {

Status SweepOptions::Validate() const {
  std::ostringstream why;
  if (samples < 1) {
    why << "SweepOptions::samples = " << samples << ", must be >= 1";
  } else if (jobs < 0) {
    why << "SweepOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else {
    return {};
  }
  return Failure(why.str());
}

Result<SweepResult> RunSweepSamples(const Scenario& scenario, const SweepOptions& options,
                                    const std::string& tool_version, const ProgressFn& progress) {
  UPRIGHT_CHECK(!scenario.dispersions.empty(), "a sweep needs dispersions");
  const Status valid = options.Validate();
  UPRIGHT_CHECK(valid, "%s", valid.error().c_str());
  const auto wall_start = std::chrono::steady_clock::now();
  const std::size_t samples = static_cast<std::size_t>(options.samples);
  const std::size_t controllers = scenario.controllers.size();
  SweepResult result;
  result.tool_version = tool_version;
  std::vector<std::uint64_t> noise_seeds;
  for (std::size_t i = 0; i < samples; ++i) noise_seeds.push_back(SampleNoiseSeed(i));
  result.scenario = DescribeScenario(scenario, noise_seeds);
  result.dispersions = scenario.dispersions;
  result.seed = options.seed;

  // Every module file once, before any thread starts; one that will not load stops the sweep.
  const ModuleSet modules({&scenario, 1}, options.module_dirs);
  for (const ControllerEntry& entry : scenario.controllers) {
    const LoadedModule& loaded = modules.Get(entry);
    if (!loaded) return Failure("controller '" + entry.name + "': " + loaded.error());
  }

  // The samples, in order (each depends only on the sweep seed and its index).
  std::vector<Scenario> sampled(samples);
  for (std::size_t i = 0; i < samples; ++i) {
    SampledScenario s = SampleScenario(scenario, options.seed, i);
    SweepSample sample;
    sample.index = i;
    sample.noise_seed = SampleNoiseSeed(i);
    sample.values = std::move(s.values);
    sample.redraws = std::move(s.redraws);
    sample.error = std::move(s.error);
    if (sample.error.empty()) sampled[i] = std::move(s.scenario);
    result.samples.push_back(std::move(sample));
  }

  const std::size_t total = samples * controllers;
  const std::size_t jobs = std::max<std::size_t>(1, std::min(JobsWanted(options.jobs), total));
  result.jobs = static_cast<int>(jobs);
  result.runs.resize(total);

  RunOptions run_options;
  run_options.trace_rate_hz = 0;
  std::size_t done = 0;
  ParallelFor(
      total, jobs,
      [&](std::size_t slot) {
        const std::size_t i = slot / controllers;
        const std::size_t c = slot % controllers;
        const SweepSample& sample = result.samples[i];
        if (!sample.error.empty()) {
          result.runs[slot] = SetupFailedRun(scenario, c, sample.noise_seed,
                                             "sample " + std::to_string(i) + ": " + sample.error);
        } else {
          result.runs[slot] = RunOneSafely(sampled[i], c, sample.noise_seed,
                                           modules.Get(scenario.controllers[c]), run_options);
        }
      },
      [&] {
        ++done;
        if (progress) progress(done, total);
      });

  result.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return result;
}

}  // namespace upright::runner
