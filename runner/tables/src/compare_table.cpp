#include "compare_table.hpp"

#include <cmath>

#include "spread_text.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/paired_tests.hpp"

namespace upright::runner::internal {
namespace {

// Whether difference `d` counts: at least kSameWithinPct of |baseline_mean| when that reaches the
// floor, at least the floor itself below it; never a zero difference.
bool Counts(double d, double baseline_mean, const MetricFloor& floor) {
  if (!(d != 0) || std::isnan(baseline_mean)) return false;
  const double base = std::fabs(baseline_mean);
  if (base >= floor.value && base > 0) return std::fabs(d) / base * 100 >= kSameWithinPct;
  return std::fabs(d) >= floor.value;
}

// A run played to its end: the runs whose figures compare judges.
bool Survived(const RunResult& run) {
  return WasPlayed(run) && run.metrics.status == RunStatus::kOk;
}

// Where `d` points for a figure in the direction `higher_is_better`.
Verdict Direction(double d, bool counts, bool higher_is_better) {
  if (std::isnan(d)) return Verdict::kNotApplicable;
  if (!counts) return Verdict::kSame;
  return (d > 0) == higher_is_better ? Verdict::kBetter : Verdict::kWorse;
}

Comparison CompareSurvival(const ScenarioGroup& scenario, const ControllerGroup& baseline,
                           const ControllerGroup& controller) {
  Comparison c;
  c.metric = "survival_rate";
  c.label = "survival (%)";
  c.higher_is_better = true;
  c.test = "McNemar exact";
  c.baseline.runs = c.baseline.values = baseline.size();
  c.baseline.mean = baseline.SurvivalRate();
  c.controller.runs = c.controller.values = controller.size();
  c.controller.mean = controller.SurvivalRate();
  if (baseline.runs.empty() || controller.runs.empty()) return c;
  c.diff_abs = c.controller.mean - c.baseline.mean;
  PairedCounts counts;
  for (const SeedPair& pair : PairBySeed(scenario, baseline, controller)) {
    if (!WasPlayed(*pair.baseline) || !WasPlayed(*pair.other)) continue;
    counts.Add(Survived(*pair.baseline), Survived(*pair.other));
  }
  c.pairs = counts.pairs();
  if (c.pairs > 0) {
    c.mean_diff =
        (static_cast<double>(counts.only_other) - static_cast<double>(counts.only_baseline)) /
        static_cast<double>(c.pairs);
    c.p_value = McNemarExactP(counts);
  }
  const double d = c.pairs > 0 ? c.mean_diff : c.diff_abs;
  c.direction = Direction(d, d != 0, true);
  if (c.pairs < kMcNemarMinPairs) {
    c.p_value = kNoValue;  // too few pairs to test
    c.verdict = Verdict::kIndicative;
  } else {
    c.verdict = c.p_value < kTestLevel ? c.direction : Verdict::kSame;
  }
  return c;
}

Comparison CompareFigure(const ScenarioGroup& scenario, const MetricColumn& column,
                         const ControllerGroup& baseline, const ControllerGroup& controller) {
  Comparison c;
  c.metric = column.name;
  c.label = column.label;
  c.floor = FloorOf(column.name);
  c.test = "paired t";
  // Over the seeds both survived: a fall ends a run early, so its totals (IAE, effort, energy)
  // and extremes are not those of the same task; the survival row weighs the falls.
  std::vector<const RunResult*> baseline_runs, controller_runs;
  std::vector<double> differences;
  for (const SeedPair& pair : PairBySeed(scenario, baseline, controller)) {
    if (!Survived(*pair.baseline) || !Survived(*pair.other)) continue;
    baseline_runs.push_back(pair.baseline);
    controller_runs.push_back(pair.other);
    const double b = pair.baseline->metrics.*column.field;
    const double o = pair.other->metrics.*column.field;
    if (!std::isnan(b) && !std::isnan(o)) differences.push_back(o - b);
    if (!std::isnan(b) && std::isnan(o)) ++c.only_baseline_value;
    if (std::isnan(b) && !std::isnan(o)) ++c.only_controller_value;
  }
  c.seeds_compared = baseline_runs.size();
  c.baseline = StatsOver(baseline_runs, column.field);
  c.controller = StatsOver(controller_runs, column.field);
  const PairedT test = PairedTTest(differences);
  c.pairs = test.pairs;
  c.mean_diff = test.mean_diff;
  c.t = test.t;
  c.p_value = test.p_value;
  if (c.baseline.values == 0 || c.controller.values == 0) return c;
  c.diff_abs = c.controller.mean - c.baseline.mean;
  const double base = std::fabs(c.baseline.mean);
  if (base >= c.floor.value && base > 0) c.diff_pct = c.diff_abs / base * 100;
  const double d = c.pairs > 0 ? c.mean_diff : c.diff_abs;
  c.direction = Direction(d, Counts(d, c.baseline.mean, c.floor), c.higher_is_better);
  if (c.pairs < kMinTPairs) {
    c.t = kNoValue;  // too few pairs to test
    c.p_value = kNoValue;
    c.verdict = Verdict::kIndicative;
  } else if (c.p_value < kTestLevel && Counts(c.mean_diff, c.baseline.mean, c.floor)) {
    c.verdict = c.direction;
  } else {
    c.verdict = Verdict::kSame;
  }
  // The test saw only the seeds both have a value on: a side that has none where the other has
  // one (it never settled there) cannot be called the better one on the others alone.
  if ((c.verdict == Verdict::kBetter && c.only_baseline_value > 0) ||
      (c.verdict == Verdict::kWorse && c.only_controller_value > 0)) {
    c.verdict = Verdict::kIndicative;
  }
  return c;
}

void AppendNumberCell(std::string* csv, double value) {
  csv->push_back(',');
  AppendSignificant(csv, value, 6, NanAs::kEmpty);
}

void AppendStatsCells(std::string* csv, const FigureStats& stats) {
  *csv += ',' + std::to_string(stats.values) + ',' + std::to_string(stats.runs - stats.values);
  AppendNumberCell(csv, stats.mean);
  AppendNumberCell(csv, stats.min);
  AppendNumberCell(csv, stats.max);
  AppendNumberCell(csv, stats.sd);
}

// compare.md's test cell: "t = -3.20, p = 0.0410 (3 pairs)", "no spread, p = 1.00 (3 pairs)",
// "McNemar p = 0.0313 (6 pairs)", "2 pairs, too few", "—", and after a test whose verdict the
// seeds with a value on one side only withheld, "...; 2 seeds with a value on one side only".
std::string TestText(const Comparison& c) {
  const std::string pairs = std::to_string(c.pairs) + (c.pairs == 1 ? " pair" : " pairs");
  if (c.verdict == Verdict::kNotApplicable) {
    return !c.higher_is_better && c.seeds_compared == 0 ? "no seed both survived" : "—";
  }
  if (c.verdict == Verdict::kIndicative && std::isnan(c.p_value)) return pairs + ", too few";
  std::string text = c.higher_is_better ? "McNemar "
                     : std::isnan(c.t)  ? std::string("no spread, ")
                                        : "t = " + ReadableText(c.t, NanAs::kDash) + ", ";
  text += "p = " + ReadableText(c.p_value, NanAs::kDash) + " (" + pairs + ")";
  if (c.verdict == Verdict::kIndicative) {
    const std::size_t one_sided = c.only_baseline_value + c.only_controller_value;
    text += "; " + std::to_string(one_sided) + (one_sided == 1 ? " seed" : " seeds") +
            " with a value on one side only";
  }
  return text;
}

std::string FloorsText() {
  std::string text;
  for (const MetricColumn& column : MetricColumns()) {
    if (!column.compared) continue;
    const MetricFloor floor = FloorOf(column.name);
    if (!text.empty()) text += ", ";
    text += std::string(column.label) + " " + SignificantText(floor.value, 6);
    if (*floor.unit != '\0') text += std::string(" ") + floor.unit;
  }
  return text;
}

}  // namespace

std::vector<Comparison> CompareGroups(const ScenarioGroup& scenario,
                                      const ControllerGroup& baseline,
                                      const ControllerGroup& controller) {
  std::vector<Comparison> rows;
  rows.push_back(CompareSurvival(scenario, baseline, controller));
  for (const MetricColumn& column : MetricColumns()) {
    if (column.compared) rows.push_back(CompareFigure(scenario, column, baseline, controller));
  }
  return rows;
}

std::string CompareCsv(const std::vector<ScenarioGroup>& groups) {
  std::string csv =
      "scenario,baseline,controller,metric,better_when,floor,baseline_n,baseline_skipped,"
      "baseline_mean,baseline_min,baseline_max,baseline_sd,controller_n,controller_skipped,"
      "controller_mean,controller_min,controller_max,controller_sd,diff_abs,diff_pct,test,pairs,"
      "mean_diff,t,p_value,direction,verdict\n";
  for (const ScenarioGroup& scenario : groups) {
    const ControllerGroup* baseline = scenario.Baseline();
    if (baseline == nullptr) continue;
    for (const ControllerGroup& controller : scenario.controllers) {
      if (&controller == baseline) continue;
      for (const Comparison& row : CompareGroups(scenario, *baseline, controller)) {
        AppendCsvField(&csv, scenario.name);
        csv += ',';
        AppendCsvField(&csv, baseline->name);
        csv += ',';
        AppendCsvField(&csv, controller.name);
        csv += ',';
        csv += row.metric;
        csv += row.higher_is_better ? ",higher" : ",lower";
        AppendNumberCell(&csv, row.higher_is_better ? kNoValue : row.floor.value);
        AppendStatsCells(&csv, row.baseline);
        AppendStatsCells(&csv, row.controller);
        AppendNumberCell(&csv, row.diff_abs);
        AppendNumberCell(&csv, row.diff_pct);
        csv += ',';
        csv += row.test;
        csv += ',' + std::to_string(row.pairs);
        AppendNumberCell(&csv, row.mean_diff);
        AppendNumberCell(&csv, row.t);
        AppendNumberCell(&csv, row.p_value);
        csv += ',';
        csv += ToString(row.direction);
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
      "Per scenario, each controller against the scenario's baseline controller. Survival is "
      "compared over every run; every other figure over the seeds on which both controllers "
      "survived, since a fall ends a run early and its totals (IAE, effort, energy) and extremes "
      "are not those of the same task (n/a when no seed was survived by both). Means are over "
      "those seeds' runs that have a value, with their spread over the seeds: min–max up to " +
      std::to_string(kRangeUpToSeeds) + " seeds, ± the standard deviation (n − 1) above; " +
      SkippedNote() + ".\n\n";
  md +=
      "Difference: (controller − baseline) / |baseline| · 100 from the means; when |baseline| is "
      "below the figure's floor, where a percentage means nothing, the difference in the "
      "figure's unit, marked (abs.). Floors: " +
      FloorsText() + ".\n\n";
  md +=
      "Verdict: the runs are paired by seed (both survived, both with a value) and the paired "
      "t-test, two-sided at " +
      SignificantText(kTestLevel * 100, 6) +
      " %, is applied to the differences. Better or worse needs the test to reject and the mean "
      "difference over the pairs to reach " +
      SignificantText(kSameWithinPct, 6) +
      " % of the baseline mean (the floor itself when the baseline is below it); with fewer than " +
      std::to_string(kMinTPairs) +
      " pairs there is no test, and the direction of the difference is shown as a hint only. "
      "A seed both survived on which only one side has a value (a settling time only one of them "
      "reached within the window) is outside the test; when it goes against the verdict (better "
      "for the side that never settled there), the verdict is withheld, a hint only. "
      "Identical differences on every pair leave no spread to test: all zero count as no "
      "difference (p = 1), all equal and non-zero as a sure one (t infinite, p = 0). Every "
      "figure is better when lower but survival, better when higher: compared as a difference "
      "of rates in percentage points (pp), with the exact McNemar test on the seeds both "
      "played, which cannot reach " +
      SignificantText(kTestLevel * 100, 6) + " % with fewer than " +
      std::to_string(kMcNemarMinPairs) + " pairs (indicative).\n\n";
  md += "Marks: " + VerdictLegend() + ".\n";
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
    const SpreadKind spread = SpreadFor(scenario.seeds.size());
    if (scenario.info != nullptr) md += "Robot: " + MarkdownCell(scenario.info->model_name) + " · ";
    md += "baseline: " + MarkdownCell(baseline->name) +
          " · seeds: " + std::to_string(scenario.seeds.size()) +
          " · spread: " + SpreadName(spread) + "\n";
    for (const ControllerGroup& controller : scenario.controllers) {
      if (&controller == baseline) continue;
      md += "\n### " + MarkdownCell(controller.name) + " against " + MarkdownCell(baseline->name) +
            "\n\n| figure | " + MarkdownCell(baseline->name) + " (baseline) |";
      AppendMarkdownCell(&md, MarkdownCell(controller.name));
      md += " difference | paired test | verdict |\n|---|---:|---:|---:|---|---|\n";
      for (const Comparison& c : CompareGroups(scenario, *baseline, controller)) {
        // Survival shows as a percentage of runs; the figures show as they are.
        const double scale = c.higher_is_better ? 100 : 1;
        md += std::string("| ") + c.label + " |";
        AppendMarkdownCell(&md, MeanWithSpread(c.baseline, spread, scale));
        AppendMarkdownCell(&md, MeanWithSpread(c.controller, spread, scale));
        AppendMarkdownCell(
            &md, DifferenceText(c.diff_abs, c.diff_pct, c.floor.unit, c.higher_is_better));
        AppendMarkdownCell(&md, TestText(c));
        AppendMarkdownCell(&md, VerdictMark(c.verdict, c.direction));
        md += '\n';
      }
    }
  }
  return md;
}

}  // namespace upright::runner::internal
