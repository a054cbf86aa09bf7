// sweep.md: survival with its Wilson interval, percentiles of the main figures over the runs that
// survived, the paired comparison with the baseline, the dispersions as sampled, and the caution.
#include <array>
#include <cmath>
#include <limits>
#include <string_view>
#include <vector>

#include "upright/base/number_text.hpp"
#include "upright/model/check.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/sweep/sweep_writer.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/paired_tests.hpp"

namespace upright::runner {
namespace {

// The figures whose spread sweep.md shows, by their summary.csv column name.
constexpr std::array<std::string_view, 5> kFigures = {
    "max_tilt_deg", "max_drift_m", "tilt_settle_s", "peak_current_A", "effort_Nm2s"};
constexpr std::array<double, 3> kPercents = {50, 90, 99};

const MetricColumn& Column(std::string_view name) {
  for (const MetricColumn& column : MetricColumns()) {
    if (name == column.name) return column;
  }
  UPRIGHT_CHECK(false, "no metric column %.*s", static_cast<int>(name.size()), name.data());
  return MetricColumns().front();
}

std::string Percent(double fraction) { return ReadableText(100 * fraction, NanAs::kDash) + " %"; }

std::string ControllerLabel(const SweepResult& result, std::size_t c) {
  const std::string& name = result.scenario.controllers[c];
  return MarkdownCell(name) + (name == result.scenario.baseline ? " (baseline)" : "");
}

// A value as the file gives it (shortest exact form), for the spreads' own parameters.
std::string Exact(double value) { return ShortestText(value, NanAs::kDash); }

std::string SpreadText(const Dispersion& d) {
  if (d.kind == SpreadKind::kNormal) return "normal, mean " + Exact(d.mean) + ", sd " + Exact(d.sd);
  return "uniform over [" + Exact(d.lo) + ", " + Exact(d.hi) + ")";
}

void AppendSurvival(const SweepResult& result, std::string* md) {
  const std::size_t n = result.samples.size();
  *md += "## Survival\n\n| controller | survived | rate | 95 % interval |\n|---|---:|---:|---:|\n";
  for (std::size_t c = 0; c < result.controller_count(); ++c) {
    const std::size_t k = CountSurvived(result, c);
    const Interval interval = WilsonInterval(k, n);
    *md += "| " + ControllerLabel(result, c) + " | " + std::to_string(k) + "/" + std::to_string(n) +
           " | " + Percent(static_cast<double>(k) / static_cast<double>(n)) + " | " +
           ReadableText(100 * interval.lo, NanAs::kDash) + " – " + Percent(interval.hi) + " |\n";
  }
  *md +=
      "\nThe interval is the Wilson score interval (Wilson 1927) at 95 % (z = 1.959964): the "
      "survival rates these samples are consistent with. It holds for these spreads, not for "
      "others.\n";
  std::size_t failed_samples = 0, setup_failed = 0;
  for (const SweepSample& sample : result.samples) failed_samples += sample.error.empty() ? 0 : 1;
  for (const RunResult& run : result.runs) {
    setup_failed += run.metrics.status == RunStatus::kSetupFailed ? 1 : 0;
  }
  if (setup_failed > 0) {
    *md += '\n';
    *md += std::to_string(setup_failed);
    *md += " run(s) could not be set up (`setup_failed` in sweep.csv; ";
    *md += std::to_string(failed_samples);
    *md += " sample(s) had a spread with no acceptable draw); they count as not survived.\n";
  }
}

void AppendFigures(const SweepResult& result, std::string* md) {
  *md +=
      "\n## Figures over the runs that survived\n\nPercentiles p50, p90, p99 by linear "
      "interpolation between the sorted values (NumPy's default method); with fewer than 100 "
      "runs p99 lies between the two largest. A tilt settle time of a run that survived but did "
      "not settle within the window ranks above every settled one (\"unsettled\").\n";
  for (const std::string_view name : kFigures) {
    const MetricColumn& column = Column(name);
    const bool settle = name == "tilt_settle_s";
    *md += "\n### " + std::string(column.label) + "\n\n| controller | runs | p50 | p90 | p99 |\n";
    *md += "|---|---:|---:|---:|---:|\n";
    for (std::size_t c = 0; c < result.controller_count(); ++c) {
      std::vector<double> values;
      bool any_value = false;
      for (const SweepSample& sample : result.samples) {
        const RunResult& run = result.run(sample.index, c);
        if (run.metrics.status != RunStatus::kOk) continue;
        double value = run.metrics.*column.field;
        any_value = any_value || !std::isnan(value);
        if (std::isnan(value)) {
          if (!settle) continue;
          value = std::numeric_limits<double>::infinity();
        }
        values.push_back(value);
      }
      if (!any_value) values.clear();  // nothing to settle from: no figure at all
      *md += "| " + ControllerLabel(result, c) + " | " + std::to_string(values.size());
      for (const double percent : kPercents) {
        const double p = Percentile(values, percent);
        *md += " | " + (std::isinf(p) ? std::string("unsettled") : ReadableText(p, NanAs::kDash));
      }
      *md += " |\n";
    }
  }
  *md += "\n— : no run to take it over.\n";
}

void AppendPaired(const SweepResult& result, std::string* md) {
  const std::size_t baseline = BaselineIndex(result);
  const std::string base = MarkdownCell(result.scenario.baseline);
  *md += "\n## Paired with the baseline (" + base + ")\n\n";
  if (result.controller_count() < 2) {
    *md += "One controller only: nothing to pair.\n";
    return;
  }
  *md += "| controller | both survive | only " + base +
         " | only this one | both fall | McNemar exact p |\n|---|---:|---:|---:|---:|---:|\n";
  for (std::size_t c = 0; c < result.controller_count(); ++c) {
    if (c == baseline) continue;
    const PairedCounts counts = PairWithBaseline(result, c);
    *md += "| " + ControllerLabel(result, c) + " | " + std::to_string(counts.both) + " | " +
           std::to_string(counts.only_baseline) + " | " + std::to_string(counts.only_other) +
           " | " + std::to_string(counts.neither) + " | " +
           ReadableText(McNemarExactP(counts), NanAs::kDash) + " |\n";
  }
  *md +=
      "\nBoth controllers ran on the same samples, so only the samples where one survived and the "
      "other did not tell them apart. The p-value is the exact two-sided McNemar test (McNemar "
      "1947) on those: 2 · P[X ≤ min(b, c)] for X ~ Binomial(b + c, 1/2), b and c the two "
      "\"only\" columns; a small p (below 0.05, say) means the difference in survival is unlikely "
      "to be chance on samples like these.\n";
}

void AppendDispersions(const SweepResult& result, std::string* md) {
  *md +=
      "\n## Dispersions\n\n| parameter | spread | nominal | sampled min | median | max | "
      "redrawn |\n|---|---|---:|---:|---:|---:|---:|\n";
  for (std::size_t k = 0; k < result.dispersions.size(); ++k) {
    const Dispersion& d = result.dispersions[k];
    std::vector<double> values;
    int redrawn = 0;
    for (const SweepSample& sample : result.samples) {
      if (!std::isnan(sample.values[k])) values.push_back(sample.values[k]);
      redrawn += sample.redraws[k];
    }
    *md += "| `" + MarkdownCell(d.param) + "` | " + SpreadText(d) + " | " + Exact(d.nominal) +
           " | " + ReadableText(Percentile(values, 0), NanAs::kDash) + " | " +
           ReadableText(Percentile(values, 50), NanAs::kDash) + " | " +
           ReadableText(Percentile(values, 100), NanAs::kDash) + " | " + std::to_string(redrawn) +
           " |\n";
  }
  *md +=
      "\nValues in the parameter's file units. Each sample draws every parameter once, from its "
      "own stream; a draw the parameter does not take (a negative mass from a wide normal) is "
      "drawn again, so such a spread is truncated by redrawing; \"redrawn\" counts those draws. "
      "Robot parameters change the robot as built; the controllers stay designed for the "
      "nominal robot. Sample i runs with sensor-noise seed i + 1; sweep.csv holds every sample's "
      "values.\n";
}

}  // namespace

std::string SweepMarkdown(const SweepResult& result) {
  std::string md = "# Sweep: " + MarkdownCell(result.scenario.name) + "\n\n";
  md += "Robot: " + MarkdownCell(result.scenario.model_name) + " · " +
        std::to_string(result.samples.size()) + " samples · sweep seed " +
        std::to_string(result.seed) + " · baseline: " + MarkdownCell(result.scenario.baseline) +
        "\n\n";
  AppendSurvival(result, &md);
  AppendFigures(result, &md);
  AppendPaired(result, &md);
  AppendDispersions(result, &md);
  md +=
      "\n> Simulation only: a survival rate here holds for this model and these spreads, never "
      "for a real robot. Validate on hardware with a tether or spotter, at low speed first, "
      "within local rules for the robot's use.\n";
  return md;
}

}  // namespace upright::runner
