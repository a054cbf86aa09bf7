#include "upright/runner/batch.hpp"

#include <atomic>
#include <chrono>
#include <exception>
#include <map>
#include <memory>
#include <mutex>
#include <sstream>
#include <thread>

#include "upright/host/module.hpp"
#include "upright/runner/sha256.hpp"

namespace upright::runner {
namespace {

struct RunSlot {
  std::size_t scenario = 0;
  std::size_t controller = 0;
  std::uint64_t seed = 0;
};

std::vector<std::uint64_t> SeedsOf(const Scenario& scenario, const BatchOptions& options) {
  if (options.seed_count <= 0) return scenario.seeds;
  std::vector<std::uint64_t> seeds;
  for (int i = 1; i <= options.seed_count; ++i) seeds.push_back(static_cast<std::uint64_t>(i));
  return seeds;
}

// A loaded module, or why it could not be loaded.
struct LoadedModule {
  std::shared_ptr<host::Module> module;
  std::string error;
};

LoadedModule Load(const ControllerEntry& entry, const std::vector<std::string>& dirs) {
  LoadedModule loaded;
  std::string path = entry.module;
  if (entry.builtin) {
    path = host::FindBuiltinModule(entry.module, dirs, &loaded.error);
    if (path.empty()) return loaded;
  }
  loaded.module = host::Module::Load(path, &loaded.error);
  return loaded;
}

ScenarioInfo Describe(const Scenario& scenario, const std::vector<std::uint64_t>& seeds) {
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
  info.seeds = seeds;
  return info;
}

}  // namespace

bool BatchOptions::IsValid(std::string* error) const {
  std::ostringstream why;
  if (jobs < 0) {
    why << "BatchOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else if (seed_count < 0) {
    why << "BatchOptions::seed_count = " << seed_count << ", must be >= 0 (0: the files' seeds)";
  } else {
    return run.IsValid(error);
  }
  *error = why.str();
  return false;
}

std::size_t CountRuns(const std::vector<Scenario>& scenarios, const BatchOptions& options) {
  std::size_t n = 0;
  for (const auto& s : scenarios) n += s.controllers.size() * SeedsOf(s, options).size();
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
  const std::vector<std::string> dirs =
      options.module_dirs.empty() ? host::DefaultModuleDirs() : options.module_dirs;
  std::map<std::pair<bool, std::string>, LoadedModule> modules;
  std::vector<RunSlot> slots;
  for (std::size_t s = 0; s < scenarios.size(); ++s) {
    const Scenario& scenario = scenarios[s];
    const auto seeds = SeedsOf(scenario, options);
    batch.scenarios.push_back(Describe(scenario, seeds));
    for (std::size_t c = 0; c < scenario.controllers.size(); ++c) {
      const ControllerEntry& entry = scenario.controllers[c];
      const auto key = std::make_pair(entry.builtin, entry.module);
      if (!modules.count(key)) modules.emplace(key, Load(entry, dirs));
      for (const auto seed : seeds) slots.push_back({s, c, seed});
    }
  }

  const unsigned cores = std::max(1u, std::thread::hardware_concurrency());
  const std::size_t wanted = options.jobs > 0 ? static_cast<std::size_t>(options.jobs) : cores;
  const std::size_t jobs = std::max<std::size_t>(1, std::min(wanted, slots.size()));
  batch.jobs = static_cast<int>(jobs);
  batch.runs.resize(slots.size());

  std::atomic<std::size_t> next{0};
  std::mutex progress_mutex;
  std::size_t done = 0;
  const auto work = [&] {
    for (std::size_t i = next++; i < slots.size(); i = next++) {
      const RunSlot& slot = slots[i];
      const Scenario& scenario = scenarios[slot.scenario];
      const ControllerEntry& entry = scenario.controllers[slot.controller];
      const LoadedModule& loaded = modules.at({entry.builtin, entry.module});
      try {
        batch.runs[i] =
            RunOne(scenario, slot.controller, slot.seed, loaded.module, loaded.error, options.run);
      } catch (const std::exception& e) {
        // Out of memory and the like: the run is a failed row, the batch goes on.
        RunResult& failed = batch.runs[i];
        failed = RunResult{};
        failed.scenario = scenario.name;
        failed.controller = entry.name;
        failed.seed = slot.seed;
        failed.baseline = slot.controller == scenario.baseline;
        failed.metrics.status = RunStatus::kSetupFailed;
        failed.metrics.message = std::string("the run stopped on an error: ") + e.what();
      }
      std::lock_guard<std::mutex> lock(progress_mutex);
      ++done;
      if (progress) progress(done, slots.size());
    }
  };
  std::vector<std::thread> workers;
  for (std::size_t j = 1; j < jobs; ++j) workers.emplace_back(work);
  work();
  for (auto& w : workers) w.join();

  batch.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return batch;
}

}  // namespace upright::runner
