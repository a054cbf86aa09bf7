#include "manifest_json.hpp"

#include "upright/runner/common/json_text.hpp"
#include "upright/runner/tables/scenario_info_json.hpp"

namespace upright::runner::internal {
namespace {

// {"messages": [{"time_s", "level", "text"}, ...], "dropped": N}; time_s null before the first
// control tick (create).
void AppendModuleLog(JsonText* json, std::string_view key, const ModuleLog& log) {
  json->BeginObject(key);
  json->BeginArray("messages");
  for (const ModuleMessage& message : log.messages) {
    json->BeginObject();
    json->Number("time_s", message.time_s);
    json->String("level", ToString(message.level));
    json->String("text", message.text);
    json->EndObject();
  }
  json->EndArray();
  json->Integer("dropped", log.dropped);
  json->EndObject();
}

}  // namespace

std::string ManifestJson(const BatchResult& batch, const std::vector<std::string>& trace_files) {
  JsonText json;
  json.BeginObject();
  json.String("tool_version", batch.tool_version);
  json.Integer("jobs", batch.jobs);
  json.Number("trace_rate_hz", batch.trace_rate_hz);
  json.Bool("linear_twin", batch.linear_twin);
  json.Number("wall_s", batch.wall_s);
  json.BeginArray("scenarios");
  for (const ScenarioInfo& info : batch.scenarios) {
    json.BeginObject();
    AppendScenarioInfoFields(&json, info);
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
    AppendModuleLog(&json, "module_log", run.module_log);
    if (batch.linear_twin) {
      AppendModuleLog(&json, "twin_module_log", run.twin_module_log);
    } else {
      json.Null("twin_module_log");
    }
    json.EndObject();
  }
  json.EndArray();
  json.EndObject();
  return json.text();
}

}  // namespace upright::runner::internal
