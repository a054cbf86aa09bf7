// `upright tune SCENARIO...`: the options as parsed from the command line in; each controller's
// knobs searched on the physics plant, tune.csv and tune.md, and a line per controller out.
#pragma once

#include <CLI/CLI.hpp>
#include <cstdint>
#include <string>
#include <vector>

namespace upright::cli {

struct TuneCommandOptions {
  std::vector<std::string> scenario_paths;  // the scenario files
  std::vector<std::string> controllers;     // --controller (repeatable); empty: all of the first
  int budget_runs = 240;                    // --budget: runs per controller
  std::uint64_t seed = 1;                   // --seed: the search's start
  int jobs = 0;                             // --jobs: runs in parallel; 0: one per core
  int holdout_seeds = 3;                    // --holdout: held-out seeds per scenario
  int seed_count = 0;  // --seeds: the search's seeds 1..N in every scenario; 0: each file's own
  std::string out_dir;                      // --out; "": results/<first scenario name>-tune
  std::string tune_path;                    // --tune: a tune file; "": the default knobs
  std::vector<std::string> pareto_metrics;  // --pareto A,B: two metrics' front; empty: none
  bool caution = true;  // close with the safety line (demo prints it once itself)
  bool resume = false;  // --resume: replay the evaluations in the results folder's tune.log
  bool evaluation_log = true;  // write tune.log as the tune goes (the demo, never resumed: no)
};

// Adds the `tune` subcommand to `app`, parsing into `options`; returns it.
CLI::App* AddTuneCommand(CLI::App* app, TuneCommandOptions* options);

// Runs the tune and writes tune.csv and tune.md. Exit 2 on bad input (an invalid scenario or tune
// file, an unknown controller, a budget too small, knob ends a module refuses), 1 when a module
// will not load (in both cases nothing runs) or the results cannot be written. With --resume, a
// missing log, one of another tune or with a line that does not read is bad input.
int RunTune(const TuneCommandOptions& options);

}  // namespace upright::cli
