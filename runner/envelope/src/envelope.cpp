#include "upright/runner/envelope/envelope.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <sstream>
#include <utility>

#include "parameter_unit.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/parallel_for.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/scenario/scenario_parameter.hpp"

namespace upright::runner {
namespace {

std::string Num(double value) { return SignificantText(value, 6); }

// The axis of `path` with its defaults resolved, the ends checked against the scenario.
Result<ParameterAxis> ResolveAxis(const Scenario& scenario, const std::string& path,
                                  std::optional<double> lo, std::optional<double> hi) {
  ParameterAxis axis;
  axis.path = path;
  axis.unit = internal::ParameterUnit(path);
  const Result<double> value = GetScenarioParameter(scenario, path);
  if (!value) return Failure(value.error());
  axis.scenario_value = *value;
  const double v = axis.scenario_value;
  if ((!lo || !hi) && v == 0) {
    return Failure(path +
                   ": the scenario's value is 0, so there is no default range (0.25 to 4 times " +
                   "it); give the range (--lo and --hi)");
  }
  axis.lo = lo ? *lo : std::min(0.25 * v, 4 * v);
  axis.hi = hi ? *hi : std::max(0.25 * v, 4 * v);
  if (!(axis.lo < axis.hi)) {
    return Failure(
        path + ": range start " + Num(axis.lo) + " must be below its end " + Num(axis.hi) +
        (lo && hi ? "" : " (defaults: 0.25 and 4 times the scenario's value " + Num(v) + ")"));
  }
  if (!std::isfinite(axis.hi - axis.lo)) {
    return Failure(path + ": the range from " + Num(axis.lo) + " to " + Num(axis.hi) +
                   " is wider than a number holds (its width is not finite); narrow it");
  }
  return axis;
}

// The most halvings a bisection may take: a double's 52 fraction bits.
constexpr double kFinestBisection = 4503599627370496.0;  // 2^52

// k + 2 probes for a bisection from width w to tol, k = ⌈log2(w / tol)⌉ (bisect.hpp).
std::size_t BracketedProbes(double width, double tol) {
  return 2 + static_cast<std::size_t>(std::max(0.0, std::ceil(std::log2(width / tol))));
}

// One grid value: lo … hi in grid − 1 equal steps, the last exactly hi; rounded for reading.
double GridValue(const ParameterAxis& axis, int i, int grid) {
  if (i == grid - 1) return axis.hi;
  return RoundToSignificant(
      axis.lo + (axis.hi - axis.lo) * static_cast<double>(i) / static_cast<double>(grid - 1), 12);
}

// What a probe run comes to, kept small.
struct RunVerdict {
  RunStatus status = RunStatus::kNotRun;
  std::string message;
};

// One run of one probe scenario, never throwing.
RunVerdict RunProbe(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                    const LoadedModule& loaded, const RunOptions& run_options) {
  const RunResult r = RunOneSafely(scenario, controller, seed, loaded, run_options);
  return {r.metrics.status, r.metrics.message};
}

// How the seeds of one probe went.
struct ProbeTally {
  int survived = 0;
  std::string failure;      // the first failing seed (seed order)
  std::string setup_error;  // the first seed that could not be run
};

ProbeTally Tally(const std::vector<std::uint64_t>& seeds, const RunVerdict* verdicts) {
  ProbeTally tally;
  for (std::size_t k = 0; k < seeds.size(); ++k) {
    const RunVerdict& v = verdicts[k];
    if (v.status == RunStatus::kOk) {
      ++tally.survived;
      continue;
    }
    if (v.status == RunStatus::kSetupFailed && tally.setup_error.empty()) {
      tally.setup_error = v.message;
    }
    if (tally.failure.empty()) {
      // "seed 2: fell at t = ...", or with the status named when the message does not start so.
      const std::string status = ToString(v.status);
      tally.failure = "seed " + std::to_string(seeds[k]) + ": " +
                      (v.message.rfind(status, 0) == 0 ? "" : status + ": ") + v.message;
    }
  }
  return tally;
}

// The scenario with the parameters set (`path2` empty: the first alone), or why it refuses a
// value.
Result<Scenario> ProbeScenario(const Scenario& scenario, const std::string& path, double value,
                               const std::string& path2, double value2) {
  Scenario probe = scenario;
  if (Status set = SetScenarioParameter(&probe, path, value); !set) return Failure(set.error());
  if (path2.empty()) return probe;
  if (Status set = SetScenarioParameter(&probe, path2, value2); !set) return Failure(set.error());
  return probe;
}

}  // namespace

Status EnvelopeOptions::Validate() const {
  std::ostringstream why;
  const auto finite_if_set = [](const std::optional<double>& v) { return !v || std::isfinite(*v); };
  if (param.empty()) {
    why << "EnvelopeOptions::param is empty, must name a scenario parameter";
  } else if (!finite_if_set(lo) || !finite_if_set(hi)) {
    why << "EnvelopeOptions::lo = " << lo.value_or(0) << ", hi = " << hi.value_or(0)
        << ", must be finite";
  } else if (lo && hi && !(*lo < *hi)) {
    why << "EnvelopeOptions::lo = " << *lo << ", must be < hi = " << *hi;
  } else if (tol && !(std::isfinite(*tol) && *tol > 0)) {
    why << "EnvelopeOptions::tol = " << *tol << ", must be > 0 and finite";
  } else if (param2.empty() && (lo2 || hi2)) {
    why << "EnvelopeOptions::lo2/hi2 are set without param2, must come with a second parameter";
  } else if (!param2.empty() && param2 == param) {
    why << "EnvelopeOptions::param2 = " << param2 << ", must differ from param";
  } else if (!finite_if_set(lo2) || !finite_if_set(hi2)) {
    why << "EnvelopeOptions::lo2 = " << lo2.value_or(0) << ", hi2 = " << hi2.value_or(0)
        << ", must be finite";
  } else if (lo2 && hi2 && !(*lo2 < *hi2)) {
    why << "EnvelopeOptions::lo2 = " << *lo2 << ", must be < hi2 = " << *hi2;
  } else if (grid < 2 || grid > 101) {
    why << "EnvelopeOptions::grid = " << grid << ", must be in [2, 101]";
  } else if (jobs < 0) {
    why << "EnvelopeOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else if (seed_count < 0) {
    why << "EnvelopeOptions::seed_count = " << seed_count
        << ", must be >= 0 (0: the scenario's seeds)";
  } else if (!(std::isfinite(settle_hold_s) && settle_hold_s > 0)) {
    why << "EnvelopeOptions::settle_hold_s = " << settle_hold_s << ", must be > 0 and finite";
  } else {
    return {};
  }
  return Failure(why.str());
}

Result<EnvelopePlan> PlanEnvelope(const Scenario& scenario, const EnvelopeOptions& options) {
  if (Status valid = options.Validate(); !valid) return Failure(valid.error());
  EnvelopePlan p;
  const Result<ParameterAxis> axis = ResolveAxis(scenario, options.param, options.lo, options.hi);
  if (!axis) return Failure(axis.error());
  p.axis = *axis;
  p.tol = options.tol ? *options.tol : (p.axis.hi - p.axis.lo) / 200;
  // Halving the range more than 52 times splits it finer than a double resolves across it.
  if (!((p.axis.hi - p.axis.lo) / p.tol <= kFinestBisection)) {
    return Failure("tolerance " + Num(p.tol) +
                   " is finer than a number resolves across the range " + Num(p.axis.lo) + " to " +
                   Num(p.axis.hi) + "; give at least " +
                   Num((p.axis.hi - p.axis.lo) / kFinestBisection));
  }
  if (!options.param2.empty()) {
    const Result<ParameterAxis> axis2 =
        ResolveAxis(scenario, options.param2, options.lo2, options.hi2);
    if (!axis2) return Failure(axis2.error());
    p.axis2 = *axis2;
    p.grid = options.grid;
  }
  // Both ends, and with a map its four corners, must make a valid scenario.
  for (const double value : {p.axis.lo, p.axis.hi}) {
    const Result<Scenario> end = ProbeScenario(scenario, p.axis.path, value, "", 0);
    if (!end) return Failure(end.error());
    if (p.axis2) {
      for (const double value2 : {p.axis2->lo, p.axis2->hi}) {
        const Result<Scenario> corner =
            ProbeScenario(scenario, p.axis.path, value, p.axis2->path, value2);
        if (!corner) return Failure(corner.error());
      }
    }
  }
  p.seeds = RunSeeds(scenario, options.seed_count);
  const std::size_t per_probe = scenario.controllers.size() * p.seeds.size();
  p.max_runs = per_probe * BracketedProbes(p.axis.hi - p.axis.lo, p.tol);
  if (p.axis2) p.max_runs += per_probe * static_cast<std::size_t>(p.grid * p.grid);
  return p;
}

bool EnvelopeResult::any_setup_failed() const {
  for (const auto& c : controllers) {
    if (!c.setup_error.empty()) return true;
  }
  for (const auto& m : maps) {
    if (!m.setup_error.empty()) return true;
  }
  return false;
}

namespace {

// Runs done against the runs still expected, for the progress callback: each controller's share
// shrinks to what it used once its bisection ends, and the map's runs come after.
class ProgressCount {
 public:
  ProgressCount(std::size_t controllers, std::size_t per_controller, std::size_t map_runs,
                const ProgressFn& progress)
      : expected_(controllers, per_controller), map_runs_(map_runs), progress_(progress) {
    Recount();
  }
  // Controller c makes `runs` in all; or no more than `runs`.
  void Set(std::size_t c, std::size_t runs) { expected_[c] = runs; }
  void Cap(std::size_t c, std::size_t runs) { expected_[c] = std::min(expected_[c], runs); }
  void Recount() {
    total_ = map_runs_;
    for (const std::size_t e : expected_) total_ += e;
  }
  // From here on the only runs left are `remaining` more.
  void ExpectOnly(std::size_t remaining) { total_ = done_ + remaining; }
  void OneDone() {
    ++done_;
    if (progress_) progress_(done_, total_);
  }

 private:
  std::vector<std::size_t> expected_;
  std::size_t map_runs_ = 0, done_ = 0, total_ = 0;
  const ProgressFn& progress_;
};

// What both phases of an envelope share: the scenario, its plan, each controller's module and the
// run settings of a probe.
struct EnvelopeWork {
  const Scenario& scenario;
  const EnvelopePlan& plan;
  std::vector<const LoadedModule*> modules;  // per controller, loaded once
  RunOptions run_options;
  std::size_t jobs = 1;
  ProgressCount& progress;

  std::size_t Seeds() const { return plan.seeds.size(); }
  std::size_t Controllers() const { return scenario.controllers.size(); }
};

// Every controller's bisection in phase 1: the bisection itself, whether it still probes, and
// the runs it has made.
struct SideBySide {
  std::vector<Bisection> bisections;
  std::vector<bool> active;
  std::vector<std::size_t> used;  // runs made per controller
};

// One probe of a round: a controller at a value, with the scenario set to it.
struct Probe {
  std::size_t controller = 0;
  double value = 0;
  Scenario scenario;
};

// Each controller's envelope, begun: one whose module did not load is set aside with its reason.
SideBySide StartBisections(EnvelopeWork& work, EnvelopeResult* result) {
  const Scenario& scenario = work.scenario;
  const EnvelopePlan& plan = work.plan;
  const std::size_t n_controllers = work.Controllers();
  SideBySide state;
  state.active.assign(n_controllers, true);
  state.used.assign(n_controllers, 0);
  for (std::size_t c = 0; c < n_controllers; ++c) {
    ControllerEnvelope envelope;
    envelope.controller = scenario.controllers[c].name;
    envelope.baseline = c == scenario.baseline;
    if (!*work.modules[c]) {
      envelope.setup_error = work.modules[c]->error();
      state.active[c] = false;
      work.progress.Set(c, 0);
    }
    result->controllers.push_back(envelope);
    state.bisections.emplace_back(plan.axis.lo, plan.axis.hi, plan.tol);
  }
  work.progress.Recount();
  return state;
}

// The probes of the next round, every active controller's pending values; a controller with a
// value the scenario refuses stops there, with that reason and none of its probes this round.
std::vector<Probe> NextRound(EnvelopeWork& work, SideBySide& state, EnvelopeResult* result) {
  std::vector<Probe> probes;
  for (std::size_t c = 0; c < work.Controllers(); ++c) {
    if (!state.active[c]) continue;
    for (const double value : state.bisections[c].Pending()) {
      Result<Scenario> probed = ProbeScenario(work.scenario, work.plan.axis.path, value, "", 0);
      if (!probed) {
        result->controllers[c].setup_error = probed.error();
        state.active[c] = false;
        break;
      }
      probes.push_back({c, value, std::move(*probed)});
    }
    if (!state.active[c]) {
      probes.erase(std::remove_if(probes.begin(), probes.end(),
                                  [c](const Probe& p) { return p.controller == c; }),
                   probes.end());
      work.progress.Set(c, state.used[c]);
    }
  }
  work.progress.Recount();
  return probes;
}

// Every probe of the round on every seed, in parallel; verdicts probe by probe, seed by seed.
std::vector<RunVerdict> RunRound(EnvelopeWork& work, const std::vector<Probe>& probes) {
  const std::vector<std::uint64_t>& seeds = work.plan.seeds;
  const std::size_t n_seeds = work.Seeds();
  std::vector<RunVerdict> verdicts(probes.size() * n_seeds);
  ParallelFor(
      verdicts.size(), work.jobs,
      [&](std::size_t i) {
        const Probe& probe = probes[i / n_seeds];
        verdicts[i] = RunProbe(probe.scenario, probe.controller, seeds[i % n_seeds],
                               *work.modules[probe.controller], work.run_options);
      },
      [&] { work.progress.OneDone(); });
  return verdicts;
}

// The round's verdicts back to each bisection, in the order its values were pending; a
// controller whose probe could not be run stops with that reason.
void RecordRound(EnvelopeWork& work, const std::vector<Probe>& probes,
                 const std::vector<RunVerdict>& verdicts, SideBySide& state,
                 EnvelopeResult* result) {
  const std::size_t n_seeds = work.Seeds();
  std::vector<std::vector<bool>> survived(work.Controllers());
  for (std::size_t p = 0; p < probes.size(); ++p) {
    const std::size_t c = probes[p].controller;
    state.used[c] += n_seeds;
    const ProbeTally tally = Tally(work.plan.seeds, &verdicts[p * n_seeds]);
    ControllerEnvelope& envelope = result->controllers[c];
    envelope.probes.push_back(
        {probes[p].value, tally.survived, static_cast<int>(n_seeds), tally.failure});
    if (!state.active[c]) continue;  // an earlier probe of this round could not run
    if (!tally.setup_error.empty()) {
      envelope.setup_error = tally.setup_error;
      state.active[c] = false;
      continue;
    }
    survived[c].push_back(tally.survived == static_cast<int>(n_seeds));
  }
  for (std::size_t c = 0; c < work.Controllers(); ++c) {
    if (!state.active[c]) {
      work.progress.Cap(c, state.used[c]);
      continue;
    }
    if (survived[c].empty()) continue;
    state.bisections[c].Record(survived[c]);
    if (state.bisections[c].done()) {
      state.active[c] = false;
      work.progress.Set(c, state.used[c]);
    }
  }
  work.progress.Recount();
}

// Each controller's answer: its bisection's, or for one cut short only the probes it made; the
// runs made added to result->runs.
void FinishBisections(const SideBySide& state, EnvelopeResult* result) {
  for (std::size_t c = 0; c < result->controllers.size(); ++c) {
    ControllerEnvelope& envelope = result->controllers[c];
    envelope.bisect = state.bisections[c].result();
    if (!envelope.setup_error.empty()) {
      // Cut short: no bisection answer, only the probes made.
      envelope.bisect = BisectResult{};
      envelope.bisect.probes = static_cast<int>(envelope.probes.size());
    } else if (envelope.bisect.outcome == BisectOutcome::kBracketed) {
      for (const ProbeRecord& probe : envelope.probes) {
        if (probe.value == envelope.bisect.first_failing_value) envelope.failure = probe.failure;
      }
    }
    result->runs += state.used[c];
  }
}

// Phase 1: every controller's bisection side by side, one round of probes at a time, into
// result->controllers; adds the runs made to result->runs.
void BisectSideBySide(EnvelopeWork& work, EnvelopeResult* result) {
  SideBySide state = StartBisections(work, result);
  for (;;) {
    const std::vector<Probe> probes = NextRound(work, state, result);
    if (probes.empty()) break;
    const std::vector<RunVerdict> verdicts = RunRound(work, probes);
    RecordRound(work, probes, verdicts, state, result);
  }
  FinishBisections(state, result);
}

// Phase 2: the grid of both parameters, every controller at every point, into result->maps; adds
// the runs made to result->runs.
void MapGrid(EnvelopeWork& work, EnvelopeResult* result) {
  const EnvelopePlan& plan = work.plan;
  const std::vector<std::uint64_t>& seeds = plan.seeds;
  const std::size_t n_seeds = work.Seeds();
  const std::size_t n_controllers = work.Controllers();
  const ParameterAxis& a1 = plan.axis;
  const ParameterAxis& a2 = *plan.axis2;
  const std::size_t grid = static_cast<std::size_t>(plan.grid);
  const std::size_t n_points = grid * grid;
  // One scenario per point, shared by the controllers; a point the scenario refuses is kept
  // with its reason.
  std::vector<Scenario> points(n_points);
  std::vector<std::string> refused(n_points);
  for (std::size_t i2 = 0; i2 < grid; ++i2) {
    for (std::size_t i1 = 0; i1 < grid; ++i1) {
      const std::size_t k = i2 * grid + i1;
      Result<Scenario> point =
          ProbeScenario(work.scenario, a1.path, GridValue(a1, static_cast<int>(i1), plan.grid),
                        a2.path, GridValue(a2, static_cast<int>(i2), plan.grid));
      if (point) {
        points[k] = std::move(*point);
      } else {
        refused[k] = point.error();
      }
    }
  }
  // Tasks: controller by controller, point by point, seed by seed; only what can run.
  struct MapTask {
    std::size_t controller = 0, point = 0, seed = 0;
  };
  std::vector<MapTask> tasks;
  for (std::size_t c = 0; c < n_controllers; ++c) {
    if (!*work.modules[c]) continue;
    for (std::size_t k = 0; k < n_points; ++k) {
      if (!refused[k].empty()) continue;
      for (std::size_t s = 0; s < n_seeds; ++s) tasks.push_back({c, k, s});
    }
  }
  work.progress.ExpectOnly(tasks.size());
  std::vector<RunVerdict> verdicts(tasks.size());
  ParallelFor(
      tasks.size(), work.jobs,
      [&](std::size_t i) {
        const MapTask& t = tasks[i];
        verdicts[i] = RunProbe(points[t.point], t.controller, seeds[t.seed],
                               *work.modules[t.controller], work.run_options);
      },
      [&] { work.progress.OneDone(); });
  result->runs += tasks.size();

  std::size_t next_task = 0;
  for (std::size_t c = 0; c < n_controllers; ++c) {
    ControllerMap map;
    map.controller = work.scenario.controllers[c].name;
    if (!*work.modules[c]) map.setup_error = work.modules[c]->error();
    for (std::size_t k = 0; k < n_points; ++k) {
      MapPoint point;
      point.value = GridValue(a1, static_cast<int>(k % grid), plan.grid);
      point.value2 = GridValue(a2, static_cast<int>(k / grid), plan.grid);
      point.seeds = static_cast<int>(n_seeds);
      if (!*work.modules[c]) {
        point.setup_failed = true;
      } else if (!refused[k].empty()) {
        point.setup_failed = true;
        if (map.setup_error.empty()) map.setup_error = refused[k];
      } else {
        const ProbeTally tally = Tally(seeds, &verdicts[next_task]);
        next_task += n_seeds;
        point.seeds_survived = tally.survived;
        if (!tally.setup_error.empty()) {
          point.setup_failed = true;
          if (map.setup_error.empty()) map.setup_error = tally.setup_error;
        }
      }
      map.points.push_back(point);
    }
    result->maps.push_back(std::move(map));
  }
}

}  // namespace

EnvelopeResult RunEnvelope(const Scenario& scenario, const EnvelopeOptions& options,
                           const EnvelopePlan& plan, const std::string& tool_version,
                           const ProgressFn& progress) {
  const auto wall_start = std::chrono::steady_clock::now();
  EnvelopeResult result;
  result.tool_version = tool_version;
  result.scenario = DescribeScenario(scenario, plan.seeds);
  result.plan = plan;
  const std::size_t jobs = JobsWanted(options.jobs);
  result.jobs = static_cast<int>(jobs);

  const std::size_t n_seeds = plan.seeds.size();
  const std::size_t n_controllers = scenario.controllers.size();
  const std::size_t map_runs =
      plan.axis2 ? n_controllers * n_seeds * static_cast<std::size_t>(plan.grid * plan.grid) : 0;
  ProgressCount count(n_controllers,
                      n_seeds * BracketedProbes(plan.axis.hi - plan.axis.lo, plan.tol), map_runs,
                      progress);

  // Every controller's module, loaded once per distinct module before any thread starts.
  const ModuleSet module_set({&scenario, 1}, options.module_dirs);
  EnvelopeWork work{scenario, plan, {}, {}, jobs, count};
  for (const ControllerEntry& entry : scenario.controllers) {
    work.modules.push_back(&module_set.Get(entry));
  }
  work.run_options.trace_rate_hz = 0;
  work.run_options.stop_when_settled = true;
  work.run_options.settle_hold_s = options.settle_hold_s;

  BisectSideBySide(work, &result);
  if (plan.axis2) MapGrid(work, &result);

  result.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return result;
}

}  // namespace upright::runner
