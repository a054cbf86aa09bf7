// compare.csv and compare.md: per scenario, each controller against the baseline controller, for
// survival and every judged figure: both means with their spread over seeds, the difference (in %
// of the baseline, or in the figure's unit below its floor), the paired test over the seeds both
// played, and a verdict (better / worse / same / indicative / n/a) that follows the figure's
// direction.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "batch_groups.hpp"
#include "upright/runner/tables/metric_floors.hpp"
#include "upright/runner/tables/verdict.hpp"

namespace upright::runner::internal {

// A difference counts when it reaches this percentage of the baseline mean (or, below the floor,
// the floor itself).
inline constexpr double kSameWithinPct = 0.5;
// The paired tests' level, two-sided.
inline constexpr double kTestLevel = 0.05;
// With fewer pairs the paired t-test is not applied (indicative): 2 pairs leave one degree of
// freedom, where only |t| > 12.71 rejects (SciPy: t.ppf(0.975, 1) = 12.706).
inline constexpr std::size_t kMinTPairs = 3;

// A figure that does not apply: an empty CSV cell, "—" in compare.md.
inline constexpr double kNoValue = std::numeric_limits<double>::quiet_NaN();

struct Comparison {
  const char* metric = "";  // compare.csv name ("survival_rate", "max_tilt_deg", ...)
  const char* label = "";   // compare.md label
  bool higher_is_better = false;
  MetricFloor floor;  // survival: {0, ""} (its difference is always a difference of rates)
  // Figures: over the seeds both survived (seeds_compared of them); survival: over every run.
  std::size_t seeds_compared = 0;
  FigureStats baseline, controller;
  double diff_abs = kNoValue;   // controller.mean − baseline.mean, in the figure's unit
  double diff_pct = kNoValue;   // diff_abs / |baseline.mean| · 100; NaN below the floor, survival
  const char* test = "";        // "paired t" or "McNemar exact"
  std::size_t pairs = 0;        // seeds both played (figures: both with a value)
  double mean_diff = kNoValue;  // over the pairs, controller − baseline (survival: 0/1 outcomes)
  double t = kNoValue;          // the paired t statistic; NaN for survival and below kMinTPairs
  double p_value = kNoValue;    // two-sided; NaN when no test was applied
  Verdict direction = Verdict::kNotApplicable;  // where the difference points; n/a: no values
  Verdict verdict = Verdict::kNotApplicable;
  // Figures: seeds both survived on which only the baseline, or only the controller, has a
  // value (a settling time only one of them reached within the window).
  std::size_t only_baseline_value = 0, only_controller_value = 0;
};

// Survival first, then every judged figure of MetricColumns(), for `controller` against
// `baseline` (groups of `scenario`).
std::vector<Comparison> CompareGroups(const ScenarioGroup& scenario,
                                      const ControllerGroup& baseline,
                                      const ControllerGroup& controller);

std::string CompareCsv(const std::vector<ScenarioGroup>& groups);
std::string CompareMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
