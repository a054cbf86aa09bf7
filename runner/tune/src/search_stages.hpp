// The two stages of the search core, shared by the single-objective search and the Pareto
// search: the seeded Latin-hypercube start, and one derivative-free polish from a point.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "upright/runner/tune/search.hpp"

namespace upright::runner::internal {

// n points of a Latin hypercube in [0, 1]^d: each axis cut into n equal strata, one point per
// stratum on every axis, strata paired by seeded shuffles and each point placed at random
// within its cell. The first point drawn is the box's centre when n is 1.
std::vector<std::vector<double>> LatinHypercube(std::size_t n, std::size_t d, std::uint64_t seed);

// The points of the space-filling start: options.global_points, or 40 % of the budget, at least
// one and leaving one for the polish.
int GlobalPoints(const SearchOptions& options);

enum class PolishAlgorithm {
  kAuto,    // BOBYQA; COBYLA with constraints or a single dimension (NLopt's BOBYQA needs two)
  kCobyla,  // COBYLA always (a kinked objective, where BOBYQA's quadratic model does poorly)
};

// Polishes from result->history[from] (already scored) with NLopt within `budget` more
// evaluations, appending each (stage kLocal) to result->history and keeping result->best
// (Better); options give the dimensions, the constraints, the first step and the tolerance.
// Returns the evaluations spent.
int PolishFrom(const SearchOptions& options, PolishAlgorithm algorithm, std::size_t from,
               int budget, const BatchObjective& objective, SearchResult* result);

}  // namespace upright::runner::internal
