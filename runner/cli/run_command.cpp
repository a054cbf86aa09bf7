// `upright run` and `upright demo`: scenario files (or folders of them) in; every scenario ×
// controller × seed run in parallel with its progress on stderr, then what the runs' modules
// logged; the results folder written (tables, traces, manifest) and its location printed.
#include <tinyxml2.h>

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <string>
#include <vector>

#include "commands.hpp"
#include "data_folders.hpp"
#include "design_folder.hpp"
#include "envelope_command.hpp"
#include "log.hpp"
#include "module_messages.hpp"
#include "progress.hpp"
#include "sweep_command.hpp"
#include "tune_command.hpp"
#include "upright/base/number_text.hpp"
#include "upright/base/read_file.hpp"
#include "upright/runner/report/report.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/scenario/scenario_file.hpp"
#include "upright/runner/tables/results_writer.hpp"
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
    const Result<std::string> text = ReadRegularFile(entry.path().string(), kMaxInputFileBytes);
    tinyxml2::XMLDocument doc;
    if (text && doc.Parse(text->data(), text->size()) == tinyxml2::XML_SUCCESS &&
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
    Log().Error(expanded.error());
    return kExitBadInput;
  }
  const std::vector<std::string>& paths = *expanded;
  std::vector<runner::Scenario> scenarios;
  int bad = 0;
  for (const auto& path : paths) {
    runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
    if (!loaded) {
      for (const auto& e : loaded.error()) Log().Error(e.ToString());
      ++bad;
      continue;
    }
    scenarios.push_back(std::move(*loaded));
  }
  if (bad > 0) {
    Log().Error(Printf("%d of %zu scenario file(s) invalid; nothing was run", bad, paths.size()));
    return kExitBadInput;
  }
  for (std::size_t i = 0; i < scenarios.size(); ++i) {
    for (std::size_t j = 0; j < i; ++j) {
      if (scenarios[i].name == scenarios[j].name) {
        Log().Error(scenarios[i].path + ": scenario name '" + scenarios[i].name +
                    "' is also the name of " + scenarios[j].path +
                    "; names must differ within one run");
        return kExitBadInput;
      }
    }
  }
  runner::BatchOptions batch_options = options.batch;
  // What the modules log at debug level is kept only when it is to be shown.
  if (Log().Shows(LogLevel::kDebug)) batch_options.run.module_log_level = LogLevel::kDebug;
  if (const Status valid = batch_options.Validate(); !valid) {
    Log().Error(valid.error());
    return kExitBadInput;
  }
  for (const runner::Scenario& s : scenarios) {
    Log().Debug(Printf("%s: scenario '%s', robot '%s' (%s), %zu controller(s)", s.path.c_str(),
                       s.name.c_str(), s.model.name.c_str(), s.model_path.c_str(),
                       s.controllers.size()));
  }
  const std::string out_dir = options.out_dir.empty() ? DefaultOutDir(scenarios) : options.out_dir;
  const std::size_t total = runner::CountRuns(scenarios, batch_options);

  ProgressLine progress_line({.label = options.label});
  Log().Info(Printf("%s %zu scenario(s), %zu run(s) into %s", options.verb.c_str(),
                    scenarios.size(), total, out_dir.c_str()));
  const runner::BatchResult batch =
      runner::RunBatch(scenarios, batch_options, UPRIGHT_VERSION,
                       Log().ShowsProgress() ? progress_line.Callback() : runner::ProgressFn());
  LogModuleMessages(Log(), batch);
  for (const auto& run : batch.runs) {
    Log().Debug(Printf(
        "%s / %s / seed %llu: %s after %ld step(s), %s s: %s", run.scenario.c_str(),
        run.controller.c_str(), static_cast<unsigned long long>(run.seed),
        runner::ToString(run.metrics.status), run.steps, FixedText(run.wall_s, 3).c_str(),
        run.metrics.message.c_str()));
  }
  if (const Status written = runner::WriteResults(out_dir, batch); !written) {
    Log().Error(written.error());
    return kExitFailed;
  }

  std::size_t survived = 0, failed_setup = 0;
  for (const auto& run : batch.runs) {
    survived += run.metrics.status == runner::RunStatus::kOk;
    failed_setup += run.metrics.status == runner::RunStatus::kSetupFailed;
  }
  Log().Info(Printf("%zu of %zu run(s) survived; %s s on %d job(s)", survived, batch.runs.size(),
                    FixedText(batch.wall_s, 1).c_str(), batch.jobs));
  for (const auto& run : batch.runs) {
    if (run.metrics.status == runner::RunStatus::kSetupFailed) {
      // Among the command's own lines on stdout, but shown when quiet: the exit code's reason.
      Log().Out(LogLevel::kError,
                "  " + run.scenario + " / " + run.controller + ": " + run.metrics.message);
    }
  }
  std::string tables =
      "tables: " + out_dir + "/summary.md, " + out_dir + "/compare.md, " + out_dir + "/ranking.md";
  if (batch.linear_twin) tables += ", " + out_dir + "/gap.md";
  Log().Info(tables);
  if (options.caution) Log().Caution(kCaution);
  // Runs that could not even start mean the user's setup is wrong; falls are results.
  return failed_setup > 0 ? kExitFailed : kExitOk;
}

// The demo tune's evaluations per controller, and the seeds each demo scenario file lists.
constexpr int kDemoTuneEvaluations = 40;
constexpr int kDemoScenarioSeeds = 3;

int RunDemo(const RunCommandOptions& options) {
  RunCommandOptions demo = options;
  demo.verb = "upright demo: the invented demo suite,";
  demo.label = "upright demo";
  demo.caution = false;  // once, before the report line
  if (demo.scenario_paths.empty()) {
    Result<std::vector<std::string>> found = DemoScenarios();
    if (!found) {
      Log().Error(found.error());
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
  Log().Info("\nupright demo: the push each controller survives in " + shove);
  if (const int code = RunEnvelope(envelope); code != kExitOk) return code;

  SweepCommandOptions sweep;
  sweep.scenario_path = shove;
  sweep.samples = 50;
  sweep.jobs = demo.batch.jobs;
  sweep.out_dir = demo.out_dir + "/sweep";
  sweep.caution = false;
  Log().Info("\nupright demo: the same shove on 50 robots drawn from its spreads");
  if (const int code = RunSweep(sweep); code != kExitOk) return code;

  // Every controller at its best on three courier scenarios (a margin to the ground kept on every
  // run), ranked again on held-out seeds: 40 evaluations each.
  TuneCommandOptions tune;
  for (const char* name :
       {"courier-shove-half-sine", "courier-wet-patch-brake", "courier-parcel-slide"}) {
    tune.scenario_paths.push_back((folder / (std::string(name) + ".xml")).string());
  }
  tune.tune_path = (folder / "tune" / "courier-demo.xml").string();
  tune.seed_count = demo.batch.seed_count;
  tune.budget_runs = kDemoTuneEvaluations * static_cast<int>(tune.scenario_paths.size()) *
                     (tune.seed_count > 0 ? tune.seed_count : kDemoScenarioSeeds);
  tune.jobs = demo.batch.jobs;
  tune.out_dir = demo.out_dir + "/tune";
  tune.caution = false;
  Log().Info("\nupright demo: each controller tuned on three courier scenarios");
  if (const int code = RunTune(tune); code != kExitOk) return code;

  // The demo robots' default designs: the pictures of the loops the modules above ran.
  Log().Info("\nupright demo: the designs' loops and design push on the linear model");
  std::vector<fs::path> models;
  std::error_code error;
  for (fs::directory_iterator it(folder.parent_path() / "models", error), end; !error && it != end;
       it.increment(error)) {
    if (it->path().extension() == ".xml") models.push_back(it->path());
  }
  std::sort(models.begin(), models.end());
  for (const fs::path& model : models) {
    const std::string dir = demo.out_dir + "/design-" + model.stem().string();
    if (const Status written = WriteDefaultDesignFolder(model.string(), dir, UPRIGHT_VERSION);
        !written) {
      Log().Error(written.error());
      return kExitFailed;
    }
    Log().Info("  " + dir);
  }

  const Result<std::string> report_path = runner::WriteReport(demo.out_dir);
  if (!report_path) {
    Log().Error(report_path.error());
    return kExitFailed;
  }
  Log().Info("");
  Log().Caution(kCaution);
  Log().Info("report: " + *report_path + " (open it in any browser; it needs no network)");
  return kExitOk;
}

}  // namespace upright::cli
