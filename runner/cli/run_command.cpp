// `upright run` and `upright demo`: scenario files (or folders of them) in; every scenario ×
// controller × seed run in parallel with its progress on stderr; the results folder written
// (tables, traces, manifest) and its location printed.
#include <tinyxml2.h>

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <string>
#include <vector>

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
  // Normalised, so that the scenarios of `upright run .` share the working folder's own name.
  const auto folder_of = [](const std::string& path) {
    return fs::absolute(path).lexically_normal().parent_path();
  };
  const fs::path folder = folder_of(scenarios.front().path);
  for (const auto& s : scenarios) {
    if (folder_of(s.path) != folder) return "results/batch";
  }
  return "results/" + folder.filename().string();
}

// A folder's scenario files: its *.xml files, sorted by name, but those whose root element names
// another file kind (a robot model); a file that does not parse stays, so its errors show.
std::vector<std::string> ScenarioFilesIn(const fs::path& folder, std::error_code* ec) {
  std::vector<std::string> files;
  for (const auto& entry : fs::directory_iterator(folder, *ec)) {
    if (entry.path().extension() != ".xml" || !entry.is_regular_file()) continue;
    tinyxml2::XMLDocument doc;
    if (doc.LoadFile(entry.path().string().c_str()) == tinyxml2::XML_SUCCESS &&
        doc.RootElement() != nullptr && std::string(doc.RootElement()->Name()) != "scenario") {
      continue;
    }
    files.push_back(entry.path().string());
  }
  std::sort(files.begin(), files.end());
  return files;
}

// The arguments with each folder replaced by its scenario files, or why a folder gives none (it
// cannot be read or holds none).
Result<std::vector<std::string>> ExpandFolders(const std::vector<std::string>& args) {
  std::vector<std::string> files;
  for (const auto& arg : args) {
    std::error_code ec;
    if (!fs::is_directory(arg, ec)) {
      files.push_back(arg);
      continue;
    }
    const std::vector<std::string> found = ScenarioFilesIn(arg, &ec);
    if (ec || found.empty()) {
      return Failure(arg + ": a folder with no scenario files (*.xml whose root is <scenario>)" +
                     (ec ? " (" + ec.message() + ")" : std::string()) + "; nothing was run");
    }
    files.insert(files.end(), found.begin(), found.end());
  }
  return files;
}

// The demo suite: the scenario files in scenarios/ of the first data folder that has any, or a
// message naming every folder looked in when none has.
Result<std::vector<std::string>> DemoScenarios() {
  std::string looked;
  for (const fs::path& data : DataFolders()) {
    const fs::path folder = data / "scenarios";
    std::error_code ec;
    std::vector<std::string> paths = ScenarioFilesIn(folder, &ec);
    if (!ec && !paths.empty()) return paths;
    looked += (looked.empty() ? "" : ", nor in ") + folder.string() + " (" +
              (ec ? ec.message() : std::string("no scenario files")) + ")";
  }
  return Failure("no demo scenarios in " + (looked.empty() ? "any folder" : looked) +
                 "; install upright (cmake --install) or run the program in its build tree");
}

}  // namespace

int RunScenarios(const RunCommandOptions& options) {
  const Result<std::vector<std::string>> expanded = ExpandFolders(options.scenario_paths);
  if (!expanded) {
    std::cerr << expanded.error() << "\n";
    return kExitBadInput;
  }
  const std::vector<std::string>& paths = *expanded;
  std::vector<runner::Scenario> scenarios;
  int bad = 0;
  for (const auto& path : paths) {
    runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
    if (!loaded) {
      for (const auto& e : loaded.error()) std::cerr << e.ToString() << "\n";
      ++bad;
      continue;
    }
    scenarios.push_back(std::move(*loaded));
  }
  if (bad > 0) {
    std::cerr << bad << " of " << paths.size() << " scenario file(s) invalid; nothing was run\n";
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
  if (const Status valid = batch_options.Validate(); !valid) {
    std::cerr << valid.error() << "\n";
    return kExitBadInput;
  }
  const std::string out_dir = options.out_dir.empty() ? DefaultOutDir(scenarios) : options.out_dir;
  const std::size_t total = runner::CountRuns(scenarios, batch_options);

  ProgressLine progress_line({.label = options.label});
  std::printf("%s %zu scenario(s), %zu run(s) into %s\n", options.verb.c_str(), scenarios.size(),
              total, out_dir.c_str());
  std::fflush(stdout);
  const runner::BatchResult batch =
      runner::RunBatch(scenarios, batch_options, UPRIGHT_VERSION, progress_line.Callback());
  if (const Status written = runner::WriteResults(out_dir, batch); !written) {
    std::cerr << written.error() << "\n";
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
  if (options.caution) std::printf("%s\n", kCaution);
  // Runs that could not even start mean the user's setup is wrong; falls are results.
  return failed_setup > 0 ? kExitFailed : kExitOk;
}

int RunDemo(const RunCommandOptions& options) {
  RunCommandOptions demo = options;
  demo.verb = "upright demo: the invented demo suite,";
  demo.label = "upright demo";
  demo.caution = false;  // once, before the report line
  if (demo.scenario_paths.empty()) {
    Result<std::vector<std::string>> found = DemoScenarios();
    if (!found) {
      std::cerr << found.error() << "\n";
      return kExitBadInput;
    }
    demo.scenario_paths = std::move(*found);
  }
  if (demo.out_dir.empty()) demo.out_dir = "results/demo";
  // The whole picture: every scenario with its linear twin, then the margin and the spread of
  // the shove every controller meets, then one report over all of it.
  demo.batch.run.linear_twin = true;
  if (const int code = RunScenarios(demo); code != kExitOk) return code;

  const fs::path folder = fs::path(demo.scenario_paths.front()).parent_path();
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
  envelope.caution = false;
  std::printf("\nupright demo: the push each controller survives in %s\n", shove.c_str());
  if (const int code = RunEnvelope(envelope); code != kExitOk) return code;

  SweepCommandOptions sweep;
  sweep.scenario_path = shove;
  sweep.samples = 50;
  sweep.jobs = demo.batch.jobs;
  sweep.out_dir = demo.out_dir + "/sweep";
  sweep.caution = false;
  std::printf("\nupright demo: the same shove on 50 robots drawn from its spreads\n");
  if (const int code = RunSweep(sweep); code != kExitOk) return code;

  const Result<std::string> report_path = runner::WriteReport(demo.out_dir);
  if (!report_path) {
    std::cerr << report_path.error() << "\n";
    return kExitFailed;
  }
  std::printf("\n%s\n", kCaution);
  std::printf("report: %s (open it in any browser; it needs no network)\n", report_path->c_str());
  return kExitOk;
}

}  // namespace upright::cli
