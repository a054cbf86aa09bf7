#include "upright/runner/tune/tune.hpp"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cmath>
#include <iterator>
#include <limits>
#include <mutex>
#include <span>
#include <utility>

#include "evaluation_setting.hpp"
#include "pareto_tune.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/parallel_for.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/tune/evaluation_log.hpp"

namespace upright::runner {

using internal::ControllerElement;
using internal::EvaluationScenario;
using internal::ValueText;
using internal::WithValues;

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

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
    ++played_;
    if (progress_) progress_(done_, total_, best_);
  }
  // `runs` runs replayed from the evaluation log: done without being played.
  void Replayed(std::size_t runs) {
    std::lock_guard<std::mutex> lock(mutex_);
    done_ += runs;
    if (progress_) progress_(done_, total_, best_);
  }
  // The runs played so far.
  std::size_t played() {
    std::lock_guard<std::mutex> lock(mutex_);
    return played_;
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
  std::size_t played_ = 0;
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
  // Evaluations are looked up in `log` and those played appended to it.
  void LogTo(EvaluationLog* log) { log_ = log; }

  // The runs of one evaluation.
  std::size_t RunsPerEvaluation() const { return durations_.size(); }

  // Scores each setting at `stage`: as the evaluation log holds it (the same index, the same
  // values bit for bit), or played and then appended to the log. With `kept`, every setting is
  // played (its runs are wanted) and handed back as Play hands them; one the log holds already
  // is not appended again.
  std::vector<EvaluationScore> Evaluate(const std::vector<std::vector<double>>& settings,
                                        EvaluationStage stage,
                                        std::vector<std::vector<RunResult>>* kept = nullptr) {
    const std::size_t first = next_index_;
    next_index_ += settings.size();
    std::vector<EvaluationScore> scores(settings.size());
    std::vector<std::size_t> played;  // into settings
    std::vector<std::vector<double>> to_play;
    for (std::size_t p = 0; p < settings.size(); ++p) {
      const EvaluationScore* logged =
          log_ == nullptr ? nullptr : log_->Find(controller_.name, stage, first + p, settings[p]);
      if (logged == nullptr || kept != nullptr) {
        played.push_back(p);
        to_play.push_back(settings[p]);
        continue;
      }
      scores[p] = *logged;
      progress_->Replayed(RunsPerEvaluation());
      if (offer_best_) progress_->Offer(index_, logged->objective);
    }
    if (to_play.empty()) return scores;
    const std::vector<EvaluationScore> fresh = Play(
        to_play,
        [&](std::size_t q, const EvaluationScore& score) {
          const std::size_t i = first + played[q];
          if (log_ != nullptr && log_->Find(controller_.name, stage, i, to_play[q]) == nullptr) {
            log_->Append({controller_.name, stage, i, to_play[q], score});
          }
        },
        kept);
    for (std::size_t q = 0; q < played.size(); ++q) scores[played[q]] = fresh[q];
    return scores;
  }

 private:
  // Plays each setting (empty: the scenarios' own) on every scenario and seed, all the runs of
  // the batch in parallel; their scores in order. `scored(p, score)` is called on the thread
  // that played setting p's last run, as soon as its runs are all done. With `kept`, the runs are
  // traced (at the runner's default rate) and handed back there, per setting, scenario by
  // scenario, seed by seed.
  std::vector<EvaluationScore> Play(
      const std::vector<std::vector<double>>& settings,
      const std::function<void(std::size_t, const EvaluationScore&)>& scored,
      std::vector<std::vector<RunResult>>* kept) {
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
    if (kept == nullptr) run_options.trace_rate_hz = 0;
    std::vector<RunResult> runs(tasks.size());
    const std::size_t per = RunsPerEvaluation();
    std::vector<EvaluationScore> scores(settings.size());
    std::vector<std::atomic<std::size_t>> left(settings.size());  // runs still to play
    for (std::atomic<std::size_t>& l : left) l = per;
    ParallelFor(
        tasks.size(), jobs_,
        [&](std::size_t i) {
          const Task& t = tasks[i];
          runs[i] = RunOneSafely(cut[t.scenario], 0, t.seed, *modules_[t.module], run_options);
          const std::size_t p = i / per;
          if (left[p].fetch_sub(1) == 1) {
            scores[p] =
                ScoreRuns(plan_.objective, std::span<const RunResult>(runs).subspan(p * per, per),
                          durations_);
            if (scored) scored(p, scores[p]);
          }
        },
        [&] { progress_->RunDone(); });
    for (const EvaluationScore& score : scores) {
      if (offer_best_) progress_->Offer(index_, score.objective);
    }
    if (kept != nullptr) {
      kept->clear();
      for (std::size_t p = 0; p < settings.size(); ++p) {
        kept->emplace_back(std::make_move_iterator(runs.begin() + p * per),
                           std::make_move_iterator(runs.begin() + (p + 1) * per));
      }
    }
    return scores;
  }

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
  EvaluationLog* log_ = nullptr;
  std::size_t next_index_ = 0;  // the next evaluation's index in the log
};

PointScore AsPointScore(const EvaluationScore& score) { return {score.objective, score.violation}; }

// Controller `index` of the plan tuned: its default setting, the search, the held-out replays.
ControllerTune TuneController(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                              const TunePlan& plan, std::size_t index, const ModuleSet& modules,
                              std::size_t jobs, TuneProgress* progress, EvaluationLog* log) {
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
  tuner.LogTo(log);
  // The default setting first: the yardstick of the tuned one.
  tune.evaluations.push_back(
      {EvaluationStage::kDefault,
       {},
       tuner.Evaluate({std::vector<double>{}}, EvaluationStage::kDefault).front(),
       {}});

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
  // Plays a batch of points; each evaluation kept (stage set below).
  const internal::EvaluateBatch evaluate = [&](const std::vector<std::vector<double>>& points) {
    std::vector<std::vector<double>> settings;
    for (const auto& point : points) settings.push_back(values_of(point));
    // The search's first batch is its space-filling start.
    const std::vector<EvaluationScore> evaluated =
        tuner.Evaluate(settings, tune.evaluations.size() == 1 ? EvaluationStage::kGlobal
                                                              : EvaluationStage::kLocal);
    for (std::size_t i = 0; i < points.size(); ++i) {
      tune.evaluations.push_back({EvaluationStage::kGlobal, settings[i], evaluated[i], {}});
    }
    return evaluated;
  };
  std::vector<SearchStage> stages;
  if (plan.pareto_metrics.empty()) {
    const SearchResult found = Search(search, [&](const std::vector<std::vector<double>>& points) {
      std::vector<PointScore> scores;
      for (const EvaluationScore& score : evaluate(points)) scores.push_back(AsPointScore(score));
      return scores;
    });
    for (const SearchRecord& record : found.history) stages.push_back(record.stage);
  } else {
    stages = internal::SearchPareto(search, plan.pareto_metrics, evaluate);
    tune.pareto = internal::ParetoFrontOf(tune.evaluations, plan.pareto_metrics);
  }
  // The stage of each evaluation as the search recorded it (one evaluation per record).
  for (std::size_t i = 0; i < stages.size(); ++i) {
    tune.evaluations[i + 1].stage =
        stages[i] == SearchStage::kGlobal ? EvaluationStage::kGlobal : EvaluationStage::kLocal;
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
    // Played even on a resume: their runs, traces and all, make the ranking folders.
    held_out.LogTo(log);
    std::vector<std::vector<RunResult>> runs;
    const std::vector<EvaluationScore> scores =
        held_out.Evaluate({std::vector<double>{}, best_values}, EvaluationStage::kHeldOut, &runs);
    tune.held_out.push_back({EvaluationStage::kHeldOut, {}, scores[0], std::move(runs[0])});
    tune.held_out.push_back(
        {EvaluationStage::kHeldOut, best_values, scores[1], std::move(runs[1])});
  }
  return tune;
}

}  // namespace

TuneResult RunTune(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                   const TunePlan& plan, const std::string& tool_version,
                   const TuneProgressFn& progress, EvaluationLog* log) {
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
                    TuneController(scenarios, options, plan, c, modules, jobs_each, &shared, log);
              },
              {});
  for (const ControllerTune& tune : result.controllers) {
    if (!tune.setup_error.empty()) continue;
    result.runs += tune.evaluations.size() * plan.runs_per_evaluation + 2 * plan.holdout_runs;
  }
  result.played_runs = shared.played();
  result.wall_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
  return result;
}

}  // namespace upright::runner
