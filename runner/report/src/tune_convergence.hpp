// How a tune's search converged: each evaluation's objective in, the best objective found so far
// out, counting only settings where every run survived and the bounds held.
#pragma once

#include <vector>

namespace upright::runner::internal {

// A setting where a run did not survive scores at least this (the tune's fall penalty).
inline constexpr double kTuneFallScore = 1e6;

// Per evaluation, the lowest objective among it and those before it that are `feasible` and
// below kTuneFallScore; NaN until there is one. The two vectors are as long as each other.
std::vector<double> BestSoFar(const std::vector<double>& objective,
                              const std::vector<bool>& feasible);

}  // namespace upright::runner::internal
