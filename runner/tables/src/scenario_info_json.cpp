#include "upright/runner/tables/scenario_info_json.hpp"

namespace upright::runner {

void AppendScenarioInfoFields(JsonText* json, const ScenarioInfo& info) {
  json->String("name", info.name);
  json->String("path", info.path);
  json->String("sha256", info.sha256);
  json->String("model_name", info.model_name);
  json->String("model_path", info.model_path);
  json->String("model_sha256", info.model_sha256);
  json->Number("dt_s", info.dt_s);
  json->Number("duration_s", info.duration_s);
  json->BeginArray("controllers");
  for (const std::string& controller : info.controllers) json->String({}, controller);
  json->EndArray();
  json->String("baseline", info.baseline);
}

}  // namespace upright::runner
