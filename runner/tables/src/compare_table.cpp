#include "compare_table.hpp"

#include <cmath>
#include <limits>

#include "upright/runner/metric_columns.hpp"
#include "upright/runner/text_format.hpp"

namespace upright::runner::internal {
namespace {

// compare.md's verdict text: a word with a symbol, so it reads without colour.
const char* VerdictText(Verdict verdict) {
  switch (verdict) {
    case Verdict::kBetter:
      return "✔ better";
    case Verdict::kWorse:
      return "✘ worse";
    case Verdict::kSame:
      return "≈ same";
    case Verdict::kNotApplicable:
      break;
  }
  return "n/a";
}

std::string SignedPercent(double diff_pct) {
  if (std::isnan(diff_pct)) return "";
  std::string text = FormatReadable(diff_pct);
  if (diff_pct > 0) text = "+" + text;
  return text + " %";
}

}  // namespace

const char* ToString(Verdict verdict) {
  switch (verdict) {
    case Verdict::kBetter:
      return "better";
    case Verdict::kWorse:
      return "worse";
    case Verdict::kSame:
      return "same";
    case Verdict::kNotApplicable:
      break;
  }
  return "n/a";
}

Comparison Compare(const char* metric, const char* label, bool higher_is_better,
                   double baseline_mean, double controller_mean) {
  Comparison c{metric,
               label,
               higher_is_better,
               baseline_mean,
               controller_mean,
               std::numeric_limits<double>::quiet_NaN(),
               Verdict::kNotApplicable};
  if (std::isnan(baseline_mean) || std::isnan(controller_mean)) return c;
  if (controller_mean == baseline_mean) {
    c.diff_pct = 0;
    c.verdict = Verdict::kSame;
    return c;
  }
  if (baseline_mean == 0) return c;
  c.diff_pct = (controller_mean - baseline_mean) / std::fabs(baseline_mean) * 100;
  if (std::fabs(c.diff_pct) < kSameWithinPct) {
    c.verdict = Verdict::kSame;
  } else {
    const bool higher = c.diff_pct > 0;
    c.verdict = higher == higher_is_better ? Verdict::kBetter : Verdict::kWorse;
  }
  return c;
}

std::vector<Comparison> CompareGroups(const ControllerGroup& baseline,
                                      const ControllerGroup& controller) {
  std::vector<Comparison> rows;
  rows.push_back(Compare("survival_rate", "survival (%)", true, baseline.SurvivalRate(),
                         controller.SurvivalRate()));
  for (const MetricColumn& column : MetricColumns()) {
    if (!column.compared) continue;
    rows.push_back(Compare(column.name, column.label, false, MeanOver(baseline.runs, column.field),
                           MeanOver(controller.runs, column.field)));
  }
  return rows;
}

std::string CompareCsv(const std::vector<ScenarioGroup>& groups) {
  std::string csv =
      "scenario,baseline,controller,metric,better_when,baseline_mean,controller_mean,diff_pct,"
      "verdict\n";
  for (const ScenarioGroup& scenario : groups) {
    const ControllerGroup* baseline = scenario.Baseline();
    if (baseline == nullptr) continue;
    for (const ControllerGroup& controller : scenario.controllers) {
      if (&controller == baseline) continue;
      for (const Comparison& row : CompareGroups(*baseline, controller)) {
        AppendCsvField(&csv, scenario.name);
        csv += ',';
        AppendCsvField(&csv, baseline->name);
        csv += ',';
        AppendCsvField(&csv, controller.name);
        csv += ',';
        csv += row.metric;
        csv += row.higher_is_better ? ",higher," : ",lower,";
        AppendNumber(&csv, row.baseline_mean);
        csv += ',';
        AppendNumber(&csv, row.controller_mean);
        csv += ',';
        AppendNumber(&csv, row.diff_pct);
        csv += ',';
        csv += ToString(row.verdict);
        csv += '\n';
      }
    }
  }
  return csv;
}

std::string CompareMarkdown(const std::vector<ScenarioGroup>& groups) {
  std::string md = "# Comparison against the baseline\n\n";
  md +=
      "Per scenario, each controller's mean over seeds against the baseline controller's, as "
      "(controller − baseline) / |baseline| · 100. Survival is better when higher; every other "
      "figure is better when lower. Within ±";
  md += FormatNumber(kSameWithinPct);
  md +=
      " % counts as the same; n/a when the baseline is 0 or either mean is missing. Settling "
      "times are means over the runs that settled (summary.md marks the partial ones).\n";
  for (const ScenarioGroup& scenario : groups) {
    md += "\n## " + MarkdownCell(scenario.name) + "\n\n";
    const ControllerGroup* baseline = scenario.Baseline();
    if (baseline == nullptr) {
      md += "No baseline controller in this scenario: nothing to compare.\n";
      continue;
    }
    if (scenario.controllers.size() < 2) {
      md += "Only the baseline (" + MarkdownCell(baseline->name) + ") ran: nothing to compare.\n";
      continue;
    }
    md += "| metric | " + MarkdownCell(baseline->name) + " (baseline) |";
    std::vector<std::vector<Comparison>> columns;
    for (const ControllerGroup& controller : scenario.controllers) {
      if (&controller == baseline) continue;
      AppendMarkdownCell(&md, MarkdownCell(controller.name));
      columns.push_back(CompareGroups(*baseline, controller));
    }
    md += "\n|---|---:|";
    for (std::size_t i = 0; i < columns.size(); ++i) md += "---|";
    md += '\n';
    for (std::size_t row = 0; row < columns.front().size(); ++row) {
      const Comparison& first = columns.front()[row];
      // Row 0 is survival, shown as a percentage of runs; the figures show as they are.
      const double scale = row == 0 ? 100 : 1;
      md += std::string("| ") + first.label + " | " + FormatReadable(first.baseline_mean * scale);
      for (const std::vector<Comparison>& column : columns) {
        const Comparison& c = column[row];
        md += " | " + FormatReadable(c.controller_mean * scale);
        const std::string diff = SignedPercent(c.diff_pct);
        md += diff.empty() ? std::string(" ") : " (" + diff + ") ";
        md += VerdictText(c.verdict);
      }
      md += " |\n";
    }
  }
  return md;
}

}  // namespace upright::runner::internal
