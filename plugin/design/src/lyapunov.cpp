// Continuous and discrete Lyapunov equations by the Bartels–Stewart method on the complex Schur
// form: A = U T Uᴴ turns the equation into a triangular one for Y = Uᴴ X U, solved a column at a
// time from the last, then X = U Y Uᴴ.
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

using Complex = std::complex<double>;

// λ_i + conj(λ_j) (continuous) or λ_i conj(λ_j) − 1 (discrete) smaller than this share of the
// scale makes the equation singular.
constexpr double kSingularTolerance = 1e3 * std::numeric_limits<double>::epsilon();
// Q counts as symmetric (and X is then symmetrised) below this relative asymmetry.
constexpr double kSymmetryTolerance = 1e-12;

// kInvalidInput, starting with `equation`, for sizes that disagree or non-finite entries.
Result<void, SolveError> CheckLyapunovInput(const Eigen::MatrixXd& A, const Eigen::MatrixXd& Q,
                                            const char* equation) {
  const Eigen::Index n = A.rows();
  std::string problem;
  if (n == 0 || A.cols() != n) {
    problem = "A is " + std::to_string(A.rows()) + "x" + std::to_string(A.cols()) +
              ", expected a non-empty square";
  } else if (Q.rows() != n || Q.cols() != n) {
    problem = "Q is " + std::to_string(Q.rows()) + "x" + std::to_string(Q.cols()) + ", expected " +
              std::to_string(n) + "x" + std::to_string(n);
  } else if (!A.allFinite() || !Q.allFinite()) {
    problem = "A or Q has a non-finite entry";
  }
  if (problem.empty()) return {};
  return internal::Fail(SolveFailure::kInvalidInput, std::string(equation) + ": " + problem);
}

// kIllConditioned when the pair (λ_i, λ_j) makes the triangular equation singular.
Result<void, SolveError> CheckPivot(Complex pivot, double scale, Complex lambda_i, Complex lambda_j,
                                    const char* rule) {
  if (std::abs(pivot) > kSingularTolerance * scale) return {};
  return internal::Fail(SolveFailure::kIllConditioned,
                        "A has eigenvalues " + ComplexText(lambda_i, 6) + " and " +
                            ComplexText(lambda_j, 6) + " with " + rule +
                            ": the Lyapunov equation has no unique solution");
}

// X = U Y Uᴴ, symmetrised when Q is symmetric.
Eigen::MatrixXd Finish(const Eigen::MatrixXcd& U, const Eigen::MatrixXcd& Y,
                       const Eigen::MatrixXd& Q) {
  Eigen::MatrixXd X = (U * Y * U.adjoint()).real();
  if ((Q - Q.transpose()).norm() <= kSymmetryTolerance * Q.norm()) {
    X = 0.5 * (X + X.transpose()).eval();
  }
  return X;
}

// A = U T Uᴴ (complex Schur form) and F = Uᴴ Q U, the equation's right side in that basis.
struct SchurForm {
  Eigen::MatrixXcd T, U, F;
};

Result<SchurForm, SolveError> SchurOf(const Eigen::MatrixXd& A, const Eigen::MatrixXd& Q) {
  const Eigen::ComplexSchur<Eigen::MatrixXcd> schur(A.cast<Complex>());
  if (schur.info() != Eigen::Success) {
    return internal::Fail(SolveFailure::kIllConditioned,
                          "the Schur decomposition of A did not converge");
  }
  SchurForm form;
  form.T = schur.matrixT();
  form.U = schur.matrixU();
  form.F = form.U.adjoint() * Q.cast<Complex>() * form.U;
  return form;
}

}  // namespace

Result<Eigen::MatrixXd, SolveError> SolveLyapunov(const Eigen::MatrixXd& A,
                                                  const Eigen::MatrixXd& Q) {
  if (auto input = CheckLyapunovInput(A, Q, "Lyapunov equation"); !input) {
    return Failure(input.error());
  }
  const Eigen::Index n = A.rows();
  const Result<SchurForm, SolveError> form = SchurOf(A, Q);
  if (!form) return Failure(form.error());
  const Eigen::MatrixXcd& T = form->T;
  const Eigen::MatrixXcd& U = form->U;
  const Eigen::MatrixXcd& F = form->F;
  const double scale = std::max(T.norm(), std::numeric_limits<double>::min());

  // Column j of T Y + Y Tᴴ = −F: (T + conj(t_jj) I) y_j = −f_j − Σ_{k>j} y_k conj(t_jk).
  Eigen::MatrixXcd Y = Eigen::MatrixXcd::Zero(n, n);
  for (Eigen::Index j = n - 1; j >= 0; --j) {
    for (Eigen::Index i = 0; i < n; ++i) {
      if (auto pivot = CheckPivot(T(i, i) + std::conj(T(j, j)), scale, T(i, i), T(j, j),
                                  "λ_i + conj(λ_j) = 0");
          !pivot) {
        return Failure(pivot.error());
      }
    }
    const Eigen::Index later = n - 1 - j;
    Eigen::VectorXcd rhs = -F.col(j);
    if (later > 0) rhs -= Y.rightCols(later) * T.row(j).tail(later).adjoint();
    Eigen::MatrixXcd shifted = T;
    shifted.diagonal().array() += std::conj(T(j, j));
    Y.col(j) = shifted.triangularView<Eigen::Upper>().solve(rhs);
  }
  return Finish(U, Y, Q);
}

Result<Eigen::MatrixXd, SolveError> SolveDiscreteLyapunov(const Eigen::MatrixXd& A,
                                                          const Eigen::MatrixXd& Q) {
  if (auto input = CheckLyapunovInput(A, Q, "discrete Lyapunov equation"); !input) {
    return Failure(input.error());
  }
  const Eigen::Index n = A.rows();
  const Result<SchurForm, SolveError> form = SchurOf(A, Q);
  if (!form) return Failure(form.error());
  const Eigen::MatrixXcd& T = form->T;
  const Eigen::MatrixXcd& U = form->U;
  const Eigen::MatrixXcd& F = form->F;
  const double scale = std::max(1.0, T.squaredNorm());

  // Column j of T Y Tᴴ − Y = −F. With p = Σ_{k>j} y_k conj(t_jk) (known columns), column j of
  // Y Tᴴ is conj(t_jj) y_j + p, so (conj(t_jj) T − I) y_j = −f_j − T p.
  Eigen::MatrixXcd Y = Eigen::MatrixXcd::Zero(n, n);
  for (Eigen::Index j = n - 1; j >= 0; --j) {
    for (Eigen::Index i = 0; i < n; ++i) {
      if (auto pivot = CheckPivot(T(i, i) * std::conj(T(j, j)) - 1.0, scale, T(i, i), T(j, j),
                                  "λ_i conj(λ_j) = 1");
          !pivot) {
        return Failure(pivot.error());
      }
    }
    const Eigen::Index later = n - 1 - j;
    Eigen::VectorXcd rhs = -F.col(j);
    if (later > 0) {
      const Eigen::VectorXcd p = Y.rightCols(later) * T.row(j).tail(later).adjoint();
      rhs -= T * p;
    }
    Eigen::MatrixXcd shifted = std::conj(T(j, j)) * T;
    shifted.diagonal().array() -= 1.0;
    Y.col(j) = shifted.triangularView<Eigen::Upper>().solve(rhs);
  }
  return Finish(U, Y, Q);
}

}  // namespace upright::design
