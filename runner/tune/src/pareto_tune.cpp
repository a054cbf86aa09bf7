#include "pareto_tune.hpp"

#include "upright/runner/tune/pareto.hpp"
#include "upright/runner/tune/pareto_search.hpp"

namespace upright::runner::internal {

std::vector<SearchStage> SearchPareto(const SearchOptions& search,
                                      const std::vector<std::string>& metrics,
                                      const EvaluateBatch& evaluate) {
  const std::array<std::size_t, 2> columns = ParetoColumns(metrics);
  ParetoSearchOptions options;
  options.search = search;
  const ParetoSearchResult found =
      ParetoSearch(options, [&](const std::vector<std::vector<double>>& points) {
        std::vector<ParetoScore> scores;
        for (const EvaluationScore& score : evaluate(points)) {
          scores.push_back(ParetoScoreOf(score, columns));
        }
        return scores;
      });
  std::vector<SearchStage> stages;
  for (const ParetoRecord& record : found.history) stages.push_back(record.stage);
  return stages;
}

std::vector<std::size_t> ParetoFrontOf(const std::vector<TuneEvaluation>& evaluations,
                                       const std::vector<std::string>& metrics) {
  const std::array<std::size_t, 2> columns = ParetoColumns(metrics);
  std::vector<ParetoScore> points;
  for (const TuneEvaluation& evaluation : evaluations) {
    points.push_back(ParetoScoreOf(evaluation.score, columns));
  }
  return NonDominated(points);
}

}  // namespace upright::runner::internal
