// A scenario's entry in a manifest: a ScenarioInfo in, its fields as JSON out (name, scenario and
// model files with their SHA-256, step, duration, controllers, baseline), the same in every
// results folder's manifest.json.
#pragma once

#include "upright/runner/common/json_text.hpp"
#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner {

// Writes name, path, sha256, model_name, model_path, model_sha256, dt_s, duration_s, controllers
// and baseline, in that order, into the object `json` has open. The seeds are left to the caller,
// as each manifest places them differently.
void AppendScenarioInfoFields(JsonText* json, const ScenarioInfo& info);

}  // namespace upright::runner
