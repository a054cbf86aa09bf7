// A tune's Pareto part: the Pareto search run on a controller's evaluations, and the front of
// its evaluations on the two metrics.
#pragma once

#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "upright/runner/tune/objective.hpp"
#include "upright/runner/tune/search.hpp"
#include "upright/runner/tune/tune.hpp"

namespace upright::runner::internal {

// Plays every setting of a batch (points in [0, 1]^n) and scores it, in order.
using EvaluateBatch =
    std::function<std::vector<EvaluationScore>(const std::vector<std::vector<double>>& points)>;

// The Pareto search (pareto_search.hpp) on the two `metrics` within `search`'s budget, bounds as
// constraints; the stage of each evaluation made, in order.
std::vector<SearchStage> SearchPareto(const SearchOptions& search,
                                      const std::vector<std::string>& metrics,
                                      const EvaluateBatch& evaluate);

// The evaluations on the front of `metrics` (NonDominated), sorted by the first ascending.
std::vector<std::size_t> ParetoFrontOf(const std::vector<TuneEvaluation>& evaluations,
                                       const std::vector<std::string>& metrics);

}  // namespace upright::runner::internal
