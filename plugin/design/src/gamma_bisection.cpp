#include "gamma_bisection.hpp"

#include <cmath>
#include <string>

#include "riccati_common.hpp"
#include "upright/base/number_text.hpp"

namespace upright::design::internal {
namespace {

// The lower end of the search, relative to the upper: a γ this far below a feasible one is
// infeasible for any loop worth designing, and the search checks that it is.
constexpr double kLowerBoundRatio = 1e-6;
constexpr int kMaxIterations = 200;

}  // namespace

Result<GammaSearch, SolveError> BisectGamma(const DesignAtGamma& design, double upper_gamma,
                                            double relative_gap) {
  if (!(upper_gamma > 0) || !std::isfinite(upper_gamma)) {
    return Fail(SolveFailure::kInvalidInput,
                "gamma search: the upper bound gamma = " + SignificantText(upper_gamma, 6) +
                    ", must be finite and > 0");
  }
  if (!(relative_gap > 0) || !std::isfinite(relative_gap)) {
    return Fail(SolveFailure::kInvalidInput,
                "gamma search: relative_gap = " + SignificantText(relative_gap, 6) +
                    ", must be finite and > 0");
  }
  double hi = upper_gamma;
  if (const Result<Eigen::MatrixXd, SolveError> upper = design(hi); !upper) {
    return Fail(upper.error().reason == SolveFailure::kInvalidInput
                    ? SolveFailure::kInvalidInput
                    : SolveFailure::kNoStabilisingSolution,
                "gamma search: the upper bound gamma = " + SignificantText(hi, 6) +
                    " is infeasible: " + upper.error().message);
  }
  double lo = kLowerBoundRatio * hi;
  const Result<Eigen::MatrixXd, SolveError> lower = design(lo);
  if (lower) {
    return Fail(SolveFailure::kInvalidInput,
                "gamma search: the lower bound gamma = " + SignificantText(lo, 6) + " (" +
                    SignificantText(kLowerBoundRatio, 6) +
                    " x the upper bound) is feasible too, so gamma_opt lies below it: the "
                    "disturbance hardly reaches the weighted output");
  }
  if (lower.error().reason == SolveFailure::kInvalidInput ||
      lower.error().reason == SolveFailure::kNotStabilisable) {
    return Fail(lower.error().reason, "gamma search: at the lower bound gamma = " +
                                          SignificantText(lo, 6) + ": " + lower.error().message);
  }
  GammaSearch out;
  while (hi / lo > 1 + relative_gap && out.iterations < kMaxIterations) {
    const double mid = std::sqrt(lo * hi);
    (design(mid).has_value() ? hi : lo) = mid;
    ++out.iterations;
  }
  out.gamma_opt = hi;
  return out;
}

}  // namespace upright::design::internal
