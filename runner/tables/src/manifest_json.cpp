#include "manifest_json.hpp"

#include "json_text.hpp"

namespace upright::runner::internal {

std::string ManifestJson(const BatchResult& batch, const std::vector<std::string>& trace_files) {
  JsonText json;
  json.BeginObject();
  json.String("tool_version", batch.tool_version);
  json.Integer("jobs", batch.jobs);
  json.Number("trace_rate_hz", batch.trace_rate_hz);
  json.Number("wall_s", batch.wall_s);
  json.BeginArray("scenarios");
  for (const ScenarioInfo& info : batch.scenarios) {
    json.BeginObject();
    json.String("name", info.name);
    json.String("path", info.path);
    json.String("sha256", info.sha256);
    json.String("model_name", info.model_name);
    json.String("model_path", info.model_path);
    json.String("model_sha256", info.model_sha256);
    json.Number("dt_s", info.dt_s);
    json.Number("duration_s", info.duration_s);
    json.BeginArray("controllers");
    for (const std::string& controller : info.controllers) json.String({}, controller);
    json.EndArray();
    json.String("baseline", info.baseline);
    json.BeginArray("seeds");
    for (std::uint64_t seed : info.seeds) json.Unsigned({}, seed);
    json.EndArray();
    json.EndObject();
  }
  json.EndArray();
  json.BeginArray("runs");
  for (std::size_t i = 0; i < batch.runs.size(); ++i) {
    const RunResult& run = batch.runs[i];
    json.BeginObject();
    json.String("scenario", run.scenario);
    json.String("controller", run.controller);
    json.Unsigned("seed", run.seed);
    json.String("status", ToString(run.metrics.status));
    json.Integer("steps", run.steps);
    json.Number("wall_s", run.wall_s);
    if (i < trace_files.size() && !trace_files[i].empty()) {
      json.String("trace", trace_files[i]);
    } else {
      json.Null("trace");
    }
    json.EndObject();
  }
  json.EndArray();
  json.EndObject();
  return json.text();
}

}  // namespace upright::runner::internal
