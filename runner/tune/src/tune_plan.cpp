#include "upright/runner/tune/tune_plan.hpp"

#include <algorithm>
#include <sstream>
#include <utility>

#include "evaluation_setting.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/tune/pareto.hpp"

namespace upright::runner {

using internal::EvaluationScenario;
using internal::ValueText;
using internal::Where;

Status TuneOptions::Validate() const {
  std::ostringstream why;
  if (budget_runs < 1) {
    why << "TuneOptions::budget_runs = " << budget_runs << ", must be >= 1";
  } else if (jobs < 0) {
    why << "TuneOptions::jobs = " << jobs << ", must be >= 0 (0: one per core)";
  } else if (holdout_seeds < 0 || holdout_seeds > 1000) {
    why << "TuneOptions::holdout_seeds = " << holdout_seeds << ", must be in [0, 1000]";
  } else {
    return ValidateParetoMetrics(pareto_metrics);
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
  plan.pareto_metrics = options.pareto_metrics;
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

}  // namespace upright::runner
