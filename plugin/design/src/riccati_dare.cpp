// Discrete algebraic Riccati equation: structure-preserving doubling, then Hewer (Newton)
// refinement, then the checks every Riccati solver runs on its candidate.
#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <limits>
#include <string>

#include "upright/base/number_text.hpp"
#include "riccati_common.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {
namespace {

using internal::RiccatiProblem;

// Doubling squares the convergence factor each step, so 100 steps only run out when the symplectic
// pencil has eigenvalues on the unit circle (convergence then turns linear).
constexpr int kDoublingMaxIterations = 100;
// Converged when H_k changes by at most this share of its size, or stops shrinking once small.
constexpr double kDoublingTolerance = 1e-15;
constexpr double kDoublingStagnation = 1e-8;
constexpr int kRefinementSteps = 2;

// Hewer's step: with A_c = A − B K(X), the correction Δ solves A_cᵀΔA_c − Δ + res(X) = 0.
// A step is kept only when it lowers the relative residual.
Eigen::MatrixXd RefineDare(const RiccatiProblem& problem, Eigen::MatrixXd X) {
  Eigen::MatrixXd residual;
  double relative = internal::DareResidual(problem, X, &residual);
  for (int step = 0; step < kRefinementSteps && std::isfinite(relative); ++step) {
    const Eigen::MatrixXd closed_loop = problem.A - problem.B * internal::DareGain(problem, X);
    const Result<Eigen::MatrixXd, SolveError> correction =
        SolveDiscreteLyapunov(closed_loop.transpose(), residual);
    if (!correction) break;
    Eigen::MatrixXd candidate = X + *correction;
    candidate = 0.5 * (candidate + candidate.transpose()).eval();
    Eigen::MatrixXd candidate_residual;
    const double candidate_relative =
        internal::DareResidual(problem, candidate, &candidate_residual);
    if (!(candidate_relative < relative)) break;
    X = std::move(candidate);
    residual = std::move(candidate_residual);
    relative = candidate_relative;
  }
  return X;
}

}  // namespace

Result<RiccatiSolution, SolveError> SolveDare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                              const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                                              const Eigen::MatrixXd& S,
                                              const RiccatiOptions& options) {
  const Result<RiccatiProblem, SolveError> prepared =
      internal::PrepareRiccatiProblem(A, B, Q, R, S, "DARE");
  if (!prepared) return Failure(prepared.error());
  const RiccatiProblem& problem = *prepared;
  if (auto stabilisable = internal::CheckStabilisable(problem.A, problem.B, true); !stabilisable) {
    return Failure(stabilisable.error());
  }
  const Eigen::Index n = problem.A.rows();
  const Eigen::MatrixXd identity = Eigen::MatrixXd::Identity(n, n);

  // With the cross term folded in, X = ĀᵀX(I + GX)⁻¹Ā + Q̄. Doubling (Chu, Fan, Lin 2005):
  //   A_{k+1} = A_k (I + G_k H_k)⁻¹ A_k,  G_{k+1} = G_k + A_k (I + G_k H_k)⁻¹ G_k A_kᵀ,
  //   H_{k+1} = H_k + A_kᵀ H_k (I + G_k H_k)⁻¹ A_k,  from (Ā, G, Q̄); H_k → X.
  Eigen::MatrixXd a_k = problem.A_bar;
  Eigen::MatrixXd g_k = problem.G;
  Eigen::MatrixXd h_k = problem.Q_bar;
  bool converged = false;
  double previous_change = std::numeric_limits<double>::infinity();
  int iteration = 0;
  for (; iteration < kDoublingMaxIterations && !converged; ++iteration) {
    const Eigen::PartialPivLU<Eigen::MatrixXd> lu(identity + g_k * h_k);
    if (!(lu.rcond() > internal::kRcondTolerance)) {
      return internal::Fail(SolveFailure::kIllConditioned,
                            "doubling step " + std::to_string(iteration) +
                                ": I + G_k H_k is singular to working precision (rcond " +
                                SignificantText(lu.rcond(), 6) + ")");
    }
    const Eigen::MatrixXd solved_a = lu.solve(a_k);
    const Eigen::MatrixXd solved_g = lu.solve(g_k);
    Eigen::MatrixXd h_next = h_k + a_k.transpose() * h_k * solved_a;
    Eigen::MatrixXd g_next = g_k + a_k * solved_g * a_k.transpose();
    h_next = 0.5 * (h_next + h_next.transpose()).eval();
    g_next = 0.5 * (g_next + g_next.transpose()).eval();
    a_k = a_k * solved_a;
    if (!h_next.allFinite() || !g_next.allFinite() || !a_k.allFinite()) {
      return internal::Fail(SolveFailure::kNoStabilisingSolution,
                            "doubling diverged at step " + std::to_string(iteration) +
                                ": the symplectic pencil has no stable deflating subspace");
    }
    const double change = (h_next - h_k).norm();
    const double size = h_next.norm();
    converged = change <= kDoublingTolerance * size ||
                (change <= kDoublingStagnation * size && change >= previous_change);
    previous_change = change;
    h_k = std::move(h_next);
    g_k = std::move(g_next);
  }

  Eigen::MatrixXd X = RefineDare(problem, h_k);
  RiccatiSolution solution;
  solution.X = X;
  Eigen::MatrixXd residual;
  solution.relative_residual = internal::DareResidual(problem, X, &residual);
  const Eigen::MatrixXd closed_loop = problem.A - problem.B * internal::DareGain(problem, X);
  const std::complex<double> largest = internal::LargestEigenvalue(closed_loop);
  if (!converged && !(std::abs(largest) < 1)) {
    return internal::Fail(SolveFailure::kNoStabilisingSolution,
                          "doubling did not converge in " + std::to_string(iteration) +
                              " steps and the closed loop has the eigenvalue " +
                              ComplexText(largest, 6) +
                              ": the symplectic pencil has eigenvalues on the unit circle");
  }
  if (!(solution.relative_residual <= options.residual_tolerance)) {
    return internal::Fail(SolveFailure::kResidualTooLarge,
                          "relative residual " + SignificantText(solution.relative_residual, 6) +
                              " exceeds the tolerance " + SignificantText(options.residual_tolerance, 6));
  }
  if (!(std::abs(largest) < 1)) {
    return internal::Fail(SolveFailure::kNoStabilisingSolution,
                          "closed loop A − BK has the eigenvalue " + ComplexText(largest, 6) +
                              " (|λ| = " + SignificantText(std::abs(largest), 6) +
                              "), not inside the unit circle: X is not stabilising");
  }
  if (options.require_psd) {
    if (auto semidefinite = internal::CheckSemidefinite(X); !semidefinite) {
      return Failure(semidefinite.error());
    }
    const Eigen::MatrixXd middle = problem.R + problem.B.transpose() * X * problem.B;
    const double smallest =
        Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd>(middle, Eigen::EigenvaluesOnly)
            .eigenvalues()
            .minCoeff();
    if (!(smallest > 0)) {
      return internal::Fail(
          SolveFailure::kNotPositiveSemidefinite,
          "R + BᵀXB is not positive definite (smallest eigenvalue " + SignificantText(smallest, 6) + ")");
    }
  }
  return solution;
}

}  // namespace upright::design
