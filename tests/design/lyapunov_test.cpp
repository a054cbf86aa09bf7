// Lyapunov solvers against closed forms, an independent Kronecker-product solution and their own
// residuals; zero-order-hold discretisation against closed forms.
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "succeeded.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {
namespace {

using LyapunovResult = Result<Eigen::MatrixXd, SolveError>;

using Eigen::MatrixXd;

MatrixXd Scalar(double value) { return MatrixXd::Constant(1, 1, value); }

MatrixXd RandomMatrix(std::mt19937* rng, int rows, int cols) {
  std::normal_distribution<double> normal;
  MatrixXd matrix(rows, cols);
  for (double& value : matrix.reshaped()) value = normal(*rng);
  return matrix;
}

// A random matrix shifted so that every eigenvalue has real part ≤ −0.5 (continuous) or scaled
// to spectral radius 0.9 (discrete).
MatrixXd RandomStable(std::mt19937* rng, int n, bool discrete) {
  MatrixXd A = RandomMatrix(rng, n, n);
  const Eigen::VectorXcd eigenvalues = A.eigenvalues();
  if (discrete) return A * (0.9 / eigenvalues.cwiseAbs().maxCoeff());
  A.diagonal().array() -= eigenvalues.real().maxCoeff() + 0.5;
  return A;
}

// vec(A X + X Aᵀ) = (I ⊗ A + A ⊗ I) vec(X); vec(A X Aᵀ) = (A ⊗ A) vec(X). An independent solution
// of both equations by one dense solve.
MatrixXd Kronecker(const MatrixXd& left, const MatrixXd& right) {
  MatrixXd product(left.rows() * right.rows(), left.cols() * right.cols());
  for (Eigen::Index i = 0; i < left.rows(); ++i) {
    for (Eigen::Index j = 0; j < left.cols(); ++j) {
      product.block(i * right.rows(), j * right.cols(), right.rows(), right.cols()) =
          left(i, j) * right;
    }
  }
  return product;
}

MatrixXd KroneckerSolution(const MatrixXd& A, const MatrixXd& Q, bool discrete) {
  const Eigen::Index n = A.rows();
  const MatrixXd identity = MatrixXd::Identity(n, n);
  const MatrixXd op = discrete ? MatrixXd(Kronecker(A, A) - Kronecker(identity, identity))
                               : MatrixXd(Kronecker(identity, A) + Kronecker(A, identity));
  const Eigen::VectorXd q = Q.reshaped();
  const Eigen::VectorXd x = op.fullPivLu().solve(-q);
  return x.reshaped(n, n);
}

TEST(SolveLyapunov, ScalarMatchesClosedForm) {
  // a x + x a + q = 0 → x = −q/(2a) (closed form, derived by hand); a = −3, q = 2 → 1/3.
  const LyapunovResult result = SolveLyapunov(Scalar(-3), Scalar(2));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR((*result)(0, 0), 1.0 / 3.0, 1e-15);
}

TEST(SolveLyapunov, DiagonalMatchesClosedForm) {
  // A = diag(λ) gives x_ij = −q_ij / (λ_i + λ_j) (closed form, derived by hand): λ = −1, −2 and
  // Q = ones → X = [1/2 1/3; 1/3 1/4].
  const MatrixXd A{{-1, 0}, {0, -2}};
  const MatrixXd expected{{0.5, 1.0 / 3}, {1.0 / 3, 0.25}};
  const LyapunovResult result = SolveLyapunov(A, MatrixXd::Ones(2, 2));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_LT(((*result) - expected).cwiseAbs().maxCoeff(), 1e-15);
}

TEST(SolveLyapunov, OscillatorGramianMatchesClosedForm) {
  // ẍ + 2ζω ẋ + ω² x = w: A = [0 1; −ω² −2ζω], Q = B Bᵀ = [0 0; 0 1]. The stationary covariance
  // is diag(1/(4ζω³), 1/(4ζω)) (closed form, derived by hand from the two scalar conditions of
  // AX + XAᵀ + Q = 0).
  const double omega = 2.0, zeta = 0.3;
  const MatrixXd A{{0, 1}, {-omega * omega, -2 * zeta * omega}};
  const MatrixXd Q{{0, 0}, {0, 1}};
  const LyapunovResult result = SolveLyapunov(A, Q);
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR((*result)(0, 0), 1 / (4 * zeta * std::pow(omega, 3)), 1e-14);
  EXPECT_NEAR((*result)(1, 1), 1 / (4 * zeta * omega), 1e-14);
  EXPECT_NEAR((*result)(0, 1), 0, 1e-14);
}

TEST(SolveLyapunov, MatchesKroneckerSolutionOnRandomSystems) {
  std::mt19937 rng(7);
  for (int n = 1; n <= 8; ++n) {
    const MatrixXd A = RandomStable(&rng, n, false);
    const MatrixXd G = RandomMatrix(&rng, n, n);
    const MatrixXd Q = G * G.transpose();
    const LyapunovResult result = SolveLyapunov(A, Q);
    ASSERT_TRUE(Succeeded(result));
    const MatrixXd reference = KroneckerSolution(A, Q, false);
    EXPECT_LT(((*result) - reference).norm(), 1e-11 * reference.norm()) << "n " << n;
    const MatrixXd residual = A * (*result) + (*result) * A.transpose() + Q;
    EXPECT_LT(residual.norm(), 1e-13 * (Q.norm() + 2 * A.norm() * (*result).norm())) << "n " << n;
  }
}

TEST(SolveLyapunov, SolvesNonSymmetricRightHandSides) {
  // Q need not be symmetric (Sylvester-like use); the Kronecker solution is the reference.
  std::mt19937 rng(8);
  const MatrixXd A = RandomStable(&rng, 5, false);
  const MatrixXd Q = RandomMatrix(&rng, 5, 5);
  const LyapunovResult result = SolveLyapunov(A, Q);
  ASSERT_TRUE(Succeeded(result));
  const MatrixXd reference = KroneckerSolution(A, Q, false);
  EXPECT_LT(((*result) - reference).norm(), 1e-11 * reference.norm());
}

TEST(SolveLyapunov, UnstableButNonsingularAIsSolved) {
  // The solution is unique whenever λ_i + λ_j ≠ 0, Hurwitz or not: A = diag(1, 2), Q = ones
  // → x_ij = −1/(λ_i + λ_j) (closed form, derived by hand).
  const MatrixXd A{{1, 0}, {0, 2}};
  const MatrixXd expected{{-0.5, -1.0 / 3}, {-1.0 / 3, -0.25}};
  const LyapunovResult result = SolveLyapunov(A, MatrixXd::Ones(2, 2));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_LT(((*result) - expected).cwiseAbs().maxCoeff(), 1e-15);
}

TEST(SolveLyapunov, SingularEquationIsReported) {
  // Eigenvalues 1 and −1 sum to zero: the operator X ↦ AX + XAᵀ is singular.
  const LyapunovResult result = SolveLyapunov(MatrixXd{{1, 0}, {0, -1}}, MatrixXd::Ones(2, 2));
  const SolveError error = FailureOf(result);
  EXPECT_EQ(error.reason, SolveFailure::kIllConditioned) << error.message;
  EXPECT_NE(error.message.find("no unique solution"), std::string::npos) << error.message;
}

TEST(SolveLyapunov, RejectsInvalidInput) {
  EXPECT_EQ(FailureOf(SolveLyapunov(MatrixXd::Zero(2, 3), MatrixXd::Zero(2, 2))).reason,
            SolveFailure::kInvalidInput);
  EXPECT_EQ(FailureOf(SolveLyapunov(MatrixXd::Identity(2, 2), MatrixXd::Zero(3, 3))).reason,
            SolveFailure::kInvalidInput);
  EXPECT_EQ(FailureOf(SolveLyapunov(Scalar(NAN), Scalar(1))).reason, SolveFailure::kInvalidInput);
  EXPECT_EQ(FailureOf(SolveDiscreteLyapunov(MatrixXd(), MatrixXd())).reason,
            SolveFailure::kInvalidInput);
}

TEST(SolveDiscreteLyapunov, ScalarMatchesClosedForm) {
  // a² x − x + q = 0 → x = q/(1 − a²) (closed form, derived by hand); a = 0.5, q = 1 → 4/3.
  const LyapunovResult result = SolveDiscreteLyapunov(Scalar(0.5), Scalar(1));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR((*result)(0, 0), 4.0 / 3.0, 1e-15);
}

TEST(SolveDiscreteLyapunov, MatchesKroneckerSolutionOnRandomSystems) {
  std::mt19937 rng(9);
  for (int n = 1; n <= 8; ++n) {
    const MatrixXd A = RandomStable(&rng, n, true);
    const MatrixXd G = RandomMatrix(&rng, n, n);
    const MatrixXd Q = G * G.transpose();
    const LyapunovResult result = SolveDiscreteLyapunov(A, Q);
    ASSERT_TRUE(Succeeded(result));
    const MatrixXd reference = KroneckerSolution(A, Q, true);
    EXPECT_LT(((*result) - reference).norm(), 1e-11 * reference.norm()) << "n " << n;
    const MatrixXd residual = A * (*result) * A.transpose() - (*result) + Q;
    EXPECT_LT(residual.norm(), 1e-13 * (Q.norm() + (A.norm() * A.norm() + 1) * (*result).norm()))
        << "n " << n;
  }
}

TEST(SolveDiscreteLyapunov, SingularEquationIsReported) {
  // Eigenvalues 2 and 0.5 multiply to one: X ↦ AXAᵀ − X is singular.
  const LyapunovResult result =
      SolveDiscreteLyapunov(MatrixXd{{2, 0}, {0, 0.5}}, MatrixXd::Identity(2, 2));
  EXPECT_EQ(FailureOf(result).reason, SolveFailure::kIllConditioned);
}

TEST(DiscretiseZoh, DoubleIntegratorMatchesClosedForm) {
  // A² = 0, so e^{AT} = I + AT = [1 T; 0 1] and Bd = ∫₀ᵀ e^{Aτ} dτ B = [T²/2; T] (closed form,
  // derived by hand; the textbook result, also from memory).
  const double period_s = 0.005;
  const auto sampled = DiscretiseZoh(MatrixXd{{0, 1}, {0, 0}}, MatrixXd{{0}, {1}}, period_s);
  ASSERT_TRUE(Succeeded(sampled));
  const MatrixXd &Ad = sampled->Ad, &Bd = sampled->Bd;
  const MatrixXd expected_ad{{1, period_s}, {0, 1}};
  const MatrixXd expected_bd{{period_s * period_s / 2}, {period_s}};
  EXPECT_LT((Ad - expected_ad).cwiseAbs().maxCoeff(), 1e-15);
  EXPECT_LT((Bd - expected_bd).cwiseAbs().maxCoeff(), 1e-15);
}

TEST(DiscretiseZoh, FirstOrderMatchesClosedForm) {
  // ẋ = a x + b u: Ad = e^{aT}, Bd = b (e^{aT} − 1)/a (closed form, derived by hand).
  const double a = -3.0, b = 2.0, period_s = 0.1;
  const auto sampled = DiscretiseZoh(Scalar(a), Scalar(b), period_s);
  ASSERT_TRUE(Succeeded(sampled));
  const MatrixXd &Ad = sampled->Ad, &Bd = sampled->Bd;
  EXPECT_NEAR(Ad(0, 0), std::exp(a * period_s), 1e-15);
  EXPECT_NEAR(Bd(0, 0), b * (std::exp(a * period_s) - 1) / a, 1e-15);
}

TEST(DiscretiseZoh, OscillatorMatchesClosedForm) {
  // A = [0 ω; −ω 0], B = [0; 1]: Ad is the rotation [cos ωT, sin ωT; −sin ωT, cos ωT] and
  // Bd = [(1 − cos ωT)/ω; sin ωT/ω] (closed form, derived by hand).
  const double omega = 3.0, period_s = 0.2;
  const auto sampled =
      DiscretiseZoh(MatrixXd{{0, omega}, {-omega, 0}}, MatrixXd{{0}, {1}}, period_s);
  ASSERT_TRUE(Succeeded(sampled));
  const MatrixXd &Ad = sampled->Ad, &Bd = sampled->Bd;
  const double c = std::cos(omega * period_s), s = std::sin(omega * period_s);
  const MatrixXd expected_ad{{c, s}, {-s, c}};
  const MatrixXd expected_bd{{(1 - c) / omega}, {s / omega}};
  EXPECT_LT((Ad - expected_ad).cwiseAbs().maxCoeff(), 1e-14);
  EXPECT_LT((Bd - expected_bd).cwiseAbs().maxCoeff(), 1e-14);
}

TEST(DiscretiseZoh, RefusesInvalidArgumentsWithAFailureInsteadOfThrowing) {
  const SolveError sizes =
      FailureOf(DiscretiseZoh(MatrixXd::Zero(2, 2), MatrixXd::Zero(3, 1), 0.1));
  EXPECT_EQ(sizes.reason, SolveFailure::kInvalidInput);
  EXPECT_EQ(sizes.message,
            "DiscretiseZoh: A is 2x2 and B is 3x1, expected A square and B with as many rows");
  const SolveError period = FailureOf(DiscretiseZoh(Scalar(1), Scalar(1), -0.1));
  EXPECT_EQ(period.reason, SolveFailure::kInvalidInput);
  EXPECT_NE(period.message.find("period_s = -0.1"), std::string::npos) << period.message;
  const SolveError finite = FailureOf(DiscretiseZoh(Scalar(NAN), Scalar(1), 0.1));
  EXPECT_EQ(finite.message, "DiscretiseZoh: A or B has a non-finite entry");
}

}  // namespace
}  // namespace upright::design
