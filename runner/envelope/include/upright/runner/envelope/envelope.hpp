// Survival envelopes: a scenario and a parameter path in; for each controller the hardest value
// of the parameter it survives on every seed, found by bisection, and optionally a survival map
// over a grid of two parameters. Probes are the scenario's own runs with the value set.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/envelope/bisect.hpp"
#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

struct EnvelopeOptions {
  std::string param;  // parameter path (scenario_parameter.hpp), e.g. timeline/push[1].peak_N
  // The range, in the parameter's file unit; absent: lo = 0.25 × and hi = 4 × the scenario's
  // own value (the two swapped for a negative value).
  std::optional<double> lo;
  std::optional<double> hi;
  std::optional<double> tol;  // bisection tolerance; absent: (hi − lo) / 200
  // Not empty: also a survival map over param × param2 on a grid × grid lattice, ends included.
  std::string param2;
  std::optional<double> lo2;  // as lo and hi, for param2
  std::optional<double> hi2;
  int grid = 9;        // map points per axis, >= 2
  int jobs = 0;        // worker threads; 0: one per hardware thread
  int seed_count = 0;  // > 0: seeds 1..seed_count instead of the scenario's own
  // How long a probe's robot must stand still before its run ends as survived (RunOptions).
  double settle_hold_s = 1.0;
  // Where built-in modules are looked for; empty: host::DefaultModuleDirs().
  std::vector<std::string> module_dirs;
  // Fine when the options hold together on their own (the scenario is checked by PlanEnvelope);
  // otherwise the broken rule, naming the field and its value.
  Status Validate() const;
};

// One varied parameter with its range resolved.
struct ParameterAxis {
  std::string path;
  std::string unit;  // from the attribute's suffix: "N", "m/s", "deg"; "" for a pure number
  double scenario_value = 0;  // the scenario's own value
  double lo = 0, hi = 0;
};

// What an envelope will do: the options with every default filled in from the scenario.
struct EnvelopePlan {
  ParameterAxis axis;
  double tol = 0;
  std::optional<ParameterAxis> axis2;  // set: a survival map too
  int grid = 0;                        // map points per axis (with axis2)
  std::vector<std::uint64_t> seeds;
  // Runs the envelope makes at most (bisections to the tolerance, and the map).
  std::size_t max_runs = 0;
};

// Resolves the defaults and checks them against `scenario`: the parameters exist, the range is
// not empty, and both ends (every map corner) give a valid scenario. Otherwise why not
// ("timeline/push[1].peak_N: the scenario's value is 0; give --lo and --hi").
Result<EnvelopePlan> PlanEnvelope(const Scenario& scenario, const EnvelopeOptions& options);

// One probe of a bisection: the value and how its seeds went.
struct ProbeRecord {
  double value = 0;
  int seeds_survived = 0;
  int seeds = 0;
  std::string failure;  // the first failing seed: "seed 2: fell: ..."; "" when all survived
};

struct ControllerEnvelope {
  std::string controller;
  bool baseline = false;
  BisectResult bisect;
  std::vector<ProbeRecord> probes;  // in the order probed
  // Why the controller could not be run (module not loaded, settings refused, a probe value the
  // scenario refuses); not empty: `bisect` gives no answer, only the number of probes made.
  std::string setup_error;
  // kBracketed: the first failing seed at first_failing_value ("seed 1: fell: ...").
  std::string failure;
};

// One point of a survival map.
struct MapPoint {
  double value = 0, value2 = 0;
  int seeds_survived = 0;
  int seeds = 0;
  bool setup_failed = false;  // the point could not be run (see the controller's setup_error)
  bool survived() const { return !setup_failed && seeds_survived == seeds; }
};

struct ControllerMap {
  std::string controller;
  std::string setup_error;  // the first point's reason when any point could not be run
  // grid × grid points: row by row along param2 (ascending), each row along param (ascending).
  std::vector<MapPoint> points;
};

struct EnvelopeResult {
  std::string tool_version;
  ScenarioInfo scenario;  // for the manifest: files, hashes, controllers, seeds
  EnvelopePlan plan;
  std::vector<ControllerEnvelope> controllers;  // scenario order
  std::vector<ControllerMap> maps;              // scenario order; empty without axis2
  int jobs = 1;
  std::size_t runs = 0;  // runs made
  double wall_s = 0;     // manifest only
  // True when some controller or map point could not be run.
  bool any_setup_failed() const;
};

// Runs the plan: every controller's bisection side by side (the probes of one round, and the
// seeds of each probe, in parallel on options.jobs threads), then the map's points all in
// parallel. Probes run with no trace and end early once settled (RunOptions::stop_when_settled).
// Results do not depend on the number of jobs. `progress` gets runs done and the runs still
// expected in all (which shrinks when a bisection ends early).
EnvelopeResult RunEnvelope(const Scenario& scenario, const EnvelopeOptions& options,
                           const EnvelopePlan& plan, const std::string& tool_version,
                           const ProgressFn& progress);

}  // namespace upright::runner
