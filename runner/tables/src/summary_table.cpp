#include "summary_table.hpp"

#include <array>
#include <cmath>

#include "upright/runner/metric_columns.hpp"
#include "upright/runner/text_format.hpp"

namespace upright::runner::internal {
namespace {

// The figures summary.md shows (a readable subset), each scaled for display.
struct ReadableColumn {
  const char* label;
  double RunMetrics::*field;
  double scale;
  bool settle;  // a settling time: "*" marks a mean over only the runs that settled
};

constexpr std::array<ReadableColumn, 11> kReadableColumns = {{
    {"max tilt (deg)", &RunMetrics::max_tilt_deg, 1, false},
    {"max drift (m)", &RunMetrics::max_drift_m, 1, false},
    {"tilt settle (s)", &RunMetrics::tilt_settle_s, 1, true},
    {"drift settle (s)", &RunMetrics::drift_settle_s, 1, true},
    {"tilt overshoot (%)", &RunMetrics::tilt_overshoot_pct, 1, false},
    {"RMS tilt (deg)", &RunMetrics::rms_tilt_deg, 1, false},
    {"effort (N²m²s)", &RunMetrics::effort_Nm2s, 1, false},
    {"peak current (A)", &RunMetrics::peak_current_A, 1, false},
    {"saturation (%)", &RunMetrics::saturation_frac, 100, false},
    {"max slip ratio", &RunMetrics::max_slip_ratio, 1, false},
    {"energy (J)", &RunMetrics::energy_J, 1, false},
}};

std::string JoinSeeds(const std::vector<std::uint64_t>& seeds) {
  std::string text;
  for (std::size_t i = 0; i < seeds.size(); ++i) {
    if (i > 0) text += ", ";
    text += std::to_string(seeds[i]);
  }
  return text;
}

}  // namespace

std::string SummaryCsv(const BatchResult& batch) {
  std::string csv = "scenario,controller,seed,baseline";
  AppendOutcomeHeader(&csv);
  csv += '\n';
  for (const RunResult& run : batch.runs) {
    AppendCsvField(&csv, run.scenario);
    csv += ',';
    AppendCsvField(&csv, run.controller);
    csv += ',';
    csv += std::to_string(run.seed);
    csv += ',';
    csv += CsvBool(run.baseline);
    AppendOutcomeCells(&csv, run);
    csv += '\n';
  }
  return csv;
}

std::string SummaryMarkdown(const std::vector<ScenarioGroup>& groups) {
  std::string md = "# Summary\n\n";
  md +=
      "Per scenario and controller: how many runs survived, and the mean over seeds of each "
      "figure (runs that were played; a fall counts with the figures it reached).\n";
  for (const ScenarioGroup& scenario : groups) {
    md += "\n## " + MarkdownCell(scenario.name) + "\n\n";
    if (scenario.info != nullptr) md += "Robot: " + MarkdownCell(scenario.info->model_name) + " · ";
    const ControllerGroup* baseline = scenario.Baseline();
    md += "baseline: " + (baseline != nullptr ? MarkdownCell(baseline->name) : std::string("none"));
    md += " · seeds: " + JoinSeeds(scenario.seeds) + "\n\n";

    md += "| controller | survived |";
    for (const ReadableColumn& column : kReadableColumns) AppendMarkdownCell(&md, column.label);
    md += "\n|---|---|";
    for (std::size_t i = 0; i < kReadableColumns.size(); ++i) md += "---:|";
    md += '\n';
    bool any_partly_settled = false;
    for (const ControllerGroup& controller : scenario.controllers) {
      md += "| " + MarkdownCell(controller.name) + (controller.baseline ? " (baseline)" : "");
      md += " | " + std::to_string(controller.survived) + "/" + std::to_string(controller.size());
      for (const ReadableColumn& column : kReadableColumns) {
        int count = 0;
        const double mean = MeanOver(controller.runs, column.field, &count);
        md += " | " + FormatReadable(mean * column.scale);
        if (column.settle && count > 0 && count < controller.played) {
          md += '*';
          any_partly_settled = true;
        }
      }
      md += " |\n";
    }
    md +=
        "\n— : no run gave a value (nothing to settle from, never settled within the window, or "
        "no run was played).";
    if (any_partly_settled) {
      md +=
          " * : mean over the runs that settled; the others did not settle within the window "
          "or fell.";
    }
    md += '\n';
  }
  return md;
}

}  // namespace upright::runner::internal
