// H-infinity norm of a stable continuous-time system by the level-set iteration of Bruinsma and
// Steinbuch (Systems & Control Letters 14, 1990): a lower bound from a few frequencies, then the
// imaginary-axis eigenvalues of a Hamiltonian locate the frequencies where σ̄(G(jω)) exceeds it.
#include <algorithm>
#include <cmath>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "upright/base/number_text.hpp"
#include "analysis_frequency.hpp"
#include "upright/design/analysis.hpp"

namespace upright::design {
namespace {

using internal::kInf;
using internal::kNaN;

constexpr int kMaxIterations = 100;
constexpr double kGridPerDecade = 10;  // lower-bound grid density
constexpr int kMaxGridPoints = 400;

// The largest gain found so far and where.
struct LowerBound {
  double gain = 0;
  double omega = 0;

  void Consider(const StateSpace& s, double w) {
    const double g = internal::MaxGain(s, w);
    if (g > gain) {
      gain = g;
      omega = w;
    }
  }
};

// Frequencies ω ≥ 0 at which γ > σ̄(D) may be a singular value of G(jω): the eigenvalues jω of
//   H(γ) = [A − B R⁻¹DᵀC, −γ B R⁻¹Bᵀ; γ CᵀS⁻¹C, −Aᵀ + CᵀD R⁻¹Bᵀ],
// R = DᵀD − γ²I, S = DDᵀ − γ²I (both negative definite). H loses accuracy as γ approaches σ̄(D);
// the caller's lower bound keeps γ away from it unless the norm itself is that close.
// nullopt if the eigenvalues cannot be computed.
std::optional<std::vector<double>> CrossingFrequencies(const StateSpace& s, double gamma) {
  const Eigen::Index n = s.A.rows();
  const Eigen::Index m = s.D.cols();
  const Eigen::Index p = s.D.rows();
  const double gamma2 = gamma * gamma;
  const Eigen::LLT<Eigen::MatrixXd> minus_r(gamma2 * Eigen::MatrixXd::Identity(m, m) -
                                            s.D.transpose() * s.D);
  const Eigen::LLT<Eigen::MatrixXd> minus_s(gamma2 * Eigen::MatrixXd::Identity(p, p) -
                                            s.D * s.D.transpose());
  if (minus_r.info() != Eigen::Success || minus_s.info() != Eigen::Success) return std::nullopt;
  const Eigen::MatrixXd r_inv = -minus_r.solve(Eigen::MatrixXd::Identity(m, m));
  const Eigen::MatrixXd s_inv = -minus_s.solve(Eigen::MatrixXd::Identity(p, p));
  const Eigen::MatrixXd b_r_inv = s.B * r_inv;
  Eigen::MatrixXd h(2 * n, 2 * n);
  h.topLeftCorner(n, n) = s.A - b_r_inv * s.D.transpose() * s.C;
  h.topRightCorner(n, n) = -gamma * b_r_inv * s.B.transpose();
  h.bottomLeftCorner(n, n) = gamma * s.C.transpose() * s_inv * s.C;
  h.bottomRightCorner(n, n) = -s.A.transpose() + s.C.transpose() * s.D * b_r_inv.transpose();
  const std::optional<Eigen::VectorXcd> eigenvalues = internal::Eigenvalues(h);
  if (!eigenvalues) return std::nullopt;
  const double scale = eigenvalues->size() > 0 ? eigenvalues->cwiseAbs().maxCoeff() : 0.0;
  return internal::NearImaginaryAxis(*eigenvalues, scale);
}

// The frequencies at which the iteration evaluates σ̄: the crossings themselves, the midpoints
// between consecutive crossings (Bruinsma–Steinbuch; geometric as well as arithmetic, for
// intervals that span decades), and, for an odd count, points beyond the ends.
std::vector<double> TestFrequencies(const std::vector<double>& crossings) {
  std::vector<double> tests = crossings;
  for (std::size_t i = 0; i + 1 < crossings.size(); ++i) {
    tests.push_back(0.5 * (crossings[i] + crossings[i + 1]));
    tests.push_back(std::sqrt(crossings[i] * crossings[i + 1]));
  }
  if (crossings.size() % 2 == 1) {
    tests.push_back(0.5 * crossings.front());
    tests.push_back(2.0 * crossings.back() + 1e-300);
  }
  return tests;
}

// A failure with the largest gain found so far (a lower bound on the norm) and where, or none.
tl::unexpected<AnalysisFailure<NormPeak>> Stopped(std::string why, double norm = 0,
                                                  double peak_rad_s = kNaN) {
  return Failure(AnalysisFailure<NormPeak>{std::move(why), {norm, peak_rad_s}});
}

// The Bruinsma–Steinbuch test frequency: the pole with the largest |Im λ / (Re λ |λ|)|, or the
// smallest |λ| when all poles are real. `poles` is not empty.
double PoleTestFrequency(const Eigen::VectorXcd& poles) {
  double best_ratio = -1;
  double test_omega = poles.cwiseAbs().minCoeff();
  for (const internal::Complex& lambda : poles) {
    if (lambda.imag() == 0) continue;
    const double ratio = std::abs(lambda.imag() / (lambda.real() * std::abs(lambda)));
    if (ratio > best_ratio) {
      best_ratio = ratio;
      test_omega = std::abs(lambda);
    }
  }
  return test_omega;
}

// The lower bound the level-set iteration starts from: DC (preferred on a tie), infinity, and
// frequencies taken from the poles of the (stable, balanced) system.
LowerBound InitialLowerBound(const StateSpace& s) {
  LowerBound bound;
  bound.Consider(s, 0.0);
  if (const double at_infinity = internal::MaxSingularValue(s.D.cast<internal::Complex>());
      at_infinity > bound.gain) {
    bound = {at_infinity, kInf};
  }
  const Eigen::VectorXcd poles = internal::Eigenvalues(s.A).value_or(Eigen::VectorXcd());
  if (poles.size() == 0) return bound;
  bound.Consider(s, PoleTestFrequency(poles));
  // Every pole's magnitude and damped frequency: cheap, and a resonance is rarely missed.
  for (const internal::Complex& lambda : poles) {
    bound.Consider(s, std::abs(lambda));
    if (lambda.imag() > 0) bound.Consider(s, lambda.imag());
  }
  // A coarse geometric grid from a hundredth of the slowest pole to a hundred times the fastest:
  // a lower bound close to the norm keeps γ away from σ̄(D), where the level-set problem is
  // ill-conditioned, and shows whether G vanishes (a non-zero G of order n vanishes at no more
  // than n − 1 frequencies).
  const double low = 0.01 * std::max(poles.cwiseAbs().minCoeff(), 1e-300);
  const double high = 100 * poles.cwiseAbs().maxCoeff();
  const double decades = std::log10(high / low);
  const int count = std::clamp(static_cast<int>(std::ceil(kGridPerDecade * decades)),
                               static_cast<int>(2 * poles.size() + 2), kMaxGridPoints);
  for (int i = 0; i < count; ++i) {
    bound.Consider(s, low * std::pow(high / low, static_cast<double>(i) / (count - 1)));
  }
  return bound;
}

// The level-set iteration (Bruinsma–Steinbuch): from a non-zero lower bound, the frequencies
// where σ̄(G(jω)) crosses (1 + 2 tolerance) times it, and the gains between them, raise the bound
// until no crossing beats the level; the bound is then the norm to the tolerance.
AnalysisResult<NormPeak> RaiseToTheNorm(const StateSpace& s, LowerBound bound,
                                        double relative_tolerance) {
  for (int iteration = 1; iteration <= kMaxIterations; ++iteration) {
    const double gamma = (1 + 2 * relative_tolerance) * bound.gain;
    const std::optional<std::vector<double>> crossings = CrossingFrequencies(s, gamma);
    if (!crossings) {
      return Stopped("HinfNorm: the Hamiltonian eigenvalues could not be computed at γ = " +
                         SignificantText(gamma, 6) + "; the norm is only a lower bound",
                     bound.gain, bound.omega);
    }
    double best = 0;
    if (!crossings->empty()) {
      LowerBound round;
      for (double w : TestFrequencies(*crossings)) round.Consider(s, w);
      best = round.gain;
      if (round.gain > bound.gain) bound = round;
    }
    // True crossings at γ bracket an interval where σ̄ > γ, so its midpoint beats γ; when no test
    // point does, the candidates were not true crossings and the norm is below γ.
    if (best <= gamma) return NormPeak{bound.gain, bound.omega};
  }
  return Stopped("HinfNorm: no convergence in " + std::to_string(kMaxIterations) +
                     " iterations; the norm is only a lower bound",
                 bound.gain, bound.omega);
}

}  // namespace

AnalysisResult<NormPeak> HinfNorm(const StateSpace& system, double relative_tolerance) {
  if (!(relative_tolerance > 0 && relative_tolerance < 1)) {
    return Stopped("HinfNorm: relative_tolerance = " + SignificantText(relative_tolerance, 6) +
                   ", must be in (0, 1)");
  }
  StateSpace s = system;
  if (const Status valid = internal::CheckAndNormalise(&s); !valid) {
    return Stopped("HinfNorm: " + valid.error());
  }
  internal::BalanceStates(&s);
  if (const std::optional<internal::Complex> lambda = internal::UnstableEigenvalue(s.A)) {
    return Stopped("HinfNorm: A has the eigenvalue " + ComplexText(*lambda, 6) +
                       ", not in the open left half-plane: the H-infinity norm is infinite",
                   kInf);
  }
  const LowerBound bound = InitialLowerBound(s);
  if (bound.gain == 0) return NormPeak{0, 0};  // the transfer function is zero
  return RaiseToTheNorm(s, bound, relative_tolerance);
}

}  // namespace upright::design
