// The search of a Pareto tune: two metrics minimised at once within the same budget as a
// single-objective search. The same seeded Latin-hypercube start, then the rest of the budget
// split over K local polishes, each of one weighting of an augmented Chebyshev scalarisation of
// the two metrics normalised by the ranges the start saw, each from the best point so far for its
// weighting; the front is the non-dominated set of every eligible evaluation. Deterministic for a
// seed.
#pragma once

#include <cstddef>
#include <functional>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/tune/pareto.hpp"
#include "upright/runner/tune/search.hpp"

namespace upright::runner {

// Scores every point of a batch (each a vector in [0, 1]^n) on the two metrics, in order; the
// batch may be worked on in parallel. One score per point, each with search.constraints values.
using ParetoBatchObjective =
    std::function<std::vector<ParetoScore>(const std::vector<std::vector<double>>& points)>;

struct ParetoSearchOptions {
  // The dimensions, the bounds, the budget, the start's points and seed, the polish's first step
  // and tolerance: as the single-objective search takes them.
  SearchOptions search;
  // K, the polishes (weightings); 0: one per 8 evaluations left after the start, from 1 to 5.
  int weightings = 0;
  // ρ, the augmentation: each polish also minimises ρ × the sum of the normalised metrics, so
  // that it stops on a point no other dominates (> 0, < 1).
  double augmentation = 1e-3;
  Status Validate() const;
};

struct ParetoRecord {
  std::vector<double> point;
  ParetoScore score;
  SearchStage stage = SearchStage::kGlobal;
  int weighting = -1;  // the polish that tried it (into ParetoSearchResult::weights); -1: start
};

struct ParetoSearchResult {
  std::vector<ParetoRecord> history;  // every evaluation in the order made
  // Per polish, the first metric's weight w (the second's is 1 − w), in the order polished.
  std::vector<double> weights;
  std::vector<std::size_t> front;  // NonDominated over the history
};

// Runs the search within options.search.evaluations points.
ParetoSearchResult ParetoSearch(const ParetoSearchOptions& options,
                                const ParetoBatchObjective& objective);

}  // namespace upright::runner
