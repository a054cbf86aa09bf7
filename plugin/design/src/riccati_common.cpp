// Validation, residuals and verdicts shared by the continuous and discrete Riccati solvers.
#include "riccati_common.hpp"

#include <cmath>
#include <limits>

#include "upright/base/number_text.hpp"

namespace upright::design {

const char* ToString(SolveFailure failure) {
  switch (failure) {
    case SolveFailure::kInvalidInput:
      return "invalid_input";
    case SolveFailure::kNotStabilisable:
      return "not_stabilisable";
    case SolveFailure::kNoStabilisingSolution:
      return "no_stabilising_solution";
    case SolveFailure::kIllConditioned:
      return "ill_conditioned";
    case SolveFailure::kResidualTooLarge:
      return "residual_too_large";
    case SolveFailure::kNotPositiveSemidefinite:
      return "not_positive_semidefinite";
  }
  return "unknown";
}

namespace internal {
namespace {

// Asymmetry accepted in Q and R, relative to their size (products like CᵀC are symmetric only up
// to rounding).
constexpr double kSymmetryTolerance = 1e-12;

std::string SizeText(const Eigen::MatrixXd& matrix) {
  return std::to_string(matrix.rows()) + "x" + std::to_string(matrix.cols());
}

// Each check below: the problem with one input matrix, naming it, or success.
Status CheckSize(const Eigen::MatrixXd& matrix, const char* name, Eigen::Index rows,
                 Eigen::Index cols) {
  if (matrix.rows() == rows && matrix.cols() == cols) return {};
  return Failure(std::string(name) + " is " + SizeText(matrix) + ", expected " +
                 std::to_string(rows) + "x" + std::to_string(cols));
}

Status CheckFinite(const Eigen::MatrixXd& matrix, const char* name) {
  if (matrix.allFinite()) return {};
  return Failure(std::string(name) + " has a non-finite entry");
}

Status CheckSymmetric(const Eigen::MatrixXd& matrix, const char* name) {
  const double asymmetry = (matrix - matrix.transpose()).norm();
  if (asymmetry <= kSymmetryTolerance * matrix.norm()) return {};
  return Failure(std::string(name) + " is not symmetric: ‖" + name + " − " + name +
                 "ᵀ‖_F = " + SignificantText(asymmetry, 6) + " > " + SignificantText(kSymmetryTolerance, 6) +
                 "·‖" + name + "‖_F = " + SignificantText(kSymmetryTolerance * matrix.norm(), 6));
}

// The input's first problem, in the order sizes, finiteness, symmetry.
Status CheckInput(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, const Eigen::MatrixXd& Q,
                  const Eigen::MatrixXd& R, const Eigen::MatrixXd& S) {
  const Eigen::Index n = A.rows();
  const Eigen::Index m = B.cols();
  for (const Status& check :
       {CheckSize(B, "B", n, m), CheckSize(Q, "Q", n, n), CheckSize(R, "R", m, m),
        S.size() != 0 ? CheckSize(S, "S", n, m) : Status()}) {
    if (!check) return check;
  }
  for (const Status& check :
       {CheckFinite(A, "A"), CheckFinite(B, "B"), CheckFinite(Q, "Q"), CheckFinite(R, "R"),
        CheckFinite(S, "S"), CheckSymmetric(Q, "Q"), CheckSymmetric(R, "R")}) {
    if (!check) return check;
  }
  return {};
}

}  // namespace

Result<RiccatiProblem, SolveError> PrepareRiccatiProblem(
    const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, const Eigen::MatrixXd& Q,
    const Eigen::MatrixXd& R, const Eigen::MatrixXd& S, const char* equation) {
  const Eigen::Index n = A.rows();
  const Eigen::Index m = B.cols();
  const auto invalid = [equation](const std::string& why) {
    return Fail(SolveFailure::kInvalidInput, std::string(equation) + ": " + why);
  };
  if (n == 0 || A.cols() != n)
    return invalid("A is " + SizeText(A) + ", expected a non-empty square");
  if (m == 0) return invalid("B has no columns (pass a zero column for no input)");
  if (Status input = CheckInput(A, B, Q, R, S); !input) return invalid(input.error());

  RiccatiProblem result;
  RiccatiProblem* problem = &result;
  problem->A = A;
  problem->B = B;
  problem->Q = 0.5 * (Q + Q.transpose());
  problem->R = 0.5 * (R + R.transpose());
  problem->S = S.size() == 0 ? Eigen::MatrixXd::Zero(n, m) : S;

  const Eigen::VectorXd r_eigenvalues =
      Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd>(problem->R, Eigen::EigenvaluesOnly)
          .eigenvalues();
  const double r_largest = r_eigenvalues.cwiseAbs().maxCoeff();
  const double r_smallest = r_eigenvalues.cwiseAbs().minCoeff();
  if (!(r_smallest > kRcondTolerance * r_largest)) {
    return invalid("R is singular or nearly so (eigenvalue moduli from " +
                   SignificantText(r_smallest, 6) + " to " + SignificantText(r_largest, 6) + ")");
  }
  problem->R_lu.compute(problem->R);
  const Eigen::MatrixXd r_inv_st = problem->R_lu.solve(problem->S.transpose());
  const Eigen::MatrixXd r_inv_bt = problem->R_lu.solve(problem->B.transpose());
  problem->A_bar = problem->A - problem->B * r_inv_st;
  problem->G = problem->B * r_inv_bt;
  problem->G = 0.5 * (problem->G + problem->G.transpose()).eval();
  problem->Q_bar = problem->Q - problem->S * r_inv_st;
  problem->Q_bar = 0.5 * (problem->Q_bar + problem->Q_bar.transpose()).eval();
  return result;
}

Result<void, SolveError> CheckStabilisable(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                           bool discrete) {
  const Eigen::Index n = A.rows();
  const Eigen::Index m = B.cols();
  const double scale = std::max(1.0, A.norm());
  const double rank_scale = std::sqrt(A.squaredNorm() + B.squaredNorm());
  const Eigen::VectorXcd eigenvalues = A.eigenvalues();
  for (const std::complex<double> lambda : eigenvalues) {
    const bool unstable = discrete ? std::abs(lambda) >= 1 - kBoundaryTolerance
                                   : lambda.real() >= -kBoundaryTolerance * scale;
    if (!unstable) continue;
    Eigen::MatrixXcd pbh(n, n + m);
    pbh.leftCols(n) = A.cast<std::complex<double>>();
    pbh.leftCols(n).diagonal().array() -= lambda;
    pbh.rightCols(m) = B.cast<std::complex<double>>();
    const double sigma_min = Eigen::JacobiSVD<Eigen::MatrixXcd>(pbh).singularValues()(n - 1);
    if (sigma_min <= 1e-10 * rank_scale) {
      return Fail(
          SolveFailure::kNotStabilisable,
          std::string("(A, B) is not stabilisable: the mode λ = ") + ComplexText(lambda, 6) +
              " of A is " +
              (discrete ? "not inside the unit circle" : "not in the open left half-plane") +
              " and cannot be moved by B (PBH: smallest singular value of [A − λI, B] is " +
              SignificantText(sigma_min, 6) + ")");
    }
  }
  return {};
}

double CareResidual(const RiccatiProblem& problem, const Eigen::MatrixXd& X,
                    Eigen::MatrixXd* residual) {
  const Eigen::MatrixXd at_x = problem.A.transpose() * X;
  const Eigen::MatrixXd xb_s = X * problem.B + problem.S;
  const Eigen::MatrixXd quadratic = xb_s * problem.R_lu.solve(xb_s.transpose());
  *residual = at_x + at_x.transpose() - quadratic + problem.Q;
  const double scale = problem.Q.norm() + 2 * at_x.norm() + quadratic.norm();
  return scale > 0 ? residual->norm() / scale : residual->norm();
}

double DareResidual(const RiccatiProblem& problem, const Eigen::MatrixXd& X,
                    Eigen::MatrixXd* residual) {
  const Eigen::MatrixXd at_x_a = problem.A.transpose() * X * problem.A;
  const Eigen::MatrixXd at_x_b_s = problem.A.transpose() * X * problem.B + problem.S;
  const Eigen::MatrixXd middle = problem.R + problem.B.transpose() * X * problem.B;
  const Eigen::FullPivLU<Eigen::MatrixXd> middle_lu(middle);
  if (!middle_lu.isInvertible() || middle_lu.rcond() < kRcondTolerance) {
    *residual =
        Eigen::MatrixXd::Constant(X.rows(), X.cols(), std::numeric_limits<double>::infinity());
    return std::numeric_limits<double>::infinity();
  }
  const Eigen::MatrixXd quadratic = at_x_b_s * middle_lu.solve(at_x_b_s.transpose());
  *residual = at_x_a - X - quadratic + problem.Q;
  const double scale = problem.Q.norm() + at_x_a.norm() + X.norm() + quadratic.norm();
  return scale > 0 ? residual->norm() / scale : residual->norm();
}

Eigen::MatrixXd CareGain(const RiccatiProblem& problem, const Eigen::MatrixXd& X) {
  return problem.R_lu.solve(problem.B.transpose() * X + problem.S.transpose());
}

Eigen::MatrixXd DareGain(const RiccatiProblem& problem, const Eigen::MatrixXd& X) {
  const Eigen::MatrixXd middle = problem.R + problem.B.transpose() * X * problem.B;
  return middle.fullPivLu().solve(problem.B.transpose() * X * problem.A + problem.S.transpose());
}

tl::unexpected<SolveError> Fail(SolveFailure reason, std::string message) {
  return Failure(SolveError{reason, std::move(message)});
}

Result<void, SolveError> CheckSemidefinite(const Eigen::MatrixXd& X) {
  const Eigen::VectorXd eigenvalues =
      Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd>(X, Eigen::EigenvaluesOnly).eigenvalues();
  const double largest = eigenvalues.cwiseAbs().maxCoeff();
  const double smallest = eigenvalues.minCoeff();
  if (smallest >= -kPsdTolerance * largest) return {};
  return Fail(SolveFailure::kNotPositiveSemidefinite,
              "X is not positive semidefinite: smallest eigenvalue " + SignificantText(smallest, 6) +
                  " < −" + SignificantText(kPsdTolerance, 6) +
                  "·‖X‖₂ = " + SignificantText(-kPsdTolerance * largest, 6));
}

std::complex<double> RightmostEigenvalue(const Eigen::MatrixXd& matrix) {
  const Eigen::VectorXcd eigenvalues = matrix.eigenvalues();
  Eigen::Index index = 0;
  eigenvalues.real().maxCoeff(&index);
  return eigenvalues(index);
}

std::complex<double> LargestEigenvalue(const Eigen::MatrixXd& matrix) {
  const Eigen::VectorXcd eigenvalues = matrix.eigenvalues();
  Eigen::Index index = 0;
  eigenvalues.cwiseAbs().maxCoeff(&index);
  return eigenvalues(index);
}

}  // namespace internal
}  // namespace upright::design
