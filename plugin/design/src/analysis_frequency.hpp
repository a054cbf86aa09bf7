// Frequency-domain building blocks of the closed-loop analysis: a state-space model (or a matrix)
// and a frequency in; complex responses, largest singular values, stability verdicts, and
// eigenvalues and generalised eigenvalues near the imaginary axis out. Private to upright::design.
#pragma once

#include <Eigen/Dense>
#include <Eigen/Eigenvalues>
#include <algorithm>
#include <cmath>
#include <complex>
#include <limits>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "upright/design/analysis.hpp"

namespace upright::design::internal {

using Complex = std::complex<double>;

inline constexpr double kInf = std::numeric_limits<double>::infinity();
inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// jωI − A counts as singular (a pole of the loop on the imaginary axis at ω, such as an integrator)
// below this reciprocal condition number.
inline constexpr double kSingularRcond = 1e-14;

// An eigenvalue counts as unstable when Re λ ≥ −kStabilityTolerance · max|λ(A)|: poles that close
// to the imaginary axis are indistinguishable from it in double precision.
inline constexpr double kStabilityTolerance = 1e-12;

// Checks the sizes of a system and fills in an empty D with zeros: A n×n, B n×m, C p×n, D p×m.
// With n = 0, B and C may be empty and D gives p and m. A failure names the matrix at fault.
inline Status CheckAndNormalise(StateSpace* s) {
  const auto size = [](const Eigen::MatrixXd& m) {
    return std::to_string(m.rows()) + "×" + std::to_string(m.cols());
  };
  if (s->A.rows() != s->A.cols()) return Failure("A is " + size(s->A) + ", must be square");
  const Eigen::Index n = s->A.rows();
  if (n == 0 && s->B.size() == 0 && s->C.size() == 0) {
    s->B.resize(0, s->D.cols());
    s->C.resize(s->D.rows(), 0);
  }
  if (s->B.rows() != n) {
    return Failure("B is " + size(s->B) + ", must have the " + std::to_string(n) + " rows of A");
  }
  if (s->C.cols() != n) {
    return Failure("C is " + size(s->C) + ", must have the " + std::to_string(n) + " columns of A");
  }
  if (s->D.size() == 0) s->D = Eigen::MatrixXd::Zero(s->C.rows(), s->B.cols());
  if (s->D.rows() != s->C.rows() || s->D.cols() != s->B.cols()) {
    return Failure("D is " + size(s->D) + ", must be " + std::to_string(s->C.rows()) + "×" +
                   std::to_string(s->B.cols()) + " (rows of C × columns of B)");
  }
  if (!s->A.allFinite() || !s->B.allFinite() || !s->C.allFinite() || !s->D.allFinite()) {
    return Failure("the system matrices contain a non-finite entry");
  }
  return {};
}

// The power of two f that balances a column 1-norm c against a row 1-norm r (c f ≈ r / f), or 1
// when scaling would not shrink c + r by 5 % (the test of LAPACK dgebal).
inline double BalanceFactor(double c, double r) {
  constexpr double kRadix = 2.0;
  const double before = c + r;
  double f = 1;
  while (c < r / kRadix && f < 1e150) {
    c *= kRadix;
    r /= kRadix;
    f *= kRadix;
  }
  while (c >= r * kRadix && f > 1e-150) {
    c /= kRadix;
    r *= kRadix;
    f /= kRadix;
  }
  return c + r < 0.95 * before ? f : 1.0;
}

// Diagonal similarity by powers of two that balances the off-diagonal row and column 1-norms
// (Parlett and Reinsch 1969; LAPACK dgebal without permutations). The eigenvalues are unchanged
// and come out more accurately for badly scaled matrices.
inline Eigen::MatrixXd Balance(Eigen::MatrixXd m) {
  constexpr int kMaxSweeps = 100;
  const Eigen::Index n = m.rows();
  bool converged = false;
  for (int sweep = 0; sweep < kMaxSweeps && !converged; ++sweep) {
    converged = true;
    for (Eigen::Index i = 0; i < n; ++i) {
      double c = m.col(i).cwiseAbs().sum() - std::abs(m(i, i));
      double r = m.row(i).cwiseAbs().sum() - std::abs(m(i, i));
      if (!(c > 0) || !(r > 0) || !std::isfinite(c + r)) continue;
      const double f = BalanceFactor(c, r);
      if (f != 1) {
        converged = false;
        m.row(i) /= f;
        m.col(i) *= f;
      }
    }
  }
  return m;
}

// Rescales the states of a system, x → T x with T diagonal (powers of two), so that the rows and
// columns of [A B; C D] that belong to each state have balanced 1-norms (the idea of Balance
// applied to the whole realisation). The transfer function is unchanged; the frequency response and
// the eigenvalue problems built from the realisation become better conditioned when the states
// have very different scales, such as a large state-feedback gain.
inline void BalanceStates(StateSpace* s) {
  constexpr int kMaxSweeps = 100;
  const Eigen::Index n = s->A.rows();
  bool converged = false;
  for (int sweep = 0; sweep < kMaxSweeps && !converged; ++sweep) {
    converged = true;
    for (Eigen::Index i = 0; i < n; ++i) {
      const double diagonal = std::abs(s->A(i, i));
      double c = s->A.col(i).cwiseAbs().sum() + s->C.col(i).cwiseAbs().sum() - diagonal;
      double r = s->A.row(i).cwiseAbs().sum() + s->B.row(i).cwiseAbs().sum() - diagonal;
      if (!(c > 0) || !(r > 0) || !std::isfinite(c + r)) continue;
      const double f = BalanceFactor(c, r);
      if (f != 1) {
        converged = false;
        s->A.row(i) /= f;
        s->B.row(i) /= f;
        s->A.col(i) *= f;
        s->C.col(i) *= f;
      }
    }
  }
}

// Eigenvalues of a real square matrix, computed after balancing; nullopt if the QR iteration
// fails or the matrix is not finite.
inline std::optional<Eigen::VectorXcd> Eigenvalues(const Eigen::MatrixXd& m) {
  if (m.rows() == 0) return Eigen::VectorXcd();
  if (!m.allFinite()) return std::nullopt;
  Eigen::EigenSolver<Eigen::MatrixXd> solver(Balance(m), false);
  if (solver.info() != Eigen::Success) return std::nullopt;
  return Eigen::VectorXcd(solver.eigenvalues());
}

// Finite eigenvalues of the pencil M − sN (N may be singular), those with |s| ≤ 1e10 · ‖M‖_F;
// nullopt if the QZ iteration fails.
inline std::optional<Eigen::VectorXcd> FinitePencilEigenvalues(const Eigen::MatrixXd& m,
                                                               const Eigen::MatrixXd& n) {
  if (m.rows() == 0) return Eigen::VectorXcd();
  if (!m.allFinite() || !n.allFinite()) return std::nullopt;
  Eigen::GeneralizedEigenSolver<Eigen::MatrixXd> solver(m, n, false);
  if (solver.info() != Eigen::Success) return std::nullopt;
  const double limit = 1e10 * std::max(m.norm(), 1e-300);
  std::vector<Complex> finite;
  for (Eigen::Index i = 0; i < m.rows(); ++i) {
    const Complex alpha = solver.alphas()(i);
    const double beta = solver.betas()(i);
    if (std::abs(alpha) <= limit * std::abs(beta)) finite.push_back(alpha / beta);
  }
  return Eigen::Map<Eigen::VectorXcd>(finite.data(), static_cast<Eigen::Index>(finite.size()));
}

// The non-negative frequencies ω of eigenvalues λ close to the imaginary axis,
// |Re λ| ≤ 1e-3 |λ| + 1e-8 · scale, sorted and without duplicates. The test is deliberately loose
// (ill-conditioned realisations move imaginary eigenvalues off the axis by far more than the
// rounding error): callers verify each candidate by evaluating the frequency response.
inline std::vector<double> NearImaginaryAxis(const Eigen::VectorXcd& eigenvalues, double scale) {
  std::vector<double> omegas;
  for (const Complex& lambda : eigenvalues) {
    if (lambda.imag() < 0) continue;
    if (std::abs(lambda.real()) <= 1e-3 * std::abs(lambda) + 1e-8 * scale) {
      omegas.push_back(lambda.imag());
    }
  }
  std::sort(omegas.begin(), omegas.end());
  std::vector<double> unique;
  for (double w : omegas) {
    if (unique.empty() || w - unique.back() > 1e-12 * std::max(w, 1e-300)) unique.push_back(w);
  }
  return unique;
}

// The rightmost eigenvalue of A when it is not safely in the open left half-plane (see
// kStabilityTolerance), nullopt when A is Hurwitz. A failed eigenvalue computation counts as
// unstable and reports NaN.
inline std::optional<Complex> UnstableEigenvalue(const Eigen::MatrixXd& a) {
  const std::optional<Eigen::VectorXcd> eigenvalues = Eigenvalues(a);
  if (!eigenvalues) return Complex(kNaN, kNaN);
  if (eigenvalues->size() == 0) return std::nullopt;
  Eigen::Index rightmost = 0;
  eigenvalues->real().maxCoeff(&rightmost);
  const double scale = eigenvalues->cwiseAbs().maxCoeff();
  const Complex lambda = (*eigenvalues)(rightmost);
  if (lambda.real() >= -kStabilityTolerance * scale) return lambda;
  return std::nullopt;
}

// G(jω) = C (jωI − A)⁻¹ B + D, or D at ω = inf; nullopt when the result is not finite (jω is a
// pole). The system must have consistent sizes with D p×m.
inline std::optional<Eigen::MatrixXcd> FrequencyResponse(const StateSpace& s, double omega) {
  Eigen::MatrixXcd g = s.D.cast<Complex>();
  if (std::isinf(omega) || s.A.rows() == 0) return g;
  Eigen::MatrixXcd m = -s.A.cast<Complex>();
  m.diagonal().array() += Complex(0, omega);
  g += s.C.cast<Complex>() * m.partialPivLu().solve(s.B.cast<Complex>());
  if (!g.allFinite()) return std::nullopt;
  return g;
}

// σ̄(G), 0 for an empty matrix.
inline double MaxSingularValue(const Eigen::MatrixXcd& g) {
  if (g.size() == 0) return 0;
  if (g.rows() == 1 || g.cols() == 1) return g.norm();
  return Eigen::JacobiSVD<Eigen::MatrixXcd>(g).singularValues()(0);
}

// σ̄(G(jω)); inf at a pole on the imaginary axis.
inline double MaxGain(const StateSpace& s, double omega) {
  const std::optional<Eigen::MatrixXcd> g = FrequencyResponse(s, omega);
  return g ? MaxSingularValue(*g) : kInf;
}

// A SISO response and its slope: L(jω) and dL/dω = −j C (jωI − A)⁻² B; nullopt at a pole, that
// is when jωI − A is numerically singular.
inline std::optional<std::pair<Complex, Complex>> ResponseAndSlope(const StateSpace& s,
                                                                   double omega) {
  const Complex d = s.D(0, 0);
  if (s.A.rows() == 0) return std::pair<Complex, Complex>(d, 0.0);
  Eigen::MatrixXcd m = -s.A.cast<Complex>();
  m.diagonal().array() += Complex(0, omega);
  const Eigen::PartialPivLU<Eigen::MatrixXcd> lu(m);
  if (!(lu.rcond() > kSingularRcond)) return std::nullopt;
  const Eigen::VectorXcd x = lu.solve(s.B.cast<Complex>());
  const Eigen::VectorXcd y = lu.solve(x);
  const Eigen::RowVectorXcd c = s.C.cast<Complex>();
  return std::pair<Complex, Complex>((c * x)(0) + d, Complex(0, -1) * (c * y)(0));
}

}  // namespace upright::design::internal
