// The sweep: every sample drawn first (cheap, in order), the modules loaded once, then
// samples × controllers run on worker threads into fixed slots.
#include "upright/runner/sweep.hpp"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <exception>
#include <map>
#include <memory>
#include <mutex>
#include <sstream>
#include <thread>
#include <utility>

#include "upright/host/module.hpp"
#include "upright/model/check.hpp"
#include "upright/runner/sha256.hpp"
#include "upright/runner/sweep_sampling.hpp"

namespace upright::runner {
namespace {

// A failed row: the run did not happen, for `message`.
RunResult SetupFailed(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                      const std::string& message) {
  RunResult failed;
  failed.scenario = scenario.name;
  failed.controller = scenario.controllers[controller].name;
  failed.seed = seed;
  failed.baseline = controller == scenario.baseline;
  failed.metrics.status = RunStatus::kSetupFailed;
  failed.metrics.message = message;
  return failed;
}

ScenarioInfo Describe(const Scenario& scenario, std::size_t samples) {
  ScenarioInfo info;
  info.name = scenario.name;
  info.path = scenario.path;
  std::string ignored;  // an unreadable file leaves its hash empty in the manifest
  info.sha256 = Sha256OfFile(scenario.path, &ignored);
  info.model_name = scenario.model.name;
  info.model_path = scenario.model_path;
  info.model_sha256 = Sha256OfFile(scenario.model_path, &ignored);
  info.dt_s = scenario.dt_s;
  info.duration_s = scenario.duration_s;
  for (const auto& c : scenario.controllers) info.controllers.push_back(c.name);
  info.baseline = scenario.controllers.at(scenario.baseline).name;
  for (std::size_t i = 0; i < samples; ++i) info.seeds.push_back(SampleNoiseSeed(i));
  return info;
}

}  // namespace

bool SweepOptions::IsValid(std::string* error) const {
  std::ostringstream why;
  if (samples < 1) {
    why << "SweepOptions::samples = " << samples << ", must be >= 1";
  } else if (jobs < 0) {
    why << "SweepOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else {
    return true;
  }
  *error = why.str();
  return false;
}

SweepResult RunSweepSamples(const Scenario& scenario, const SweepOptions& options,
                            const std::string& tool_version, const ProgressFn& progress) {
  UPRIGHT_CHECK(!scenario.dispersions.empty(), "a sweep needs dispersions");
  std::string invalid;
  UPRIGHT_CHECK(options.IsValid(&invalid), "%s", invalid.c_str());
  const auto wall_start = std::chrono::steady_clock::now();
  const std::size_t samples = static_cast<std::size_t>(options.samples);
  const std::size_t controllers = scenario.controllers.size();
  SweepResult result;
  result.tool_version = tool_version;
  result.scenario = Describe(scenario, samples);
  result.dispersions = scenario.dispersions;
  result.seed = options.seed;

  // Every module file once, before any thread starts; one that will not load stops the sweep.
  const std::vector<std::string> dirs =
      options.module_dirs.empty() ? host::DefaultModuleDirs() : options.module_dirs;
  std::map<std::pair<bool, std::string>, std::shared_ptr<host::Module>> modules;
  for (const ControllerEntry& entry : scenario.controllers) {
    const auto key = std::make_pair(entry.builtin, entry.module);
    if (modules.count(key)) continue;
    std::string error;
    std::string path = entry.module;
    if (entry.builtin) path = host::FindBuiltinModule(entry.module, dirs, &error);
    std::shared_ptr<host::Module> module =
        path.empty() ? nullptr : host::Module::Load(path, &error);
    if (!module) {
      result.module_error = "controller '" + entry.name + "': " + error;
      return result;
    }
    modules.emplace(key, std::move(module));
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
  const unsigned cores = std::max(1u, std::thread::hardware_concurrency());
  const std::size_t wanted = options.jobs > 0 ? static_cast<std::size_t>(options.jobs) : cores;
  const std::size_t jobs = std::max<std::size_t>(1, std::min(wanted, total));
  result.jobs = static_cast<int>(jobs);
  result.runs.resize(total);

  RunOptions run_options;
  run_options.trace_rate_hz = 0;
  std::atomic<std::size_t> next{0};
  std::mutex progress_mutex;
  std::size_t done = 0;
  const auto work = [&] {
    for (std::size_t slot = next++; slot < total; slot = next++) {
      const std::size_t i = slot / controllers;
      const std::size_t c = slot % controllers;
      const SweepSample& sample = result.samples[i];
      if (!sample.error.empty()) {
        result.runs[slot] = SetupFailed(scenario, c, sample.noise_seed,
                                        "sample " + std::to_string(i) + ": " + sample.error);
      } else {
        const ControllerEntry& entry = scenario.controllers[c];
        try {
          result.runs[slot] = RunOne(sampled[i], c, sample.noise_seed,
                                     modules.at({entry.builtin, entry.module}), "", run_options);
        } catch (const std::exception& e) {
          // Out of memory and the like: the run is a failed row, the sweep goes on.
          result.runs[slot] = SetupFailed(scenario, c, sample.noise_seed,
                                          std::string("the run stopped on an error: ") + e.what());
        }
      }
      std::lock_guard<std::mutex> lock(progress_mutex);
      ++done;
      if (progress) progress(done, total);
    }
  };
  std::vector<std::thread> workers;
  for (std::size_t j = 1; j < jobs; ++j) workers.emplace_back(work);
  work();
  for (auto& w : workers) w.join();

  result.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return result;
}

}  // namespace upright::runner
