#include "tune_convergence.hpp"

#include <cmath>
#include <limits>

namespace upright::runner::internal {

std::vector<double> BestSoFar(const std::vector<double>& objective,
                              const std::vector<bool>& feasible) {
  std::vector<double> best(objective.size(), std::numeric_limits<double>::quiet_NaN());
  double so_far = std::numeric_limits<double>::quiet_NaN();
  for (std::size_t i = 0; i < objective.size(); ++i) {
    const double value = objective[i];
    if (feasible[i] && value < kTuneFallScore && !(value >= so_far)) so_far = value;
    best[i] = so_far;
  }
  return best;
}

}  // namespace upright::runner::internal
