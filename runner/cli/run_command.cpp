// `upright run` and `upright demo`: scenario files in; every scenario × controller × seed run in
// parallel with a progress line on a terminal; the results folder written (tables, traces,
// manifest) and its location printed.
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <filesystem>
#include <iostream>

#include "commands.hpp"
#include "upright/runner/batch.hpp"
#include "upright/runner/results_writer.hpp"
#include "upright/runner/scenario_file.hpp"
#include "upright_version.hpp"

namespace upright::cli {
namespace {

namespace fs = std::filesystem;

// The folder's default name: the scenario's own name, or for several, the name of the folder
// they share ("batch" when they do not).
std::string DefaultOutDir(const std::vector<runner::Scenario>& scenarios) {
  if (scenarios.size() == 1) return "results/" + scenarios.front().name;
  const fs::path folder = fs::absolute(scenarios.front().path).parent_path();
  for (const auto& s : scenarios) {
    if (fs::absolute(s.path).parent_path() != folder) return "results/batch";
  }
  return "results/" + folder.filename().string();
}

std::string Clock(double seconds) {
  const long s = std::lround(std::max(0.0, seconds));
  char text[32];
  std::snprintf(text, sizeof text, "%ld:%02ld", s / 60, s % 60);
  return text;
}

}  // namespace

int RunScenarios(const RunCommandOptions& options) {
  std::vector<runner::Scenario> scenarios;
  int bad = 0;
  for (const auto& path : options.scenario_paths) {
    runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
    if (!loaded.ok()) {
      for (const auto& e : loaded.errors) std::cerr << e.ToString() << "\n";
      ++bad;
      continue;
    }
    scenarios.push_back(std::move(loaded.scenario));
  }
  if (bad > 0) {
    std::cerr << bad << " of " << options.scenario_paths.size()
              << " scenario file(s) invalid; nothing was run\n";
    return kExitBadInput;
  }
  for (std::size_t i = 0; i < scenarios.size(); ++i) {
    for (std::size_t j = 0; j < i; ++j) {
      if (scenarios[i].name == scenarios[j].name) {
        std::cerr << scenarios[i].path << ": scenario name '" << scenarios[i].name
                  << "' is also the name of " << scenarios[j].path
                  << "; names must differ within one run\n";
        return kExitBadInput;
      }
    }
  }
  runner::BatchOptions batch_options = options.batch;
  std::string error;
  if (!batch_options.IsValid(&error)) {
    std::cerr << error << "\n";
    return kExitBadInput;
  }
  const std::string out_dir = options.out_dir.empty() ? DefaultOutDir(scenarios) : options.out_dir;
  const std::size_t total = runner::CountRuns(scenarios, batch_options);

  const bool terminal = isatty(STDERR_FILENO) != 0;
  const auto start = std::chrono::steady_clock::now();
  std::printf("%s %zu scenario(s), %zu run(s) into %s\n", options.verb.c_str(), scenarios.size(),
              total, out_dir.c_str());
  std::fflush(stdout);
  const runner::ProgressFn progress = [&](std::size_t done, std::size_t all) {
    if (!terminal) return;
    const double elapsed =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    const double eta = elapsed / static_cast<double>(done) * static_cast<double>(all - done);
    std::fprintf(stderr, "\r  %zu/%zu runs  %3.0f %%  elapsed %s  left ~%s   ", done, all,
                 100.0 * static_cast<double>(done) / static_cast<double>(all),
                 Clock(elapsed).c_str(), Clock(eta).c_str());
    if (done == all) std::fputc('\n', stderr);
  };
  const runner::BatchResult batch =
      runner::RunBatch(scenarios, batch_options, UPRIGHT_VERSION, progress);
  if (!runner::WriteResults(out_dir, batch, &error)) {
    std::cerr << error << "\n";
    return kExitFailed;
  }

  std::size_t survived = 0, failed_setup = 0;
  for (const auto& run : batch.runs) {
    survived += run.metrics.status == runner::RunStatus::kOk;
    failed_setup += run.metrics.status == runner::RunStatus::kSetupFailed;
  }
  std::printf("%zu of %zu run(s) survived; %.1f s on %d job(s)\n", survived, batch.runs.size(),
              batch.wall_s, batch.jobs);
  for (const auto& run : batch.runs) {
    if (run.metrics.status == runner::RunStatus::kSetupFailed) {
      std::printf("  %s / %s: %s\n", run.scenario.c_str(), run.controller.c_str(),
                  run.metrics.message.c_str());
    }
  }
  std::printf("tables: %s/summary.md, %s/compare.md, %s/ranking.md", out_dir.c_str(),
              out_dir.c_str(), out_dir.c_str());
  if (batch.linear_twin) std::printf(", %s/gap.md", out_dir.c_str());
  std::printf("\n");
  std::printf(
      "Simulation only: validate on hardware with a tether or spotter, at low speed first, "
      "within local rules.\n");
  // Runs that could not even start mean the user's setup is wrong; falls are results.
  return failed_setup > 0 ? kExitFailed : kExitOk;
}

int RunDemo(const RunCommandOptions& options) {
  RunCommandOptions demo = options;
  demo.verb = "upright demo: the invented demo suite,";
  if (demo.scenario_paths.empty()) {
    const fs::path folder = fs::path(UPRIGHT_SOURCE_DIR) / "scenarios";
    std::error_code ec;
    for (const auto& entry : fs::directory_iterator(folder, ec)) {
      if (entry.path().extension() == ".xml") demo.scenario_paths.push_back(entry.path().string());
    }
    if (ec || demo.scenario_paths.empty()) {
      std::cerr << folder.string() << ": no demo scenarios found"
                << (ec ? " (" + ec.message() + ")" : std::string()) << "\n";
      return kExitBadInput;
    }
    std::sort(demo.scenario_paths.begin(), demo.scenario_paths.end());
  }
  if (demo.out_dir.empty()) demo.out_dir = "results/demo";
  return RunScenarios(demo);
}

}  // namespace upright::cli
