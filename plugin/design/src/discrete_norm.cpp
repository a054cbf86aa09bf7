// The discrete-time H-infinity norm through the bilinear map to continuous time.
#include "upright/design/discrete_norm.hpp"

#include <cmath>
#include <complex>
#include <limits>
#include <string>

#include "upright/base/number_text.hpp"

namespace upright::design {

AnalysisResult<NormPeak> DiscreteHinfNorm(const StateSpace& system, double period_s,
                                          double relative_tolerance) {
  const auto stopped = [](std::string why, double norm) {
    return Failure(AnalysisFailure<NormPeak>{std::move(why), NormPeak{norm, kNoFrequency}});
  };
  if (!(period_s > 0) || !std::isfinite(period_s)) {
    return stopped("discrete H-infinity norm: period_s = " + SignificantText(period_s, 6) +
                       ", must be finite and > 0",
                   0);
  }
  const Eigen::Index n = system.A.rows();
  if (system.A.cols() != n || system.B.rows() != n || system.C.cols() != n) {
    // Sizes that disagree: HinfNorm names them.
    return HinfNorm(system, relative_tolerance);
  }
  if (n > 0) {
    if (!system.A.allFinite()) return stopped("discrete H-infinity norm: A is not finite", 0);
    const Eigen::VectorXcd eigenvalues = system.A.eigenvalues();
    Eigen::Index largest = 0;
    eigenvalues.cwiseAbs().maxCoeff(&largest);
    if (!(std::abs(eigenvalues(largest)) < 1)) {
      return stopped("discrete system unstable: eigenvalue " +
                         ComplexText(eigenvalues(largest), 6) +
                         " (|z| = " + SignificantText(std::abs(eigenvalues(largest)), 6) +
                         ") is not inside the unit circle",
                     std::numeric_limits<double>::infinity());
    }
  }
  // z = (1 + s)/(1 − s). With P = (I + A)⁻¹ (no eigenvalue of a stable A is −1):
  //   G(z) = D − C P B + (√2 C P)(sI − P (A − I))⁻¹(√2 P B),
  // derived by hand from (zI − A) = ((I − A) + s (I + A))/(1 − s); the same map as in Zhou, Doyle
  // and Glover, Robust and Optimal Control (1996), on discrete-time systems (from memory).
  StateSpace mapped;
  if (n == 0) {
    mapped = system;
  } else {
    const Eigen::MatrixXd identity = Eigen::MatrixXd::Identity(n, n);
    const Eigen::PartialPivLU<Eigen::MatrixXd> plus(identity + system.A);
    const Eigen::MatrixXd p_b = plus.solve(system.B);
    // C P = (Pᵀ Cᵀ)ᵀ; P and A commute, so P (A − I) = (A − I) P.
    const Eigen::MatrixXd c_p =
        Eigen::PartialPivLU<Eigen::MatrixXd>((identity + system.A).transpose())
            .solve(system.C.transpose())
            .transpose();
    mapped.A = plus.solve(system.A - identity);
    mapped.B = std::sqrt(2.0) * p_b;
    mapped.C = std::sqrt(2.0) * c_p;
    const Eigen::MatrixXd d =
        system.D.size() == 0 ? Eigen::MatrixXd::Zero(system.C.rows(), system.B.cols()) : system.D;
    mapped.D = d - system.C * p_b;
  }
  AnalysisResult<NormPeak> norm = HinfNorm(mapped, relative_tolerance);
  // ω on the imaginary axis is θ = 2 atan ω on the unit circle (∞ ↦ π).
  const auto to_discrete = [period_s](double omega) {
    return std::isnan(omega) ? omega : 2 * std::atan(omega) / period_s;
  };
  if (norm) {
    norm->peak_rad_s = to_discrete(norm->peak_rad_s);
  } else {
    norm.error().found.peak_rad_s = to_discrete(norm.error().found.peak_rad_s);
  }
  return norm;
}

}  // namespace upright::design
