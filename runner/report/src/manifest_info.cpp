#include "manifest_info.hpp"

#include <charconv>
#include <filesystem>

#include "json_reader.hpp"
#include "read_file.hpp"

namespace upright::runner::report {
namespace {

ManifestScenario ScenarioFrom(const JsonValue& s) {
  ManifestScenario out;
  out.name = s.StringOr("name", "");
  out.path = s.StringOr("path", "");
  out.sha256 = s.StringOr("sha256", "");
  out.model_name = s.StringOr("model_name", "");
  out.model_path = s.StringOr("model_path", "");
  out.model_sha256 = s.StringOr("model_sha256", "");
  out.baseline = s.StringOr("baseline", "");
  return out;
}

// A parameter or spread object: its strings by name, every number kept as written.
ManifestParameter ParameterFrom(const JsonValue& p) {
  ManifestParameter out;
  out.path = p.Find("path") != nullptr ? p.StringOr("path", "") : p.StringOr("param", "");
  out.unit = p.StringOr("unit", "");
  out.kind = p.StringOr("kind", "");
  for (const auto& [name, value] : p.members) {
    if (value.kind != JsonKind::kNumber) continue;
    if (name == "scenario_value") {
      out.scenario_value = value.number;
      out.has_scenario_value = true;
    }
    out.numbers.emplace_back(name, value.text);
  }
  return out;
}

}  // namespace

Result<ManifestInfo> ReadManifest(const std::string& dir) {
  ManifestInfo info;
  const std::string path = (std::filesystem::path(dir) / "manifest.json").string();
  std::error_code ec;
  if (!std::filesystem::is_regular_file(path, ec)) return info;
  const Result<std::string> text = ReadWholeFile(path);
  if (!text) return Failure(text.error());
  const Result<JsonValue> parsed = ParseJson(*text, path);
  if (!parsed) return Failure(parsed.error());
  const JsonValue& root = *parsed;
  if (root.kind != JsonKind::kObject)
    return Failure(path + ":1: the manifest is not a JSON object");
  info.present = true;
  info.tool_version = root.StringOr("tool_version", "");
  info.command = root.StringOr("command", "");
  if (const JsonValue* list = root.Find("scenarios"); list && list->kind == JsonKind::kArray) {
    for (const JsonValue& s : list->items) {
      if (s.kind == JsonKind::kObject) info.scenarios.push_back(ScenarioFrom(s));
    }
  }
  if (const JsonValue* s = root.Find("scenario"); s && s->kind == JsonKind::kObject) {
    info.scenarios.push_back(ScenarioFrom(*s));
  }
  if (const JsonValue* list = root.Find("runs"); list && list->kind == JsonKind::kArray) {
    for (const JsonValue& r : list->items) {
      if (r.kind != JsonKind::kObject) continue;
      ManifestRun run;
      run.scenario = r.StringOr("scenario", "");
      run.controller = r.StringOr("controller", "");
      if (const JsonValue* seed = r.Find("seed"); seed && seed->kind == JsonKind::kNumber) {
        std::from_chars(seed->text.data(), seed->text.data() + seed->text.size(), run.seed);
      }
      run.trace = r.StringOr("trace", "");
      info.runs.push_back(run);
    }
  }
  for (const char* key : {"parameter", "parameter2"}) {
    if (const JsonValue* p = root.Find(key); p && p->kind == JsonKind::kObject) {
      info.parameters.push_back(ParameterFrom(*p));
    }
  }
  if (const JsonValue* list = root.Find("dispersions"); list && list->kind == JsonKind::kArray) {
    for (const JsonValue& d : list->items) {
      if (d.kind == JsonKind::kObject) info.dispersions.push_back(ParameterFrom(d));
    }
  }
  if (const JsonValue* seed = root.Find("seed"); seed && seed->kind == JsonKind::kNumber) {
    info.sweep_seed = seed->text;
  }
  if (const JsonValue* n = root.Find("samples"); n && n->kind == JsonKind::kNumber) {
    info.samples = n->text;
  }
  return info;
}

}  // namespace upright::runner::report
