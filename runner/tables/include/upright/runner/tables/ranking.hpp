// A batch's controllers in ranking.md's order (survival rate, then the weighted score relative to
// the best controller in each scenario, then name; partial ones apart, last): for other tables
// that quote a ranking, such as a tune's ranking at their best.
#pragma once

#include <string>
#include <vector>

#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner {

struct ControllerStanding {
  std::string name;
  int rank = 0;  // 1 for the first
  int runs = 0;
  int survived = 0;
  double score = 0;      // lower is better; NaN when it has none
  bool partial = false;  // scored on fewer scenarios than another: ranked apart
};

// The standings of ranking.md for `batch`, best first.
std::vector<ControllerStanding> RankBatch(const BatchResult& batch);

}  // namespace upright::runner
