// `upright tune`: each controller's knobs searched, on the physics plant, to minimise an objective
// over scenarios × seeds within a budget of runs. An evaluation plays one setting on every
// scenario and seed through the runner's own runs (a run ends at a fall); the evaluations of the
// search's start, and the runs of every evaluation, go in parallel; the result does not depend on
// the number of jobs.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/tune/knob.hpp"
#include "upright/runner/tune/objective.hpp"
#include "upright/runner/tune/search.hpp"
#include "upright/runner/tune/tune_file.hpp"

namespace upright::runner {

struct TuneOptions {
  // The controllers to tune, by name; empty: every controller of the first scenario. Each must
  // be in every scenario.
  std::vector<std::string> controllers;
  int budget_runs = 240;   // runs per controller, the default setting's evaluation included
  std::uint64_t seed = 1;  // the search's start
  int jobs = 0;            // worker threads; 0: one per hardware thread
  // Per scenario, seeds the search never sees (the N after the largest of the scenario's own)
  // on which the default and the tuned settings are played again once the search is done; 0:
  // none. Their runs come on top of the budget.
  int holdout_seeds = 3;
  // Where built-in modules are looked for; empty: host::DefaultModuleDirs().
  std::vector<std::string> module_dirs;
  // Fine when valid; otherwise the broken rule, naming the field and value.
  Status Validate() const;
};

// One controller's part of a tune.
struct ControllerTunePlan {
  std::string name;
  std::string module;  // built-in name or module file, as in the first scenario
  bool builtin = true;
  std::vector<Knob> knobs;
  std::vector<std::size_t> entry;  // per scenario, the controller's index in it
};

struct TunePlan {
  std::vector<ControllerTunePlan> controllers;
  Objective objective;
  std::string tune_path;                // "" without a tune file
  std::size_t runs_per_evaluation = 0;  // Σ over scenarios of their seeds
  int evaluations = 0;                  // per controller, the default setting's included
  // Per scenario, the held-out seeds (TuneOptions::holdout_seeds); empty lists without them.
  std::vector<std::vector<std::uint64_t>> holdout_seeds;
  std::size_t holdout_runs = 0;  // per held-out evaluation: Σ over scenarios
  std::size_t max_runs = 0;      // in all, the held-out runs included
};

// Checks the options, the spec and the scenarios together and fills in the defaults; otherwise
// why not, as "path:line: reason" where a file holds the problem.
Result<TunePlan> PlanTune(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                          const TuneSpec& spec);

// Why a tune cannot start: a module that will not load, or knob ends a module refuses.
struct TuneStartFailure {
  bool module_missing = false;  // the module would not load (rather than refusing settings)
  std::string message;          // "path:line: controller lqr: ..."
};

// Whether every controller's module loads and accepts both ends of its knobs' ranges (every knob
// at lo, then every knob at hi) in every scenario; nothing is stepped.
Result<void, TuneStartFailure> CheckTuneStart(const std::vector<Scenario>& scenarios,
                                              const TunePlan& plan, const TuneOptions& options);

enum class EvaluationStage { kDefault, kGlobal, kLocal, kHeldOut };
const char* ToString(EvaluationStage stage);  // "default", "global", "local", "held_out"

struct TuneEvaluation {
  EvaluationStage stage = EvaluationStage::kDefault;
  std::vector<double> values;  // per knob; empty for the default setting (the scenarios' own)
  EvaluationScore score;
};

struct ControllerTune {
  std::string controller;
  std::vector<Knob> knobs;
  // Per knob, the setting's value in the first scenario as written there; "" when it is left to
  // the module's default.
  std::vector<std::string> default_text;
  std::vector<TuneEvaluation> evaluations;  // the default first, then in the order searched
  std::size_t best = 0;                     // index into evaluations (Better, default included)
  // With held-out seeds: the default setting and the tuned one played on them (stage kHeldOut).
  std::vector<TuneEvaluation> held_out;
  std::string setup_error;  // the module could not be loaded: nothing searched
  // The first scenario's <controller> element with the best setting's values in place.
  std::string element;
};

struct TuneResult {
  std::string tool_version;
  std::vector<ScenarioInfo> scenarios;
  TunePlan plan;
  std::uint64_t seed = 1;
  std::vector<ControllerTune> controllers;  // plan order
  int jobs = 1;
  std::size_t runs = 0;
  double wall_s = 0;  // the console only; never in a file
};

// Called after each run with runs done, runs expected and each controller's best objective so
// far, in plan order (NaN before its first evaluation), one call at a time.
using TuneProgressFn =
    std::function<void(std::size_t done, std::size_t total, const std::vector<double>& best)>;

// Runs the plan: the controllers side by side (at most one per job), each on its share of the
// jobs; each controller's result depends neither on the jobs nor on the other controllers.
TuneResult RunTune(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                   const TunePlan& plan, const std::string& tool_version,
                   const TuneProgressFn& progress);

// The settings text of `controller` with `values` for its knobs: "max_tilt_deg=3.2 max_drift_m=1".
std::string SettingsText(const ControllerTune& controller, const std::vector<double>& values);

}  // namespace upright::runner
