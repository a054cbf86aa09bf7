// ranking.csv and ranking.md: controllers, matched by name across the batch's scenarios, ordered
// by survival rate, then by a weighted score of their figures relative to the best controller in
// each scenario, then by name. The rule is stated in ranking.md and beside kRankingWeights.
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
  std::vector<double> scenario_scores;  // per scenario group; NaN where absent or unscored
  std::vector<int> scenario_ranks;      // per scenario group; 0 where absent
};

// Every controller of the batch, best first.
std::vector<RankedController> RankControllers(const std::vector<ScenarioGroup>& groups);

std::string RankingCsv(const std::vector<ScenarioGroup>& groups);
std::string RankingMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
