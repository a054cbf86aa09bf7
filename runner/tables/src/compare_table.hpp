// compare.csv and compare.md: per scenario, each controller's mean of every judged figure against
// the baseline controller's, as a percentage difference with a verdict (better / worse / same /
// n/a) that follows the figure's direction.
#pragma once

#include <string>
#include <vector>

#include "batch_groups.hpp"

namespace upright::runner::internal {

// |difference| below this percentage of the baseline counts as "same".
inline constexpr double kSameWithinPct = 0.5;

enum class Verdict { kBetter, kWorse, kSame, kNotApplicable };

const char* ToString(Verdict verdict);  // "better", "worse", "same", "n/a"

struct Comparison {
  const char* metric;  // compare.csv name ("survival_rate", "max_tilt_deg", ...)
  const char* label;   // compare.md label
  bool higher_is_better;
  double baseline_mean;
  double controller_mean;
  double diff_pct;  // (controller − baseline) / |baseline| · 100; NaN when n/a
  Verdict verdict;
};

// The verdict and difference for one figure. Either mean NaN → n/a; equal means → same (0 %);
// baseline 0 → n/a; otherwise same within kSameWithinPct, else better or worse by direction.
Comparison Compare(const char* metric, const char* label, bool higher_is_better,
                   double baseline_mean, double controller_mean);

// Survival rate first, then every judged figure of MetricColumns(), for `controller` against
// `baseline` (groups of the same scenario).
std::vector<Comparison> CompareGroups(const ControllerGroup& baseline,
                                      const ControllerGroup& controller);

std::string CompareCsv(const std::vector<ScenarioGroup>& groups);
std::string CompareMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
