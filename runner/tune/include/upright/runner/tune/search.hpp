// The search core of a tune: a box [0, 1]^n and a budget of evaluations in, the points tried and
// the best out. A seeded Latin-hypercube start evaluated as one batch (so its evaluations can run
// in parallel), then a derivative-free local polish from the best point with NLopt: BOBYQA without
// constraints, COBYLA with them. Deterministic for a seed.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner {

// What one point scored: the objective to minimise and each constraint's value (<= 0 met).
struct PointScore {
  double objective = 0;
  std::vector<double> constraints;
};

// Scores every point of a batch (each a vector in [0, 1]^n), in order; the batch may be worked
// on in parallel. Must return one score per point, with the same number of constraints each.
using BatchObjective =
    std::function<std::vector<PointScore>(const std::vector<std::vector<double>>& points)>;

struct SearchOptions {
  std::size_t dimensions = 1;   // n >= 1
  std::size_t constraints = 0;  // the number of constraint values every score carries
  int evaluations = 40;         // the budget, >= 2
  // Points of the space-filling start; 0: 40 % of the budget, at least 1 and leaving one for the
  // polish.
  int global_points = 0;
  std::uint64_t seed = 1;         // the start's points
  double local_step = 0.1;        // the polish's first step, in units of the box
  double local_tolerance = 1e-4;  // the polish stops once steps are this small (box units)
  Status Validate() const;
};

enum class SearchStage { kGlobal, kLocal };

struct SearchRecord {
  std::vector<double> point;
  PointScore score;
  SearchStage stage = SearchStage::kGlobal;
};

struct SearchResult {
  std::vector<SearchRecord> history;  // every evaluation in the order made
  std::size_t best = 0;               // index into history (Better)
};

// Whether `a` ranks above `b`: meeting every constraint first, then the lower objective; between
// two that miss, the smaller sum of misses. A tie keeps the earlier.
bool Better(const PointScore& a, const PointScore& b);

// Runs the search within options.evaluations calls' worth of points.
SearchResult Search(const SearchOptions& options, const BatchObjective& objective);

}  // namespace upright::runner
