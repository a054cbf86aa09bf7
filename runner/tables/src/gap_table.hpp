// gap.csv and gap.md: per run, the linear twin against the physics plant — peak tilt and drift on
// each, the first times they part by more than the band, the plant's status and the scenario's
// events the linear model leaves out. Written only for a batch that ran the twin.
#pragma once

#include <string>
#include <vector>

#include "batch_groups.hpp"
#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner::internal {

// One row per run in batch order: scenario, controller, seed, peak_tilt_linear_deg,
// peak_tilt_plant_deg, peak_drift_linear_m, peak_drift_plant_m, tilt_diverge_s, drift_diverge_s
// (empty when never), plant_status, not_modelled, tilt_band_deg, drift_band_m, twin_message.
std::string GapCsv(const BatchResult& batch);

// A table per scenario (one row per controller and seed) after a short note on reading it.
std::string GapMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
