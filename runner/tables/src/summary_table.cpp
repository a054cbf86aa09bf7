#include "summary_table.hpp"

#include <cmath>

#include "spread_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner::internal {
namespace {

std::string JoinSeeds(const std::vector<std::uint64_t>& seeds) {
  std::string text;
  for (std::size_t i = 0; i < seeds.size(); ++i) {
    if (i > 0) text += ", ";
    text += std::to_string(seeds[i]);
  }
  return text;
}

// "2/3", with "(1 not played)" when some runs never took a step.
std::string SurvivedText(const ControllerGroup& controller) {
  std::string text = std::to_string(controller.survived) + "/" + std::to_string(controller.size());
  const int unplayed = controller.size() - controller.played;
  if (unplayed > 0) text += " (" + std::to_string(unplayed) + " not played)";
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
      "Per scenario, one column per controller: how many runs survived, then every figure of "
      "summary.csv in its column order, as the mean over the seeds of the runs that were played "
      "(a fall counts with the figures it reached) with its spread over those seeds: min–max up "
      "to " +
      std::to_string(kRangeUpToSeeds) +
      " seeds, ± the standard deviation (n − 1) above. Each run's own figures are in "
      "summary.csv.\n";
  for (const ScenarioGroup& scenario : groups) {
    md += "\n## " + MarkdownCell(scenario.name) + "\n\n";
    if (scenario.info != nullptr) md += "Robot: " + MarkdownCell(scenario.info->model_name) + " · ";
    const ControllerGroup* baseline = scenario.Baseline();
    md += "baseline: " + (baseline != nullptr ? MarkdownCell(baseline->name) : std::string("none"));
    const SpreadKind spread = SpreadFor(scenario.seeds.size());
    md += " · seeds: " + JoinSeeds(scenario.seeds) + " · spread: " + SpreadName(spread) + "\n\n";

    md += "| figure |";
    for (const ControllerGroup& controller : scenario.controllers) {
      AppendMarkdownCell(
          &md, MarkdownCell(controller.name) + (controller.baseline ? " (baseline)" : ""));
    }
    md += "\n|---|";
    for (std::size_t i = 0; i < scenario.controllers.size(); ++i) md += "---:|";
    md += "\n| survived |";
    for (const ControllerGroup& controller : scenario.controllers) {
      AppendMarkdownCell(&md, SurvivedText(controller));
    }
    md += '\n';
    bool any_skipped = false;
    for (const MetricColumn& column : MetricColumns()) {
      md += std::string("| ") + column.label + " |";
      for (const ControllerGroup& controller : scenario.controllers) {
        const FigureStats stats = StatsOver(controller.runs, column.field);
        any_skipped = any_skipped || (stats.values > 0 && stats.values < stats.runs);
        AppendMarkdownCell(&md, MeanWithSpread(stats, spread));
      }
      md += '\n';
    }
    md +=
        "\n— : no run gave a value (not played, nothing to settle from, never settled within the "
        "window, or never fell).";
    if (any_skipped) {
      md += ' ';
      md += SkippedNote();
      md += '.';
    }
    md += '\n';
  }
  return md;
}

}  // namespace upright::runner::internal
