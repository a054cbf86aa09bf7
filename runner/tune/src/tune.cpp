#include "upright/runner/tune/tune.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <filesystem>
#include <limits>
#include <mutex>
#include <sstream>
#include <utility>

#include "upright/base/number_text.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/parallel_for.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// "path:line: " for a tune file's line, "path: " for the file, "" without one.
std::string Where(const std::string& path, int line) {
  if (path.empty()) return "";
  return line > 0 ? path + ":" + std::to_string(line) + ": " : path + ": ";
}

// The value text a setting gets: the shortest that reads back as the value.
std::string ValueText(double value) { return ShortestText(value); }

// `entry` with each knob's setting set to its value (replaced in place, or appended).
ControllerEntry WithValues(ControllerEntry entry, const std::vector<Knob>& knobs,
                           const std::vector<double>& values) {
  for (std::size_t k = 0; k < knobs.size(); ++k) {
    const std::string text = ValueText(values[k]);
    auto it = std::find_if(entry.config.begin(), entry.config.end(),
                           [&](const auto& kv) { return kv.first == knobs[k].setting; });
    if (it != entry.config.end()) {
      it->second = text;
    } else {
      entry.config.emplace_back(knobs[k].setting, text);
    }
  }
  return entry;
}

// The scenario cut to the one controller, with `values` for its knobs (none: as written).
Scenario EvaluationScenario(const Scenario& scenario, std::size_t entry,
                            const std::vector<Knob>& knobs, const std::vector<double>& values) {
  Scenario one = scenario;
  ControllerEntry controller = scenario.controllers[entry];
  if (!values.empty()) controller = WithValues(std::move(controller), knobs, values);
  one.controllers = {std::move(controller)};
  one.baseline = 0;
  one.dispersions.clear();
  return one;
}

// XML attribute text with the five special characters escaped.
std::string XmlEscaped(const std::string& text) {
  std::string out;
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&apos;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

// `entry` as a scenario file's <controller> element.
std::string ControllerElement(const ControllerEntry& entry) {
  // A module file by its absolute path, so the element reads the same from any scenario folder.
  const std::string module =
      entry.builtin ? entry.module : std::filesystem::absolute(entry.module).string();
  std::string xml = "<controller name=\"" + XmlEscaped(entry.name) + "\" " +
                    (entry.builtin ? "builtin" : "file") + "=\"" + XmlEscaped(module) + "\"";
  if (entry.rate_hz > 0) xml += " rate_hz=\"" + ShortestText(entry.rate_hz) + "\"";
  if (entry.true_state) xml += " true_state=\"true\"";
  if (entry.config.empty()) return xml + "/>";
  xml += ">\n";
  for (const auto& [key, value] : entry.config) {
    xml += "  <setting key=\"" + XmlEscaped(key) + "\" value=\"" + XmlEscaped(value) + "\"/>\n";
  }
  return xml + "</controller>";
}

}  // namespace

const char* ToString(EvaluationStage stage) {
  switch (stage) {
    case EvaluationStage::kDefault:
      return "default";
    case EvaluationStage::kGlobal:
      return "global";
    case EvaluationStage::kLocal:
      return "local";
    case EvaluationStage::kHeldOut:
      return "held_out";
  }
  return "?";
}

Status TuneOptions::Validate() const {
  std::ostringstream why;
  if (budget_runs < 1) {
    why << "TuneOptions::budget_runs = " << budget_runs << ", must be >= 1";
  } else if (jobs < 0) {
    why << "TuneOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else if (holdout_seeds < 0 || holdout_seeds > 1000) {
    why << "TuneOptions::holdout_seeds = " << holdout_seeds << ", must be in [0, 1000]";
  } else {
    return {};
  }
  return Failure(why.str());
}

Result<TunePlan> PlanTune(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                          const TuneSpec& spec) {
  if (Status valid = options.Validate(); !valid) return Failure(valid.error());
  if (scenarios.empty()) return Failure("no scenario to tune on");
  if (Status valid = spec.objective.Validate(); !valid) {
    return Failure(Where(spec.path, 0) + valid.error());
  }
  TunePlan plan;
  plan.objective = spec.objective;
  plan.tune_path = spec.path;
  const Scenario& first = scenarios.front();
  std::vector<std::string> names = options.controllers;
  if (names.empty()) {
    for (const ControllerEntry& entry : first.controllers) names.push_back(entry.name);
  }
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (std::find(names.begin(), names.begin() + static_cast<long>(i), names[i]) !=
        names.begin() + static_cast<long>(i)) {
      return Failure("--controller " + names[i] + " is given twice");
    }
  }
  for (const std::string& name : names) {
    ControllerTunePlan controller;
    controller.name = name;
    for (const Scenario& scenario : scenarios) {
      const auto it =
          std::find_if(scenario.controllers.begin(), scenario.controllers.end(),
                       [&](const ControllerEntry& entry) { return entry.name == name; });
      if (it == scenario.controllers.end()) {
        std::string known;
        for (const ControllerEntry& entry : scenario.controllers) {
          known += (known.empty() ? "" : ", ") + entry.name;
        }
        return Failure(scenario.path + ": no controller named " + name +
                       " (its controllers: " + known +
                       "); a tuned controller must be in every "
                       "scenario");
      }
      controller.entry.push_back(static_cast<std::size_t>(it - scenario.controllers.begin()));
    }
    const ControllerEntry& entry = first.controllers[controller.entry.front()];
    controller.module = entry.module;
    controller.builtin = entry.builtin;
    if (const auto knobs = spec.knobs.find(name); knobs != spec.knobs.end()) {
      controller.knobs = knobs->second;
    } else if (entry.builtin) {
      controller.knobs = DefaultKnobs(entry.module);
    }
    if (controller.knobs.empty()) {
      return Failure(Where(first.path, entry.line) + "controller " + name +
                     " is a module file: it has no default knobs; name its settings to tune in "
                     "a tune file (--tune FILE, <controller name=\"" +
                     name + "\"><knob .../>)");
    }
    for (const Knob& knob : controller.knobs) {
      if (Status valid = knob.Validate(); !valid) {
        return Failure(Where(spec.path, knob.line) + valid.error());
      }
    }
    plan.controllers.push_back(std::move(controller));
  }
  for (const auto& [name, line] : spec.controller_lines) {
    if (std::find(names.begin(), names.end(), name) == names.end()) {
      return Failure(Where(spec.path, line) + "controller " + name +
                     " is not among the controllers tuned (" +
                     [&] {
                       std::string all;
                       for (const auto& n : names) all += (all.empty() ? "" : ", ") + n;
                       return all;
                     }() +
                     ")");
    }
  }
  for (const Scenario& scenario : scenarios) plan.runs_per_evaluation += scenario.seeds.size();
  plan.evaluations =
      static_cast<int>(static_cast<std::size_t>(options.budget_runs) / plan.runs_per_evaluation);
  // The default setting's evaluation and at least two of the search's.
  if (plan.evaluations < 3) {
    return Failure("--budget " + std::to_string(options.budget_runs) +
                   " runs is too small: one evaluation plays " +
                   std::to_string(plan.runs_per_evaluation) +
                   " run(s) (every scenario's seeds) and a tune needs at least 3 (the default "
                   "setting and two of the search): give --budget " +
                   std::to_string(3 * plan.runs_per_evaluation) + " or more");
  }
  for (const Scenario& scenario : scenarios) {
    std::vector<std::uint64_t> held_out;
    const std::uint64_t last = *std::max_element(scenario.seeds.begin(), scenario.seeds.end());
    for (int i = 1; i <= options.holdout_seeds; ++i) {
      held_out.push_back(last + static_cast<std::uint64_t>(i));
    }
    plan.holdout_runs += held_out.size();
    plan.holdout_seeds.push_back(std::move(held_out));
  }
  plan.max_runs = plan.controllers.size() *
                  (static_cast<std::size_t>(plan.evaluations) * plan.runs_per_evaluation +
                   2 * plan.holdout_runs);
  return plan;
}

Result<void, TuneStartFailure> CheckTuneStart(const std::vector<Scenario>& scenarios,
                                              const TunePlan& plan, const TuneOptions& options) {
  const ModuleSet modules(scenarios, options.module_dirs);
  for (const ControllerTunePlan& controller : plan.controllers) {
    for (std::size_t s = 0; s < scenarios.size(); ++s) {
      const Scenario& scenario = scenarios[s];
      const std::size_t entry = controller.entry[s];
      const LoadedModule& module = modules.Get(scenario.controllers[entry]);
      const std::string where = Where(scenario.path, scenario.controllers[entry].line) +
                                "controller " + controller.name + ": ";
      if (!module) return Failure(TuneStartFailure{true, where + module.error()});
      for (const double u : {0.0, 1.0}) {
        std::vector<double> values;
        for (const Knob& knob : controller.knobs) values.push_back(knob.ValueAt(u));
        const Scenario one = EvaluationScenario(scenario, entry, controller.knobs, values);
        if (Status start = CheckRunStart(one, 0, *module); !start) {
          std::string settings;
          for (std::size_t k = 0; k < values.size(); ++k) {
            settings += (settings.empty() ? "" : ", ") + controller.knobs[k].setting + " = " +
                        ValueText(values[k]);
          }
          return Failure(TuneStartFailure{
              false, where + "refuses the knobs' " + (u == 0 ? "lower" : "upper") + " ends (" +
                         settings + "): " + start.error() +
                         (plan.tune_path.empty() ? "" : " (knobs from " + plan.tune_path + ")")});
        }
      }
    }
  }
  return {};
}

std::string SettingsText(const ControllerTune& controller, const std::vector<double>& values) {
  if (values.empty()) return "as the scenario";
  std::string text;
  for (std::size_t k = 0; k < controller.knobs.size(); ++k) {
    text += (text.empty() ? "" : " ") + controller.knobs[k].setting + "=" + ValueText(values[k]);
  }
  return text;
}

namespace {

// The progress of a whole tune, shared by the controllers tuned side by side: runs done, runs
// still expected (which shrink when a search ends early), and each controller's best objective;
// the callback is called under its lock.
class TuneProgress {
 public:
  TuneProgress(std::size_t total, std::size_t controllers, const TuneProgressFn& progress)
      : total_(total), best_(controllers, kNaN), progress_(progress) {}

  void RunDone() {
    std::lock_guard<std::mutex> lock(mutex_);
    ++done_;
    if (progress_) progress_(done_, total_, best_);
  }
  // `runs` fewer runs are expected.
  void Shrink(std::size_t runs) {
    std::lock_guard<std::mutex> lock(mutex_);
    total_ -= runs;
  }
  // Controller c has scored `objective`.
  void Offer(std::size_t c, double objective) {
    std::lock_guard<std::mutex> lock(mutex_);
    if (std::isnan(best_[c]) || objective < best_[c]) best_[c] = objective;
  }

 private:
  std::mutex mutex_;
  std::size_t done_ = 0;
  std::size_t total_;
  std::vector<double> best_;
  const TuneProgressFn& progress_;
};

// One controller's evaluations: its scenarios cut to it with a setting in place, played on the
// seeds given with the runs of a batch in parallel, and scored.
class ControllerTuner {
 public:
  // `seeds`: per scenario, the seeds every evaluation plays; `index`: the controller's place in
  // the plan, for the progress.
  ControllerTuner(const std::vector<Scenario>& scenarios,
                  std::vector<std::vector<std::uint64_t>> seeds, const TunePlan& plan,
                  std::size_t index, const LoadedModule* const* modules, std::size_t jobs,
                  TuneProgress* progress)
      : scenarios_(scenarios),
        seeds_(std::move(seeds)),
        plan_(plan),
        index_(index),
        controller_(plan.controllers[index]),
        modules_(modules),
        jobs_(jobs),
        progress_(progress) {
    for (std::size_t s = 0; s < scenarios.size(); ++s) {
      durations_.insert(durations_.end(), seeds_[s].size(), scenarios[s].duration_s);
    }
  }

  // The scores do not count towards the controller's best in the progress (held-out seeds).
  void KeepOutOfTheBest() { offer_best_ = false; }

  // The runs of one evaluation.
  std::size_t RunsPerEvaluation() const { return durations_.size(); }

  // Plays each setting (empty: the scenarios' own) on every scenario and seed, all the runs of
  // the batch in parallel; their scores in order.
  std::vector<EvaluationScore> Evaluate(const std::vector<std::vector<double>>& settings) {
    // Scenario copies per setting and scenario, then one task per run.
    std::vector<Scenario> cut;
    for (const auto& values : settings) {
      for (std::size_t s = 0; s < scenarios_.size(); ++s) {
        cut.push_back(
            EvaluationScenario(scenarios_[s], controller_.entry[s], controller_.knobs, values));
      }
    }
    struct Task {
      std::size_t scenario = 0;  // into cut
      std::size_t module = 0;    // into modules_ (the scenario's index)
      std::uint64_t seed = 0;
    };
    std::vector<Task> tasks;
    for (std::size_t p = 0; p < settings.size(); ++p) {
      for (std::size_t s = 0; s < scenarios_.size(); ++s) {
        for (const std::uint64_t seed : seeds_[s]) {
          tasks.push_back({p * scenarios_.size() + s, s, seed});
        }
      }
    }
    RunOptions run_options;
    run_options.trace_rate_hz = 0;
    std::vector<RunResult> runs(tasks.size());
    ParallelFor(
        tasks.size(), jobs_,
        [&](std::size_t i) {
          const Task& t = tasks[i];
          runs[i] = RunOneSafely(cut[t.scenario], 0, t.seed, *modules_[t.module], run_options);
        },
        [&] { progress_->RunDone(); });
    std::vector<EvaluationScore> scores;
    const std::size_t per = RunsPerEvaluation();
    for (std::size_t p = 0; p < settings.size(); ++p) {
      scores.push_back(ScoreRuns(
          plan_.objective, std::span<const RunResult>(runs).subspan(p * per, per), durations_));
      if (offer_best_) progress_->Offer(index_, scores.back().objective);
    }
    return scores;
  }

 private:
  const std::vector<Scenario>& scenarios_;
  std::vector<std::vector<std::uint64_t>> seeds_;
  const TunePlan& plan_;
  std::size_t index_;
  const ControllerTunePlan& controller_;
  const LoadedModule* const* modules_;
  std::size_t jobs_;
  TuneProgress* progress_;
  std::vector<double> durations_;
  bool offer_best_ = true;
};

PointScore AsPointScore(const EvaluationScore& score) { return {score.objective, score.violation}; }

// Controller `index` of the plan tuned: its default setting, the search, the held-out replays.
ControllerTune TuneController(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                              const TunePlan& plan, std::size_t index, const ModuleSet& modules,
                              std::size_t jobs, TuneProgress* progress) {
  const ControllerTunePlan& controller = plan.controllers[index];
  ControllerTune tune;
  tune.controller = controller.name;
  tune.knobs = controller.knobs;
  const ControllerEntry& entry = scenarios.front().controllers[controller.entry.front()];
  for (const Knob& knob : controller.knobs) {
    const auto it = std::find_if(entry.config.begin(), entry.config.end(),
                                 [&](const auto& kv) { return kv.first == knob.setting; });
    tune.default_text.push_back(it == entry.config.end() ? "" : it->second);
  }
  std::vector<const LoadedModule*> per_scenario;
  for (std::size_t s = 0; s < scenarios.size(); ++s) {
    per_scenario.push_back(&modules.Get(scenarios[s].controllers[controller.entry[s]]));
    if (!*per_scenario.back() && tune.setup_error.empty()) {
      tune.setup_error = per_scenario.back()->error();
    }
  }
  if (!tune.setup_error.empty()) {
    progress->Shrink(static_cast<std::size_t>(plan.evaluations) * plan.runs_per_evaluation +
                     2 * plan.holdout_runs);
    return tune;
  }
  std::vector<std::vector<std::uint64_t>> search_seeds;
  for (const Scenario& scenario : scenarios) search_seeds.push_back(scenario.seeds);
  ControllerTuner tuner(scenarios, search_seeds, plan, index, per_scenario.data(), jobs, progress);
  // The default setting first: the yardstick of the tuned one.
  tune.evaluations.push_back(
      {EvaluationStage::kDefault, {}, tuner.Evaluate({std::vector<double>{}}).front()});

  SearchOptions search;
  search.dimensions = controller.knobs.size();
  search.constraints = plan.objective.bounds.size();
  search.evaluations = plan.evaluations - 1;
  search.seed = options.seed;
  const auto values_of = [&](const std::vector<double>& point) {
    std::vector<double> values;
    for (std::size_t k = 0; k < point.size(); ++k) {
      values.push_back(controller.knobs[k].ValueAt(point[k]));
    }
    return values;
  };
  const SearchResult found = Search(search, [&](const std::vector<std::vector<double>>& points) {
    std::vector<std::vector<double>> settings;
    for (const auto& point : points) settings.push_back(values_of(point));
    std::vector<PointScore> scores;
    const std::vector<EvaluationScore> evaluated = tuner.Evaluate(settings);
    for (std::size_t i = 0; i < points.size(); ++i) {
      tune.evaluations.push_back({EvaluationStage::kGlobal, settings[i], evaluated[i]});
      scores.push_back(AsPointScore(evaluated[i]));
    }
    return scores;
  });
  // The stage of each evaluation as the search recorded it (one evaluation per record).
  for (std::size_t i = 0; i < found.history.size(); ++i) {
    tune.evaluations[i + 1].stage = found.history[i].stage == SearchStage::kGlobal
                                        ? EvaluationStage::kGlobal
                                        : EvaluationStage::kLocal;
  }
  tune.best = 0;
  for (std::size_t i = 1; i < tune.evaluations.size(); ++i) {
    if (Better(AsPointScore(tune.evaluations[i].score),
               AsPointScore(tune.evaluations[tune.best].score))) {
      tune.best = i;
    }
  }
  const std::vector<double>& best_values = tune.evaluations[tune.best].values;
  tune.element = ControllerElement(
      best_values.empty() ? entry : WithValues(entry, controller.knobs, best_values));
  // Runs the budget planned but the search did not use (a polish that converged early).
  progress->Shrink(
      static_cast<std::size_t>(plan.evaluations - static_cast<int>(tune.evaluations.size())) *
      plan.runs_per_evaluation);
  if (plan.holdout_runs > 0) {
    // The default and the tuned setting again, on seeds the search never saw.
    ControllerTuner held_out(scenarios, plan.holdout_seeds, plan, index, per_scenario.data(), jobs,
                             progress);
    held_out.KeepOutOfTheBest();
    const std::vector<EvaluationScore> scores =
        held_out.Evaluate({std::vector<double>{}, best_values});
    tune.held_out.push_back({EvaluationStage::kHeldOut, {}, scores[0]});
    tune.held_out.push_back({EvaluationStage::kHeldOut, best_values, scores[1]});
  }
  return tune;
}

}  // namespace

TuneResult RunTune(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                   const TunePlan& plan, const std::string& tool_version,
                   const TuneProgressFn& progress) {
  const auto wall_start = std::chrono::steady_clock::now();
  TuneResult result;
  result.tool_version = tool_version;
  result.plan = plan;
  result.seed = options.seed;
  for (const Scenario& scenario : scenarios) {
    result.scenarios.push_back(DescribeScenario(scenario, scenario.seeds));
  }
  const std::size_t jobs = JobsWanted(options.jobs);
  result.jobs = static_cast<int>(jobs);
  const ModuleSet modules(scenarios, options.module_dirs);
  // Controllers side by side, each on its share of the jobs: a polish plays one setting at a
  // time, so one controller alone would leave cores idle. Each controller's result depends on
  // nothing the others do.
  const std::size_t n = plan.controllers.size();
  const std::size_t side_by_side = std::max<std::size_t>(1, std::min(jobs, n));
  const std::size_t jobs_each = (jobs + side_by_side - 1) / side_by_side;
  TuneProgress shared(plan.max_runs, n, progress);
  result.controllers.resize(n);
  ParallelFor(n, side_by_side,
              [&](std::size_t c) {
                result.controllers[c] =
                    TuneController(scenarios, options, plan, c, modules, jobs_each, &shared);
              },
              {});
  for (const ControllerTune& tune : result.controllers) {
    if (!tune.setup_error.empty()) continue;
    result.runs += tune.evaluations.size() * plan.runs_per_evaluation + 2 * plan.holdout_runs;
  }
  result.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return result;
}

}  // namespace upright::runner
