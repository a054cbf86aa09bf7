// Continuous algebraic Riccati equation: Schur method on the Hamiltonian with Newton–Kleinman
// refinement, and the scaled matrix sign function as an independent second method. Both run the
// same checks on the way in and on the candidate they produce.
#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <limits>
#include <string>

#include "upright/base/number_text.hpp"
#include "riccati_common.hpp"
#include "schur_reorder.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {
namespace {

using internal::RiccatiProblem;

constexpr double kEpsilon = std::numeric_limits<double>::epsilon();
// Newton–Kleinman steps tried after the subspace method; each is kept only if it lowers the
// residual.
constexpr int kRefinementSteps = 2;
// A candidate X whose antisymmetric part exceeds this share of ‖X‖ did not come from a
// Lagrangian subspace and is rejected.
constexpr double kAsymmetryTolerance = 1e-6;
// Sign iteration: at most this many steps; determinant scaling stops once the relative change
// falls below kSignScalingOff; converged at kSignTolerance or when the change stops shrinking.
constexpr int kSignMaxIterations = 100;
constexpr double kSignScalingOff = 1e-2;
constexpr double kSignTolerance = 1e-14;

// The Hamiltonian [Ā, −αG; −Q̄/α, −Āᵀ] of the scaled unknown Y = X/α. α = √(‖Q̄‖/‖G‖) balances
// the two off-diagonal blocks; the scaling is a similarity, so the eigenvalues are those of the
// unscaled Hamiltonian.
struct ScaledHamiltonian {
  Eigen::MatrixXd H;
  double alpha = 1;
};

ScaledHamiltonian BuildHamiltonian(const RiccatiProblem& problem) {
  const Eigen::Index n = problem.A.rows();
  ScaledHamiltonian result;
  const double g_norm = problem.G.norm();
  const double q_norm = problem.Q_bar.norm();
  if (g_norm > 0 && q_norm > 0) result.alpha = std::sqrt(q_norm / g_norm);
  result.H.resize(2 * n, 2 * n);
  result.H << problem.A_bar, -result.alpha * problem.G, -problem.Q_bar / result.alpha,
      -problem.A_bar.transpose();
  return result;
}

// kNoStabilisingSolution when an eigenvalue of the Hamiltonian lies within
// kBoundaryTolerance·‖H‖_F of the imaginary axis: then no stabilising solution exists.
Result<void, SolveError> CheckOffImaginaryAxis(const Eigen::VectorXcd& eigenvalues, double h_norm) {
  Eigen::Index index = 0;
  const double closest = eigenvalues.real().cwiseAbs().minCoeff(&index);
  if (closest > internal::kBoundaryTolerance * h_norm) return {};
  return internal::Fail(SolveFailure::kNoStabilisingSolution,
                        "Hamiltonian eigenvalue " + ComplexText(eigenvalues(index), 6) +
                            " lies on the imaginary axis (|Re λ| ≤ " +
                            SignificantText(internal::kBoundaryTolerance, 6) +
                            "·‖H‖_F = " + SignificantText(internal::kBoundaryTolerance * h_norm, 6) +
                            "): no stabilising solution");
}

// Checks every CARE solver runs before it starts: valid input and a stabilisable pair.
Result<RiccatiProblem, SolveError> PrepareCare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                               const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                                               const Eigen::MatrixXd& S) {
  Result<RiccatiProblem, SolveError> problem =
      internal::PrepareRiccatiProblem(A, B, Q, R, S, "CARE");
  if (!problem) return problem;
  if (auto stabilisable = internal::CheckStabilisable(problem->A, problem->B, false);
      !stabilisable) {
    return Failure(stabilisable.error());
  }
  return problem;
}

// Newton–Kleinman: with A_c = A − B K(X), the correction Δ solves A_cᵀΔ + ΔA_c + res(X) = 0.
// A step is kept only when it lowers the relative residual.
Eigen::MatrixXd RefineCare(const RiccatiProblem& problem, Eigen::MatrixXd X) {
  Eigen::MatrixXd residual;
  double relative = internal::CareResidual(problem, X, &residual);
  for (int step = 0; step < kRefinementSteps; ++step) {
    const Eigen::MatrixXd closed_loop = problem.A - problem.B * internal::CareGain(problem, X);
    const Result<Eigen::MatrixXd, SolveError> correction =
        SolveLyapunov(closed_loop.transpose(), residual);
    if (!correction) break;
    Eigen::MatrixXd candidate = X + *correction;
    candidate = 0.5 * (candidate + candidate.transpose()).eval();
    Eigen::MatrixXd candidate_residual;
    const double candidate_relative =
        internal::CareResidual(problem, candidate, &candidate_residual);
    if (!(candidate_relative < relative)) break;
    X = std::move(candidate);
    residual = std::move(candidate_residual);
    relative = candidate_relative;
  }
  return X;
}

// The checks on a candidate: symmetry, then (after refinement when asked for) the residual, a
// Hurwitz closed loop, and X ≥ 0 when required.
enum class Refinement { kNone, kNewton };

Result<RiccatiSolution, SolveError> ValidateCare(const RiccatiProblem& problem, Eigen::MatrixXd X,
                                                 Refinement refinement,
                                                 const RiccatiOptions& options) {
  const double asymmetry = (X - X.transpose()).norm();
  if (!(asymmetry <= kAsymmetryTolerance * X.norm())) {
    return internal::Fail(SolveFailure::kIllConditioned,
                          "the candidate X is not symmetric (‖X − Xᵀ‖_F = " +
                              SignificantText(asymmetry, 6) + ", ‖X‖_F = " + SignificantText(X.norm(), 6) +
                              "): the stable subspace was not computed reliably");
  }
  X = 0.5 * (X + X.transpose()).eval();
  if (refinement == Refinement::kNewton) X = RefineCare(problem, X);
  RiccatiSolution solution;
  solution.X = X;
  Eigen::MatrixXd residual;
  solution.relative_residual = internal::CareResidual(problem, X, &residual);
  if (!(solution.relative_residual <= options.residual_tolerance)) {
    return internal::Fail(SolveFailure::kResidualTooLarge,
                          "relative residual " + SignificantText(solution.relative_residual, 6) +
                              " exceeds the tolerance " + SignificantText(options.residual_tolerance, 6));
  }
  const Eigen::MatrixXd closed_loop = problem.A - problem.B * internal::CareGain(problem, X);
  const std::complex<double> rightmost = internal::RightmostEigenvalue(closed_loop);
  if (!(rightmost.real() < 0)) {
    return internal::Fail(SolveFailure::kNoStabilisingSolution,
                          "closed loop A − BK has the eigenvalue " + ComplexText(rightmost, 6) +
                              ", not in the open left half-plane: X is not stabilising");
  }
  if (options.require_psd) {
    if (auto semidefinite = internal::CheckSemidefinite(X); !semidefinite) {
      return Failure(semidefinite.error());
    }
  }
  return solution;
}

// σ_min/σ_max of a (non-empty) basis matrix; 0 when the matrix vanishes.
double ReciprocalCondition(const Eigen::MatrixXcd& matrix) {
  const Eigen::VectorXd sigma = Eigen::JacobiSVD<Eigen::MatrixXcd>(matrix).singularValues();
  return sigma(0) > 0 ? sigma(sigma.size() - 1) / sigma(0) : 0;
}

}  // namespace

Result<RiccatiSolution, SolveError> SolveCare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                              const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                                              const Eigen::MatrixXd& S,
                                              const RiccatiOptions& options) {
  const Result<RiccatiProblem, SolveError> prepared = PrepareCare(A, B, Q, R, S);
  if (!prepared) return Failure(prepared.error());
  const RiccatiProblem& problem = *prepared;
  const Eigen::Index n = problem.A.rows();

  const ScaledHamiltonian hamiltonian = BuildHamiltonian(problem);
  Eigen::ComplexSchur<Eigen::MatrixXcd> schur(hamiltonian.H.cast<std::complex<double>>());
  if (schur.info() != Eigen::Success) {
    return internal::Fail(SolveFailure::kIllConditioned,
                          "the Schur decomposition of the Hamiltonian did not converge");
  }
  Eigen::MatrixXcd T = schur.matrixT();
  Eigen::MatrixXcd U = schur.matrixU();
  if (auto off_axis = CheckOffImaginaryAxis(T.diagonal(), hamiltonian.H.norm()); !off_axis) {
    return Failure(off_axis.error());
  }
  const Eigen::Index stable =
      internal::ReorderSchur(&T, &U, [](std::complex<double> z) { return z.real() < 0; });
  if (stable != n) {
    return internal::Fail(SolveFailure::kNoStabilisingSolution,
                          "the Hamiltonian has " + std::to_string(stable) +
                              " eigenvalues in the open left half-plane, expected " +
                              std::to_string(n));
  }

  // The stable subspace is spanned by [U11; U21] = [I; Y] U11, so Y = U21 U11⁻¹.
  const Eigen::MatrixXcd u11 = U.topLeftCorner(n, n);
  const Eigen::MatrixXcd u21 = U.bottomLeftCorner(n, n);
  const double rcond = ReciprocalCondition(u11);
  if (!(rcond > internal::kRcondTolerance)) {
    return internal::Fail(SolveFailure::kIllConditioned,
                          "the stable-subspace basis U11 has rcond " + SignificantText(rcond, 6) +
                              ", singular to working precision: X would be unbounded");
  }
  const Eigen::MatrixXcd y_transpose = u11.transpose().partialPivLu().solve(u21.transpose());
  const Eigen::MatrixXd X = hamiltonian.alpha * y_transpose.transpose().real();
  return ValidateCare(problem, X, Refinement::kNewton, options);
}

Result<RiccatiSolution, SolveError> SolveCareBySign(
    const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, const Eigen::MatrixXd& Q,
    const Eigen::MatrixXd& R, const Eigen::MatrixXd& S, const RiccatiOptions& options) {
  const Result<RiccatiProblem, SolveError> prepared = PrepareCare(A, B, Q, R, S);
  if (!prepared) return Failure(prepared.error());
  const RiccatiProblem& problem = *prepared;
  const Eigen::Index n = problem.A.rows();
  const Eigen::Index size = 2 * n;

  const ScaledHamiltonian hamiltonian = BuildHamiltonian(problem);
  if (auto off_axis = CheckOffImaginaryAxis(hamiltonian.H.eigenvalues(), hamiltonian.H.norm());
      !off_axis) {
    return Failure(off_axis.error());
  }

  // Z ← ½(cZ + (cZ)⁻¹) with c = |det Z|^(−1/2n) until the step stops changing Z.
  Eigen::MatrixXd Z = hamiltonian.H;
  bool scaling = true;
  bool converged = false;
  double previous_change = std::numeric_limits<double>::infinity();
  for (int iteration = 0; iteration < kSignMaxIterations && !converged; ++iteration) {
    const Eigen::PartialPivLU<Eigen::MatrixXd> lu(Z);
    double c = 1;
    if (scaling) {
      const double log_det = lu.matrixLU().diagonal().cwiseAbs().array().log().sum();
      c = std::exp(-log_det / static_cast<double>(size));
    }
    if (!std::isfinite(c) || !(lu.rcond() > kEpsilon)) {
      return internal::Fail(
          SolveFailure::kIllConditioned,
          "the sign iteration met a singular iterate (rcond " + SignificantText(lu.rcond(), 6) + ")");
    }
    const Eigen::MatrixXd next = 0.5 * (c * Z + lu.inverse() / c);
    const double change = (next - Z).lpNorm<1>() / next.lpNorm<1>();
    Z = next;
    if (change < kSignScalingOff) scaling = false;
    converged = change <= kSignTolerance || (!scaling && change >= previous_change);
    previous_change = change;
  }
  if (!converged) {
    return internal::Fail(
        SolveFailure::kIllConditioned,
        "the sign iteration did not converge in " + std::to_string(kSignMaxIterations) + " steps");
  }

  // (W + I) [I; Y] = 0 on the stable subspace: [W12; W22 + I] Y = −[W11 + I; W21].
  Eigen::MatrixXd lhs(size, n), rhs(size, n);
  lhs << Z.topRightCorner(n, n), Z.bottomRightCorner(n, n) + Eigen::MatrixXd::Identity(n, n);
  rhs << Z.topLeftCorner(n, n) + Eigen::MatrixXd::Identity(n, n), Z.bottomLeftCorner(n, n);
  const double rcond = ReciprocalCondition(lhs.cast<std::complex<double>>());
  if (!(rcond > internal::kRcondTolerance)) {
    return internal::Fail(SolveFailure::kIllConditioned,
                          "[W12; W22 + I] from the sign function is rank deficient (rcond " +
                              SignificantText(rcond, 6) + "): X would be unbounded");
  }
  const Eigen::MatrixXd X = hamiltonian.alpha * lhs.colPivHouseholderQr().solve(-rhs);
  return ValidateCare(problem, X, Refinement::kNone, options);
}

}  // namespace upright::design
