// What a tune will do: the options, the controllers with their knobs, the evaluations the budget
// buys and the held-out seeds, checked against the scenarios and the tune file before anything
// runs.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/tune/knob.hpp"
#include "upright/runner/tune/objective.hpp"
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
  // Empty, or two metric column names (pareto.hpp, both minimised): each controller's Pareto
  // front of their means is searched instead of the objective alone (pareto_search.hpp).
  std::vector<std::string> pareto_metrics;
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
  // TuneOptions::pareto_metrics: empty, or the two metrics whose front is searched (both
  // minimised, each the mean over the runs).
  std::vector<std::string> pareto_metrics;
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

}  // namespace upright::runner
