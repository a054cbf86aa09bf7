// ranking.csv and ranking.md: controllers, matched by name across the batch's scenarios, ordered
// by survival rate, then by a weighted score of their figures relative to the best controller in
// each scenario, then by name; a controller scored on fewer scenarios than another is ranked
// apart, after the others. The rule is stated in ranking.md and beside kRankingWeights.
#pragma once

#include <string>
#include <vector>

#include "batch_groups.hpp"

namespace upright::runner::internal {

struct RankedController {
  std::string name;
  int runs = 0;
  int survived = 0;
  double survival_rate = 0;  // survived / runs over every scenario it ran in
  double score = 0;          // mean of its per-scenario scores; NaN when it has none; lower better
  int scenarios_scored = 0;
  // Scored on fewer scenarios than the most any controller of the batch was: ranked apart, after
  // every controller that was not.
  bool partial = false;
  // Empty figure values its scores left out: a figure of a run not played, or one that does not
  // apply (NaN) and is not a settling time, for each figure the score of that scenario took in.
  int values_skipped = 0;
  std::vector<double> scenario_scores;  // per scenario group; NaN where absent or unscored
  std::vector<int> scenario_ranks;      // per scenario group; 0 where absent
};

// Every controller of the batch, best first: those scored on the most scenarios, then the partial
// ones, each part in the order above.
std::vector<RankedController> RankControllers(const std::vector<ScenarioGroup>& groups);

std::string RankingCsv(const std::vector<ScenarioGroup>& groups);
std::string RankingMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
