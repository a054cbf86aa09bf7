// The method: the weighted Chebyshev scalarisation augmented by a small multiple of the sum of
// the objectives (K. Miettinen, "Nonlinear Multiobjective Optimization", Kluwer 1999, part II,
// the achievement and weighted Chebyshev problems; R. E. Steuer and E.-U. Choo, "An interactive
// weighted Tchebycheff procedure for multiple objective programming", Mathematical Programming
// 26, 1983; both from memory). Minimising
//   max(w (f1 − z1) / r1, (1 − w)(f2 − z2) / r2) + ρ ((f1 − z1) / r1 + (f2 − z2) / r2)
// over the box, with z the ideal point and r the ranges the start saw, gives a point that no
// other dominates; as w runs from 1 to 0 the minima run along the front from the first metric's
// end to the second's, on its non-convex parts too, which a weighted sum never reaches.
#include "upright/runner/tune/pareto_search.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>

#include "search_stages.hpp"
#include "upright/model/check.hpp"

namespace upright::runner {
namespace {

// A point whose figures do not count scores kOut × (1 + its out), above every scalarised value
// (which is capped below kOut), so that a polish still climbs towards the points that count.
constexpr double kOut = 1e6;

// One weighting's scalarisation of the two metrics.
struct Scalarisation {
  double weight = 0.5;       // of the first metric; the second's is 1 − weight
  double ideal[2] = {0, 0};  // z: the lowest of each metric the start saw
  double range[2] = {1, 1};  // r: the spread of each the start saw (> 0)
  double augmentation = 1e-3;

  PointScore operator()(const ParetoScore& score) const {
    if (score.out > 0) return {kOut * (1 + score.out), score.constraints};
    const double a = (score.first - ideal[0]) / range[0];
    const double b = (score.second - ideal[1]) / range[1];
    const double value = std::max(weight * a, (1 - weight) * b) + augmentation * (a + b);
    return {std::isfinite(value) ? std::min(value, 0.5 * kOut) : kOut, score.constraints};
  }
};

}  // namespace

Status ParetoSearchOptions::Validate() const {
  if (Status valid = search.Validate(); !valid) return valid;
  std::ostringstream why;
  if (weightings < 0 || weightings > 100) {
    why << "ParetoSearchOptions::weightings = " << weightings << ", must be in [0, 100]";
  } else if (!(augmentation > 0 && augmentation < 1)) {
    why << "ParetoSearchOptions::augmentation = " << augmentation << ", must be in (0, 1)";
  } else {
    return {};
  }
  return Failure(why.str());
}

ParetoSearchResult ParetoSearch(const ParetoSearchOptions& options,
                                const ParetoBatchObjective& objective) {
  const Status valid = options.Validate();
  UPRIGHT_CHECK(valid, "%s", valid ? "" : valid.error().c_str());
  const SearchOptions& search = options.search;
  const int global = internal::GlobalPoints(search);
  ParetoSearchResult result;
  const std::vector<std::vector<double>> start =
      internal::LatinHypercube(static_cast<std::size_t>(global), search.dimensions, search.seed);
  const std::vector<ParetoScore> scores = objective(start);
  UPRIGHT_CHECK(scores.size() == start.size(), "a batch objective returned %zu scores for %zu",
                scores.size(), start.size());
  for (std::size_t i = 0; i < start.size(); ++i) {
    result.history.push_back({start[i], scores[i], SearchStage::kGlobal, -1});
  }

  // The ideal point and the ranges, from the start's points whose figures count (bounds met or
  // not: they still tell the scale); the unit scale when none does.
  Scalarisation scalar;
  scalar.augmentation = options.augmentation;
  for (int m = 0; m < 2; ++m) {
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    for (const ParetoScore& score : scores) {
      const double value = m == 0 ? score.first : score.second;
      if (score.out > 0 || !std::isfinite(value)) continue;
      lo = std::min(lo, value);
      hi = std::max(hi, value);
    }
    if (!std::isfinite(lo)) continue;
    scalar.ideal[m] = lo;
    scalar.range[m] = hi > lo ? hi - lo : (lo != 0 ? std::abs(lo) : 1.0);
  }

  int left = search.evaluations - global;
  const int k_count = options.weightings > 0 ? options.weightings : std::clamp(left / 8, 1, 5);
  for (int k = 0; k < k_count && left > 0; ++k) {
    // Weights from the first metric alone to the second alone; one polish: both equally.
    scalar.weight = k_count == 1 ? 0.5 : 1 - static_cast<double>(k) / (k_count - 1);
    result.weights.push_back(scalar.weight);
    // The best point so far for this weighting (Better: bounds first; a tie keeps the earlier).
    std::size_t from = 0;
    for (std::size_t i = 1; i < result.history.size(); ++i) {
      if (Better(scalar(result.history[i].score), scalar(result.history[from].score))) from = i;
    }
    SearchResult polish;
    polish.history.push_back(
        {result.history[from].point, scalar(result.history[from].score), SearchStage::kGlobal});
    const BatchObjective scalarised = [&](const std::vector<std::vector<double>>& points) {
      const std::vector<ParetoScore> got = objective(points);
      UPRIGHT_CHECK(got.size() == points.size(), "a batch objective returned %zu scores for %zu",
                    got.size(), points.size());
      std::vector<PointScore> out;
      for (std::size_t i = 0; i < points.size(); ++i) {
        result.history.push_back({points[i], got[i], SearchStage::kLocal, k});
        out.push_back(scalar(got[i]));
      }
      return out;
    };
    // The budget left is shared evenly among the polishes still to come; what one leaves (it
    // converged) goes to the next.
    const int share = left / (k_count - k);
    left -= internal::PolishFrom(search, internal::PolishAlgorithm::kCobyla, 0, share, scalarised,
                                 &polish);
  }
  std::vector<ParetoScore> all;
  for (const ParetoRecord& record : result.history) all.push_back(record.score);
  result.front = NonDominated(all);
  return result;
}

}  // namespace upright::runner
