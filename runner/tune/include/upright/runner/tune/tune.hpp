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
#include "upright/runner/tune/tune_plan.hpp"

namespace upright::runner {

enum class EvaluationStage { kDefault, kGlobal, kLocal, kHeldOut };
const char* ToString(EvaluationStage stage);  // "default", "global", "local", "held_out"

struct TuneEvaluation {
  EvaluationStage stage = EvaluationStage::kDefault;
  std::vector<double> values;  // per knob; empty for the default setting (the scenarios' own)
  EvaluationScore score;
  // The held-out evaluations' runs with their traces (scenario by scenario, seed by seed), for
  // the ranking folders; empty for the search's evaluations.
  std::vector<RunResult> runs;
};

struct ControllerTune {
  std::string controller;
  std::vector<Knob> knobs;
  // Per knob, the setting's value in the first scenario as written there; "" when it is left to
  // the module's default.
  std::vector<std::string> default_text;
  std::vector<TuneEvaluation> evaluations;  // the default first, then in the order searched
  std::size_t best = 0;                     // index into evaluations (Better, default included)
  // With TunePlan::pareto_metrics: the evaluations on the front (NonDominated, the default
  // included), as indices into `evaluations` sorted by the first metric ascending; else empty.
  std::vector<std::size_t> pareto;
  // With held-out seeds: the default setting and the tuned one played on them (stage kHeldOut).
  std::vector<TuneEvaluation> held_out;
  std::string setup_error;  // the module could not be loaded: nothing searched
  // The first scenario's <controller> element with the best setting's values in place.
  std::string element;
};

class EvaluationLog;  // evaluation_log.hpp

struct TuneResult {
  std::string tool_version;
  std::vector<ScenarioInfo> scenarios;
  TunePlan plan;
  std::uint64_t seed = 1;
  std::vector<ControllerTune> controllers;  // plan order
  int jobs = 1;
  std::size_t runs = 0;
  std::size_t played_runs = 0;  // of those, the runs played here (not replayed from a log)
  double wall_s = 0;            // the console only; never in a file
};

// Called after each run with runs done, runs expected and each controller's best objective so
// far, in plan order (NaN before its first evaluation), one call at a time.
using TuneProgressFn =
    std::function<void(std::size_t done, std::size_t total, const std::vector<double>& best)>;

// Runs the plan: the controllers side by side (at most one per job), each on its share of the
// jobs; each controller's result depends neither on the jobs nor on the other controllers.
// With a `log`, an evaluation found there is not played again (its runs count as done in the
// progress) and each one played is appended to it.
TuneResult RunTune(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                   const TunePlan& plan, const std::string& tool_version,
                   const TuneProgressFn& progress, EvaluationLog* log = nullptr);

// The settings text of `controller` with `values` for its knobs: "max_tilt_deg=3.2 max_drift_m=1".
std::string SettingsText(const ControllerTune& controller, const std::vector<double>& values);

}  // namespace upright::runner
