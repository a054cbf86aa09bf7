#include "manifest_info.hpp"

#include <cstdint>
#include <filesystem>

#include "json_reader.hpp"
#include "read_file.hpp"

namespace upright::runner::internal {
namespace {

using Json = nlohmann::ordered_json;

// The member `key` of an object when it is of the kind `is` tests; nullptr otherwise.
const Json* Member(const Json& object, const char* key, bool (Json::*is)() const noexcept) {
  const auto found = object.find(key);
  return found != object.end() && ((*found).*is)() ? &*found : nullptr;
}

// A member's string value, or "" when it is absent or not a string.
std::string StringOf(const Json& object, const char* key) {
  const Json* value = Member(object, key, &Json::is_string);
  return value != nullptr ? value->get<std::string>() : "";
}

ManifestScenario ScenarioFrom(const Json& s) {
  ManifestScenario out;
  out.name = StringOf(s, "name");
  out.path = StringOf(s, "path");
  out.sha256 = StringOf(s, "sha256");
  out.model_name = StringOf(s, "model_name");
  out.model_path = StringOf(s, "model_path");
  out.model_sha256 = StringOf(s, "model_sha256");
  out.baseline = StringOf(s, "baseline");
  return out;
}

// A parameter or spread object: its strings by name, every number as text.
ManifestParameter ParameterFrom(const Json& p) {
  ManifestParameter out;
  out.path = p.contains("path") ? StringOf(p, "path") : StringOf(p, "param");
  out.unit = StringOf(p, "unit");
  out.kind = StringOf(p, "kind");
  for (const auto& [name, value] : p.items()) {
    if (!value.is_number()) continue;
    if (name == "scenario_value") {
      out.scenario_value = value.get<double>();
      out.has_scenario_value = true;
    }
    out.numbers.emplace_back(name, NumberText(value));
  }
  return out;
}

// Each object of the array `key`, in order.
template <class Visit>
void ForEachObject(const Json& root, const char* key, Visit visit) {
  if (const Json* list = Member(root, key, &Json::is_array)) {
    for (const Json& item : *list) {
      if (item.is_object()) visit(item);
    }
  }
}

}  // namespace

Result<ManifestInfo> ReadManifest(const std::string& dir) {
  const std::string path = (std::filesystem::path(dir) / "manifest.json").string();
  std::error_code ec;
  if (!std::filesystem::is_regular_file(path, ec)) return ManifestInfo{};
  const Result<std::string> text = ReadWholeFile(path);
  if (!text) return Failure(text.error());
  return ParseManifest(*text, path);
}

Result<ManifestInfo> ParseManifest(std::string_view text, const std::string& path) {
  ManifestInfo info;
  const Result<Json> parsed = ParseJson(text, path);
  if (!parsed) return Failure(parsed.error());
  const Json& root = *parsed;
  if (!root.is_object()) return Failure(path + ":1: the manifest is not a JSON object");
  info.present = true;
  info.tool_version = StringOf(root, "tool_version");
  info.command = StringOf(root, "command");
  ForEachObject(root, "scenarios",
                [&](const Json& s) { info.scenarios.push_back(ScenarioFrom(s)); });
  if (const Json* s = Member(root, "scenario", &Json::is_object)) {
    info.scenarios.push_back(ScenarioFrom(*s));
  }
  ForEachObject(root, "runs", [&](const Json& r) {
    ManifestRun run;
    run.scenario = StringOf(r, "scenario");
    run.controller = StringOf(r, "controller");
    // A seed is read as the integer it is, so one beyond 2^53 survives exactly.
    if (const Json* seed = Member(r, "seed", &Json::is_number_unsigned)) {
      run.seed = seed->get<std::uint64_t>();
    }
    run.trace = StringOf(r, "trace");
    info.runs.push_back(run);
  });
  for (const char* key : {"parameter", "parameter2"}) {
    if (const Json* p = Member(root, key, &Json::is_object)) {
      info.parameters.push_back(ParameterFrom(*p));
    }
  }
  ForEachObject(root, "dispersions",
                [&](const Json& d) { info.dispersions.push_back(ParameterFrom(d)); });
  if (const Json* seed = Member(root, "seed", &Json::is_number)) {
    info.sweep_seed = NumberText(*seed);
  }
  if (const Json* n = Member(root, "samples", &Json::is_number)) info.samples = NumberText(*n);
  if (const Json* m = Member(root, "model", &Json::is_object)) {
    ManifestScenario model;
    model.model_name = StringOf(*m, "name");
    model.model_path = StringOf(*m, "path");
    model.model_sha256 = StringOf(*m, "sha256");
    info.scenarios.push_back(model);
  }
  ManifestDesign& d = info.design;
  d.input = StringOf(root, "input");
  const auto number = [](const Json& object, const char* key, double* out) {
    if (const Json* n = Member(object, key, &Json::is_number)) *out = n->get<double>();
  };
  number(root, "rate_hz", &d.rate_hz);
  number(root, "latency_s", &d.latency_s);
  number(root, "fall_rate_1_s", &d.fall_rate_1_s);
  number(root, "ground_contact_forward_deg", &d.ground_contact_forward_deg);
  number(root, "ground_contact_backward_deg", &d.ground_contact_backward_deg);
  number(root, "current_limit_A", &d.current_limit_A);
  if (const Json* push = Member(root, "design_push", &Json::is_object)) {
    number(*push, "impulse_Ns", &d.push_impulse_Ns);
    number(*push, "duration_s", &d.push_duration_s);
    number(*push, "peak_N", &d.push_peak_N);
    number(*push, "height_m", &d.push_height_m);
  }
  if (info.command == "tune") {
    ManifestTune& t = info.tune;
    t.objective = StringOf(root, "objective");
    if (const Json* bounds = Member(root, "bounds", &Json::is_array)) {
      for (const Json& b : *bounds) {
        if (b.is_string()) t.bounds.push_back(b.get<std::string>());
      }
    }
    for (const auto& [key, out] :
         {std::pair{"search_seed", &t.search_seed}, std::pair{"evaluations", &t.evaluations},
          std::pair{"runs_per_evaluation", &t.runs_per_evaluation}}) {
      if (const Json* n = Member(root, key, &Json::is_number)) *out = NumberText(*n);
    }
    ForEachObject(root, "controllers", [&](const Json& c) {
      const Json* best = Member(c, "best_evaluation", &Json::is_number_unsigned);
      t.best_evaluation.emplace_back(
          StringOf(c, "name"),
          best != nullptr ? static_cast<long>(best->get<std::uint64_t>()) : -1L);
    });
  }
  return info;
}

}  // namespace upright::runner::internal
