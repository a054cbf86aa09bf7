// The γ search shared by the continuous and the discrete H-infinity designs: a design at a given
// γ in, the smallest feasible γ to a relative gap out.
#pragma once

#include <Eigen/Dense>
#include <functional>

#include "upright/design/synthesis.hpp"

namespace upright::design::internal {

// A design at γ: its gain, or why γ is infeasible (or the problem is bad).
using DesignAtGamma = std::function<Result<Eigen::MatrixXd, SolveError>(double gamma)>;

// Geometric bisection between upper_gamma, which must be feasible, and 1e-6 × upper_gamma, which
// must not be (feasibility is monotone in γ), until they are within relative_gap. A failure when
// either end is not what it must be (a lower bound that is feasible too: γ_opt lies below it),
// when a design fails for bad input, or when the arguments are not positive and finite.
Result<GammaSearch, SolveError> BisectGamma(const DesignAtGamma& design, double upper_gamma,
                                            double relative_gap);

}  // namespace upright::design::internal
