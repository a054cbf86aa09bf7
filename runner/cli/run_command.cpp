// `upright run` and `upright demo`: scenario files in; every scenario × controller × seed run in
// parallel with a progress line on a terminal; the results folder written (tables, traces,
// manifest) and its location printed.
#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <iostream>

#include "commands.hpp"
#include "data_folders.hpp"
#include "envelope_command.hpp"
#include "progress.hpp"
#include "sweep_command.hpp"
#include "upright/runner/batch.hpp"
#include "upright/runner/report.hpp"
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

// The demo suite: the scenario files in scenarios/ of the first data folder that has any, sorted.
// Empty, with *error naming every folder looked in, when none has.
std::vector<std::string> DemoScenarios(fs::path* folder, std::string* error) {
  std::string looked;
  for (const fs::path& data : DataFolders()) {
    *folder = data / "scenarios";
    std::vector<std::string> paths;
    std::error_code ec;
    for (const auto& entry : fs::directory_iterator(*folder, ec)) {
      if (entry.path().extension() == ".xml") paths.push_back(entry.path().string());
    }
    if (!ec && !paths.empty()) {
      std::sort(paths.begin(), paths.end());
      return paths;
    }
    looked += (looked.empty() ? "" : ", nor in ") + folder->string() + " (" +
              (ec ? ec.message() : std::string("no .xml files")) + ")";
  }
  *error = "no demo scenarios in " + (looked.empty() ? "any folder" : looked) +
           "; install upright (cmake --install) or run the program in its build tree";
  return {};
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

  ProgressLine progress_line;
  std::printf("%s %zu scenario(s), %zu run(s) into %s\n", options.verb.c_str(), scenarios.size(),
              total, out_dir.c_str());
  std::fflush(stdout);
  const runner::BatchResult batch =
      runner::RunBatch(scenarios, batch_options, UPRIGHT_VERSION, progress_line.Callback());
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
  fs::path folder;
  std::string error;
  const std::vector<std::string> suite = DemoScenarios(&folder, &error);
  if (suite.empty()) {
    std::cerr << error << "\n";
    return kExitBadInput;
  }
  if (demo.scenario_paths.empty()) demo.scenario_paths = suite;
  if (demo.out_dir.empty()) demo.out_dir = "results/demo";
  // The whole picture: every scenario with its linear twin, then the margin and the spread of
  // the shove every controller meets, then one report over all of it.
  demo.batch.run.linear_twin = true;
  if (const int code = RunScenarios(demo); code != kExitOk) return code;

  const std::string shove = (folder / "courier-shove-half-sine.xml").string();
  EnvelopeCommandOptions envelope;
  envelope.scenario_path = shove;
  envelope.vary = "timeline/push[1].peak_N";
  envelope.lo = 40;
  envelope.hi = 640;
  envelope.tol = 5;
  envelope.vary2 = "timeline/push[1].height_m";
  envelope.lo2 = 0.05;
  envelope.hi2 = 0.65;
  envelope.grid = 7;
  envelope.seed_count = 1;
  envelope.jobs = demo.batch.jobs;
  envelope.out_dir = demo.out_dir + "/envelope";
  std::printf("\nupright demo: the push each controller survives in %s\n", shove.c_str());
  if (const int code = RunEnvelope(envelope); code != kExitOk) return code;

  SweepCommandOptions sweep;
  sweep.scenario_path = shove;
  sweep.samples = 50;
  sweep.jobs = demo.batch.jobs;
  sweep.out_dir = demo.out_dir + "/sweep";
  std::printf("\nupright demo: the same shove on 50 robots drawn from its spreads\n");
  if (const int code = RunSweep(sweep); code != kExitOk) return code;

  std::string report_path;
  if (!runner::WriteReport(demo.out_dir, &report_path, &error)) {
    std::cerr << error << "\n";
    return kExitFailed;
  }
  std::printf("\nreport: %s (open it in any browser; it needs no network)\n", report_path.c_str());
  return kExitOk;
}

}  // namespace upright::cli
