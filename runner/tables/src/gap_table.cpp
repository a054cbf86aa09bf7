#include "gap_table.hpp"

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"

namespace upright::runner::internal {
namespace {

// Why a run has no gap figures, when it has none and its twin left no message.
std::string TwinNote(const RunResult& run) {
  if (!run.gap.twin_message.empty()) return run.gap.twin_message;
  return run.gap.ran ? std::string() : std::string("not run: the run was not set up");
}

void AppendNumberField(std::string* csv, double value) {
  csv->push_back(',');
  AppendSignificant(csv, value, 6, NanAs::kEmpty);
}

}  // namespace

std::string GapCsv(const BatchResult& batch) {
  std::string csv =
      "scenario,controller,seed,peak_tilt_linear_deg,peak_tilt_plant_deg,peak_drift_linear_m,"
      "peak_drift_plant_m,tilt_diverge_s,drift_diverge_s,plant_status,not_modelled,"
      "tilt_band_deg,drift_band_m,twin_message\n";
  for (const RunResult& run : batch.runs) {
    const GapFigures& g = run.gap;
    AppendCsvField(&csv, run.scenario);
    csv += ',';
    AppendCsvField(&csv, run.controller);
    csv += ',';
    csv += std::to_string(run.seed);
    AppendNumberField(&csv, g.peak_tilt_linear_deg);
    AppendNumberField(&csv, g.peak_tilt_plant_deg);
    AppendNumberField(&csv, g.peak_drift_linear_m);
    AppendNumberField(&csv, g.peak_drift_plant_m);
    AppendNumberField(&csv, g.tilt_diverge_s);
    AppendNumberField(&csv, g.drift_diverge_s);
    csv += ',';
    csv += ToString(run.metrics.status);
    csv += ',';
    AppendCsvField(&csv, g.not_modelled);
    AppendNumberField(&csv, g.tilt_band_deg);
    AppendNumberField(&csv, g.drift_band_m);
    csv += ',';
    AppendCsvField(&csv, TwinNote(run));
    csv += '\n';
  }
  return csv;
}

std::string GapMarkdown(const std::vector<ScenarioGroup>& groups) {
  std::string md = "# Linear model against physics\n\n";
  md +=
      "Each run was also played on the linear model the controllers are designed on: the same "
      "module, rate, hold and drive reference (speed and yaw rate, drift taken from the same "
      "commanded path), the pushes' x part at their heights, ideal sensors, no contact or "
      "limits, for the whole scenario.\n"
      "A ratio near 1 with no time under \"parts at\" means the linear model predicted the run; "
      "a time is when tilt first differed by more than max(1°, 10 % of the plant's peak tilt), or "
      "drift by more than max(0.05 m, 10 % of the plant's peak drift).\n"
      "Gaps come from the scenario's \"not in the linear model\" line and from what the linear "
      "model never has: contact and wheel slip, motor voltage and current limits, motor and "
      "rolling friction, the coupling of turning and pitch (it is linearised at rest: a drive "
      "command reaches it, a turn does not lean it), sensor noise, quantisation and latency. It "
      "does carry the robot's constant sensor biases.\n"
      "A fall with a linear peak far above the plant's: a limit or the ground ended what the "
      "linear model rode out; a linear peak far below: something it lacks pushed the robot.\n";
  for (const ScenarioGroup& scenario : groups) {
    md += "\n## " + MarkdownCell(scenario.name) + "\n\n";
    if (scenario.info != nullptr) md += "Robot: " + MarkdownCell(scenario.info->model_name) + " · ";
    std::string not_modelled = "—";
    for (const ControllerGroup& controller : scenario.controllers) {
      for (const RunResult* run : controller.runs) {
        if (!run->gap.ran) continue;
        not_modelled = run->gap.not_modelled.empty() ? "nothing" : run->gap.not_modelled;
      }
    }
    md += "not in the linear model: " + MarkdownCell(not_modelled) + "\n\n";
    md +=
        "| controller | seed | plant | peak tilt linear / plant (deg) | ratio "
        "| peak drift linear / plant (m) | ratio | tilt parts at (s) | drift parts at (s) |\n"
        "|---|---:|---|---:|---:|---:|---:|---:|---:|\n";
    std::string notes;
    for (const ControllerGroup& controller : scenario.controllers) {
      for (const RunResult* run : controller.runs) {
        const GapFigures& g = run->gap;
        md += "| " + MarkdownCell(controller.name) + " | " + std::to_string(run->seed) + " | " +
              ToString(run->metrics.status) + " | " +
              ReadableText(g.peak_tilt_linear_deg, NanAs::kDash) + " / " +
              ReadableText(g.peak_tilt_plant_deg, NanAs::kDash) + " | " +
              ReadableText(g.peak_tilt_linear_deg / g.peak_tilt_plant_deg, NanAs::kDash) + " | " +
              ReadableText(g.peak_drift_linear_m, NanAs::kDash) + " / " +
              ReadableText(g.peak_drift_plant_m, NanAs::kDash) + " | " +
              ReadableText(g.peak_drift_linear_m / g.peak_drift_plant_m, NanAs::kDash) + " | " +
              ReadableText(g.tilt_diverge_s, NanAs::kDash) + " | " +
              ReadableText(g.drift_diverge_s, NanAs::kDash) + " |\n";
        const std::string note = TwinNote(*run);
        if (!note.empty()) {
          notes += "- " + MarkdownCell(controller.name) + ", seed " + std::to_string(run->seed) +
                   ", linear twin: " + MarkdownCell(note) + "\n";
        }
      }
    }
    md += "\n— : never parted (or no figure).\n";
    if (!notes.empty()) md += "\n" + notes;
  }
  return md;
}

}  // namespace upright::runner::internal
