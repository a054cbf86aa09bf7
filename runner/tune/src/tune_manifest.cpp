#include "tune_manifest.hpp"

#include "upright/runner/common/json_text.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/tables/scenario_info_json.hpp"

namespace upright::runner::internal {

std::string TuneManifestJson(const TuneResult& result) {
  const TunePlan& plan = result.plan;
  JsonText json;
  json.BeginObject();
  json.String("tool_version", result.tool_version);
  json.String("command", "tune");
  json.BeginArray("scenarios");
  for (std::size_t s = 0; s < result.scenarios.size(); ++s) {
    json.BeginObject();
    AppendScenarioInfoFields(&json, result.scenarios[s]);
    json.BeginArray("seeds");
    for (const std::uint64_t seed : result.scenarios[s].seeds) json.Unsigned("", seed);
    json.EndArray();
    json.BeginArray("held_out_seeds");
    if (s < plan.holdout_seeds.size()) {
      for (const std::uint64_t seed : plan.holdout_seeds[s]) json.Unsigned("", seed);
    }
    json.EndArray();
    json.EndObject();
  }
  json.EndArray();
  if (plan.tune_path.empty()) {
    json.Null("tune_file");
  } else {
    json.BeginObject("tune_file");
    json.String("path", plan.tune_path);
    const Result<std::string> hash = Sha256OfFile(plan.tune_path);
    if (hash) {
      json.String("sha256", *hash);
    } else {
      json.Null("sha256");
    }
    json.EndObject();
  }
  json.Unsigned("search_seed", result.seed);
  json.Integer("evaluations", plan.evaluations);
  json.Unsigned("runs_per_evaluation", plan.runs_per_evaluation);
  json.String("objective", plan.objective.Text());
  json.BeginArray("bounds");
  for (const MetricBound& bound : plan.objective.bounds) json.String("", bound.Text());
  json.EndArray();
  json.BeginArray("pareto_metrics");  // empty: the objective alone was searched
  for (const std::string& metric : plan.pareto_metrics) json.String("", metric);
  json.EndArray();
  json.BeginArray("controllers");
  for (const ControllerTune& tune : result.controllers) {
    json.BeginObject();
    json.String("name", tune.controller);
    json.BeginArray("knobs");
    for (const Knob& knob : tune.knobs) {
      json.BeginObject();
      json.String("setting", knob.setting);
      json.Number("lo", knob.lo);
      json.Number("hi", knob.hi);
      json.String("scale", ToString(knob.scale));
      json.EndObject();
    }
    json.EndArray();
    json.Unsigned("evaluations", tune.evaluations.size());
    if (tune.setup_error.empty()) {
      json.Unsigned("best_evaluation", tune.best);  // tune.csv's evaluation number
      json.Null("setup_error");
    } else {
      json.Null("best_evaluation");
      json.String("setup_error", tune.setup_error);
    }
    json.EndObject();
  }
  json.EndArray();
  json.Unsigned("runs", result.runs);
  json.Integer("jobs", result.jobs);
  json.Number("wall_s", result.wall_s);
  json.EndObject();
  return json.text();
}

}  // namespace upright::runner::internal
