// What a tune minimises: every run survives first, then a weighted sum of run metrics, subject to
// bounds on run metrics. An evaluation is one controller setting played on scenarios × seeds; its
// runs are scored here into one objective and the constraints' values.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner {

// One term of the score: weight × the mean of `metric` over the runs.
struct ObjectiveTerm {
  std::string metric;  // a column name of metric_columns.hpp, e.g. "max_tilt_deg"
  double weight = 1;   // > 0, per unit of the metric
  int line = 0;        // the tune file's line; 0 for the default objective
};

// A bound on a metric's worst value over the runs (the largest for kAtMost, the smallest for
// kAtLeast).
struct MetricBound {
  enum class Kind { kAtMost, kAtLeast };
  std::string metric;
  Kind kind = Kind::kAtMost;
  double limit = 0;
  int line = 0;
  std::string Text() const;  // "peak_current_A <= 18"
};

struct Objective {
  std::vector<ObjectiveTerm> terms;  // at least one
  std::vector<MetricBound> bounds;
  // Fine when every metric names a column and weights are positive and finite.
  Status Validate() const;
  std::string Text() const;  // "1 × max_tilt_deg + 10 × max_drift_m"
};

// The objective when the tune file gives none: 1 per degree of peak tilt plus 10 per metre of
// peak drift (a degree weighs as much as 10 cm), no bounds.
Objective DefaultObjective();

// A setting where a run did not survive scores kFallPenalty × (1 + the share of the runs'
// simulated time lost to falls), so any survivor (whose score stays below kFallPenalty) ranks
// above it and among settings that fall, those lasting longer rank higher.
inline constexpr double kFallPenalty = 1e6;

// One evaluation's runs scored.
struct EvaluationScore {
  double objective = 0;
  // Per bound, its worst value over the played runs (NaN when none was played), and how far it
  // lies on the wrong side of the limit (<= 0: met; kFallPenalty when the value is NaN).
  std::vector<double> worst;
  std::vector<double> violation;
  int runs = 0;
  int survived = 0;
  // Per column of metric_columns.hpp: the mean over the played runs (NaN when none was).
  std::vector<double> mean_metrics;
  std::string failure;  // the first run that did not survive: "scenario seed 2: fell: ..."
  bool feasible() const;
};

// Scores `runs` (durations_s[i]: the simulated length run i was meant to last): when every run
// survived, the weighted sum of the term metrics' means (kFallPenalty when one is undefined);
// otherwise the fall penalty above, counting a run that never stepped as wholly lost.
EvaluationScore ScoreRuns(const Objective& objective, std::span<const RunResult> runs,
                          std::span<const double> durations_s);

}  // namespace upright::runner
