// Two objectives at once: the run metrics a Pareto tune trades against each other, what one
// evaluation scores on them, and the non-dominated filter that picks the front.
#pragma once

#include <array>
#include <cstddef>
#include <span>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/tune/objective.hpp"

namespace upright::runner {

// Fine when `metrics` is empty (no Pareto tune) or two different metric column names whose lower
// values are better (those compare judges); otherwise why not, naming the accepted metrics.
Status ValidateParetoMetrics(const std::vector<std::string>& metrics);

// The two metrics' places in metric_columns.hpp (and EvaluationScore::mean_metrics); the
// metrics must be valid.
std::array<std::size_t, 2> ParetoColumns(const std::vector<std::string>& metrics);

// A point on two objectives, both minimised.
struct ParetoScore {
  double first = 0;                 // the first metric (the mean over the runs)
  double second = 0;                // the second metric
  std::vector<double> constraints;  // each bound's miss (<= 0 met), as PointScore's
  // 0 when both figures count (every run survived and both are defined); otherwise > 0, lower
  // meaning closer to counting (a fall's share of time lost, see ParetoScoreOf).
  double out = 0;
  // Whether the point may be on a front: its figures count and it meets every bound.
  bool Eligible() const;
};

// An evaluation on the two metric columns `columns`: out = 0 when every run survived and both
// means are defined; objective / kFallPenalty (>= 1) when a run did not survive; 1 when a mean is
// undefined.
ParetoScore ParetoScoreOf(const EvaluationScore& score, const std::array<std::size_t, 2>& columns);

// Whether `a` dominates `b`: no worse on both, better on one.
bool Dominates(const ParetoScore& a, const ParetoScore& b);

// The eligible points no eligible point dominates, as indices into `points`, sorted by the first
// figure ascending. Of points with equal figures only the first is kept.
std::vector<std::size_t> NonDominated(std::span<const ParetoScore> points);

}  // namespace upright::runner
