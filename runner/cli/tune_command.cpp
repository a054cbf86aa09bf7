// `upright tune`: scenario files (and optionally a tune file) in; every named controller's knobs
// searched with a progress line (the best objective so far and the time left); tune.csv and
// tune.md written and each controller's default and tuned objective printed with its element.
#include "tune_command.hpp"

#include <algorithm>
#include <cmath>

#include "commands.hpp"
#include "load_scenario.hpp"
#include "log.hpp"
#include "progress.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/tables/make_results_folder.hpp"
#include "upright/runner/tune/evaluation_log.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_file.hpp"
#include "upright/runner/tune/tune_writer.hpp"
#include "upright_version.hpp"

namespace upright::cli {

CLI::App* AddTuneCommand(CLI::App* app, TuneCommandOptions* o) {
  auto* cmd = app->add_subcommand(
      "tune",
      "Tune each controller's settings on the physics plant: a seeded space-filling start, then "
      "a derivative-free polish (NLopt), minimising an objective over the scenarios x seeds");
  cmd->add_option("SCENARIO", o->scenario_paths, "Scenario files (.xml)")->required();
  cmd->add_option("--controller", o->controllers,
                  "A controller to tune, by name (repeatable; default: every controller of the "
                  "first scenario); it must be in every scenario");
  cmd->add_option("--budget", o->budget_runs,
                  "Runs per controller: evaluations x (every scenario's seeds), the default "
                  "setting's evaluation included")
      ->check(CLI::Range(1, 100000000))
      ->capture_default_str();
  cmd->add_option("--seed", o->seed, "Search seed: the same seed tries the same settings")
      ->capture_default_str();
  cmd->add_option("--jobs", o->jobs, "Runs in parallel (0: one per core)")
      ->check(CLI::Range(0, 1024))
      ->capture_default_str();
  cmd->add_option("--seeds", o->seed_count,
                  "Noise seeds 1..N for every scenario in the search (0: each file's own); the "
                  "held-out seeds follow the largest")
      ->check(CLI::Range(0, 100000))
      ->capture_default_str();
  cmd->add_option("--holdout", o->holdout_seeds,
                  "Held-out seeds per scenario (the N after its own): the default and the tuned "
                  "setting played again on seeds the search never saw (0: none)")
      ->check(CLI::Range(0, 1000))
      ->capture_default_str();
  cmd->add_option("--out", o->out_dir, "Results folder (default: results/<scenario name>-tune)");
  cmd->add_option("--tune", o->tune_path,
                  "Tune file (.xml): the knobs per controller and the objective (default: the "
                  "built-ins' default knobs and the default objective)");
  cmd->add_flag("--resume", o->resume,
                "Resume an interrupted tune from the results folder's tune.log: its evaluations "
                "are taken as logged, the rest are played (the same inputs and options only)");
  cmd->add_option("--pareto", o->pareto_metrics,
                  "METRIC,METRIC: each controller's Pareto front of the two metrics' means "
                  "(both minimised; the columns of summary.csv that compare judges, e.g. "
                  "max_tilt_deg,energy_J) is searched instead of the objective alone, and "
                  "written to pareto.csv and tune.md")
      ->delimiter(',')
      ->expected(1, 2);
  cmd->footer(
      "Default objective: 1 x max_tilt_deg + 10 x max_drift_m (means over the runs); any run "
      "that does not survive scores 1e6 x (1 + the share of time lost). Default knobs: lqr and "
      "lqg max_tilt_deg 0.5-15, max_drift_m 0.05-5, max_input_fraction 0.05-1; hinf gamma_factor "
      "1.05-20, max_drift_m, max_input_fraction; pid tilt_pole_factor 1-6, speed_pole_factor "
      "0.1-1, max_tilt_deg, tilt_filter_s 0.05-5 (all log scale); a setting the controller "
      "refuses scores as one whose runs all fell at the start. Tune files: scenarios/README.md, "
      "\"Tune files\".");
  return cmd;
}

int RunTune(const TuneCommandOptions& options) {
  std::vector<runner::Scenario> scenarios;
  for (const std::string& path : options.scenario_paths) {
    Result<runner::Scenario> loaded = LoadScenarioForRun(path);
    if (!loaded) {
      Log().Error(loaded.error());
      return kExitBadInput;
    }
    loaded->seeds = runner::RunSeeds(*loaded, options.seed_count);
    scenarios.push_back(std::move(*loaded));
  }
  runner::TuneSpec spec;
  if (!options.tune_path.empty()) {
    Result<runner::TuneSpec> read = runner::ReadTuneFile(options.tune_path);
    if (!read) {
      Log().Error(read.error() + "\n" + options.tune_path + ": invalid; nothing was run");
      return kExitBadInput;
    }
    spec = std::move(*read);
  }
  runner::TuneOptions tune_options;
  tune_options.controllers = options.controllers;
  tune_options.budget_runs = options.budget_runs;
  tune_options.seed = options.seed;
  tune_options.jobs = options.jobs;
  tune_options.holdout_seeds = options.holdout_seeds;
  tune_options.pareto_metrics = options.pareto_metrics;
  const Result<runner::TunePlan> planned = runner::PlanTune(scenarios, tune_options, spec);
  if (!planned) {
    Log().Error(planned.error() + "\n(nothing was run)");
    return kExitBadInput;
  }
  const runner::TunePlan& plan = *planned;
  if (const auto start = runner::CheckTuneStart(scenarios, plan, tune_options); !start) {
    Log().Error(start.error().message + "\n(nothing was run)");
    return start.error().module_missing ? kExitFailed : kExitBadInput;
  }
  const std::string out_dir =
      options.out_dir.empty() ? "results/" + scenarios.front().name + "-tune" : options.out_dir;

  Log().Info(
      Printf("upright tune: %zu controller(s) on %zu scenario(s); %d evaluations of %zu "
             "run(s) each per controller, search seed %llu; %zu held-out run(s) each for the "
             "default and the tuned setting",
             plan.controllers.size(), scenarios.size(), plan.evaluations, plan.runs_per_evaluation,
             static_cast<unsigned long long>(options.seed), plan.holdout_runs));
  Log().Info("  objective: " + plan.objective.Text() +
             (plan.objective.bounds.empty() ? "" : ", subject to the bounds of " + plan.tune_path));
  if (!plan.pareto_metrics.empty()) {
    Log().Info("  searched: the Pareto front of " + plan.pareto_metrics[0] + " against " +
               plan.pareto_metrics[1] + " (both minimised)");
  }
  Log().Info(Printf("  at most %zu run(s) into %s", plan.max_runs, out_dir.c_str()));
  // The evaluation log, written as the tune goes: replayed with --resume, otherwise replaced.
  const std::string log_path = out_dir + "/" + runner::kEvaluationLogName;
  std::unique_ptr<runner::EvaluationLog> log;
  if (options.evaluation_log || options.resume) {
    if (const Status made = options.resume ? Status{} : runner::MakeResultsFolder(out_dir); !made) {
      Log().Error(made.error());
      return kExitFailed;
    }
    const runner::TuneLogHeader header =
        runner::MakeTuneLogHeader(scenarios, tune_options, plan, UPRIGHT_VERSION);
    Result<std::unique_ptr<runner::EvaluationLog>> opened =
        options.resume ? runner::EvaluationLog::Resume(log_path, header)
                       : runner::EvaluationLog::Start(log_path, header);
    if (!opened) {
      Log().Error(opened.error() + "\n(nothing was run)");
      return options.resume ? kExitBadInput : kExitFailed;
    }
    log = std::move(*opened);
    if (options.resume) {
      Log().Info(Printf("  resuming: %zu evaluation(s) in %s", log->logged(), log_path.c_str()));
    }
  }
  ProgressLine progress_line({.label = "upright tune"});
  runner::TuneProgressFn progress;
  if (Log().ShowsProgress()) {
    progress = [&progress_line, &plan](std::size_t done, std::size_t all,
                                       const std::vector<double>& best) {
      // "best lqr 16.5, pid 16.88": each controller's best objective so far, once it has one.
      std::string note;
      for (std::size_t c = 0; c < best.size(); ++c) {
        if (std::isnan(best[c])) continue;
        note += note.empty() ? "best " : ", ";
        note += plan.controllers[c].name;
        note += ' ';
        note += SignificantText(best[c], 4);
      }
      progress_line.Show(done, all, note);
    };
  }
  const runner::TuneResult result =
      runner::RunTune(scenarios, tune_options, plan, UPRIGHT_VERSION, progress, log.get());
  progress_line.Close();
  if (const std::string failed = log ? log->write_error() : ""; !failed.empty()) {
    Log().Warning(failed + "; a resume would replay only the evaluations before it");
  }
  if (const Status written = runner::WriteTuneResults(out_dir, result); !written) {
    Log().Error(written.error());
    return kExitFailed;
  }
  bool any_failed = false;
  for (const runner::ControllerTune& tune : result.controllers) {
    if (!tune.setup_error.empty()) {
      any_failed = true;
      Log().Out(LogLevel::kError, "  " + tune.controller + ": not tuned: " + tune.setup_error);
      continue;
    }
    const runner::TuneEvaluation& base = tune.evaluations.front();
    const runner::TuneEvaluation& best = tune.evaluations[tune.best];
    Log().Info(Printf("  %s: objective %s (default) -> %s (tuned), %d/%d runs survived; %s",
                      tune.controller.c_str(), SignificantText(base.score.objective, 6).c_str(),
                      SignificantText(best.score.objective, 6).c_str(), best.score.survived,
                      best.score.runs, runner::SettingsText(tune, best.values).c_str()));
    if (tune.held_out.size() == 2) {
      Log().Info(Printf("    on held-out seeds: %s (default) -> %s (tuned), %d/%d runs survived",
                        SignificantText(tune.held_out[0].score.objective, 6).c_str(),
                        SignificantText(tune.held_out[1].score.objective, 6).c_str(),
                        tune.held_out[1].score.survived, tune.held_out[1].score.runs));
    }
    if (!plan.pareto_metrics.empty()) {
      Log().Info(Printf("    Pareto front: %zu setting(s)", tune.pareto.size()));
    }
  }
  Log().Info(Printf("%zu run(s)%s; %s s on %d job(s)", result.runs,
                    result.played_runs == result.runs
                        ? ""
                        : Printf(" (%zu replayed from %s)", result.runs - result.played_runs,
                                 runner::kEvaluationLogName)
                              .c_str(),
                    FixedText(result.wall_s, 1).c_str(), result.jobs));
  Log().Info("tables: " + out_dir + "/tune.md (with each tuned <controller> element), " + out_dir +
             "/tune.csv" + (plan.pareto_metrics.empty() ? "" : ", " + out_dir + "/pareto.csv") +
             (log ? "; evaluation log " + log_path : ""));
  if (options.caution) Log().Caution(kCaution);
  return any_failed ? kExitFailed : kExitOk;
}

}  // namespace upright::cli
