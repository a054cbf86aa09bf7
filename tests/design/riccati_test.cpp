// Riccati solvers against published check values and closed forms, their typed failures, and the
// Schur and sign-function methods against each other. Sources cited as [Key] are listed in
// tests/REFERENCES.md.
#include "upright/design/riccati.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <string>

#include "succeeded.hpp"

namespace upright::design {
namespace {

using RiccatiResult = Result<RiccatiSolution, SolveError>;

using Eigen::MatrixXd;

double RelativeDifference(const MatrixXd& value, const MatrixXd& reference) {
  return (value - reference).norm() / reference.norm();
}

MatrixXd Scalar(double value) { return MatrixXd::Constant(1, 1, value); }

// Eigenvalues of a matrix with real spectrum, ascending.
Eigen::VectorXd SortedRealEigenvalues(const MatrixXd& matrix) {
  const Eigen::VectorXcd eigenvalues = matrix.eigenvalues();
  EXPECT_LT(eigenvalues.imag().cwiseAbs().maxCoeff(), 1e-12);
  Eigen::VectorXd real = eigenvalues.real();
  std::sort(real.begin(), real.end());
  return real;
}

// The scalar H-infinity problem ẋ = a x + w + u, z = [x; u] in the one-solver form:
// B̃ = [B1 B2] = [1 1], R̃ = diag(−γ², 1), S̃ = 0, Q = 1.
struct ScalarHinf {
  MatrixXd A, B, Q, R;
};

ScalarHinf MakeScalarHinf(double a, double gamma) {
  ScalarHinf problem;
  problem.A = Scalar(a);
  problem.B = MatrixXd{{1.0, 1.0}};
  problem.Q = Scalar(1);
  problem.R = MatrixXd{{-gamma * gamma, 0.0}, {0.0, 1.0}};
  return problem;
}

// Closed form of its stabilising solution, X = (a + √(a² + 1 − γ⁻²)) / (1 − γ⁻²): the stabilising
// root of (1 − γ⁻²) X² − 2a X − 1 = 0 (derived by hand).
double ScalarHinfClosedForm(double a, double gamma) {
  const double g = 1 - 1 / (gamma * gamma);
  return (a + std::sqrt(a * a + g)) / g;
}

TEST(SolveCare, DoubleIntegratorMatchesPublishedExample) {
  // X = [√3 1; 1 √3], K = [1 √3], tol 1e-10 ([SB02OD] documentation example; checked
  // numerically).
  const MatrixXd A{{0, 1}, {0, 0}};
  const MatrixXd B{{0}, {1}};
  const MatrixXd Q = MatrixXd::Identity(2, 2);
  const MatrixXd R = Scalar(1);
  const double root3 = std::sqrt(3.0);
  const MatrixXd expected{{root3, 1}, {1, root3}};
  for (const RiccatiResult& result : {SolveCare(A, B, Q, R), SolveCareBySign(A, B, Q, R)}) {
    ASSERT_TRUE(Succeeded(result));
    EXPECT_LT((result->X - expected).cwiseAbs().maxCoeff(), 1e-10);
    const MatrixXd K = R.inverse() * B.transpose() * result->X;
    EXPECT_NEAR(K(0, 0), 1, 1e-10);
    EXPECT_NEAR(K(0, 1), root3, 1e-10);
    EXPECT_LT(result->relative_residual, 1e-12);
  }
}

TEST(SolveCare, OutputWeightedExampleMatchesPublishedValues) {
  // X = [0.5895 1.8216; 1.8216 8.8188], K = [0.6072 2.9396], poles −3.5026, −1.4370, tol 1e-4
  // from the printed digits ([Octave-control, care.m test]; checked numerically).
  const MatrixXd A{{-3, 2}, {1, 1}};
  const MatrixXd B{{0}, {1}};
  const MatrixXd C{{1, -1}};
  const MatrixXd R = Scalar(3);
  const RiccatiResult result = SolveCare(A, B, C.transpose() * C, R);
  ASSERT_TRUE(Succeeded(result));
  const MatrixXd expected{{0.5895, 1.8216}, {1.8216, 8.8188}};
  EXPECT_LT((result->X - expected).cwiseAbs().maxCoeff(), 1e-4);
  const MatrixXd K = R.inverse() * B.transpose() * result->X;
  EXPECT_NEAR(K(0, 0), 0.6072, 1e-4);
  EXPECT_NEAR(K(0, 1), 2.9396, 1e-4);
  const Eigen::VectorXd poles = SortedRealEigenvalues(A - B * K);
  EXPECT_NEAR(poles(0), -3.5026, 1e-4);
  EXPECT_NEAR(poles(1), -1.4370, 1e-4);
}

TEST(SolveCare, GivenQuadraticTermMatchesPublishedExample) {
  // A = [0 1; 0 0], Q = diag(1, 2), G = B R⁻¹ Bᵀ = diag(0, 1) → X = [2 1; 1 2], tol 1e-10
  // ([SB02MD] documentation example). G = diag(0, 1) is B = [0; 1], R = 1.
  const MatrixXd A{{0, 1}, {0, 0}};
  const MatrixXd B{{0}, {1}};
  const MatrixXd Q{{1, 0}, {0, 2}};
  const MatrixXd expected{{2, 1}, {1, 2}};
  const RiccatiResult result = SolveCare(A, B, Q, Scalar(1));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_LT((result->X - expected).cwiseAbs().maxCoeff(), 1e-10);
}

TEST(SolveCare, UnstableExampleMatchesPublishedValues) {
  // X = [[21.72792206, 14.48528137], [14.48528137, 9.65685425]], tol 1e-8 from the printed
  // digits ([SciPy-CARE] example).
  const MatrixXd A{{4, 3}, {-4.5, -3.5}};
  const MatrixXd B{{1}, {-1}};
  const MatrixXd Q{{9, 6}, {6, 4}};
  const MatrixXd expected{{21.72792206, 14.48528137}, {14.48528137, 9.65685425}};
  for (const RiccatiResult& result :
       {SolveCare(A, B, Q, Scalar(1)), SolveCareBySign(A, B, Q, Scalar(1))}) {
    ASSERT_TRUE(Succeeded(result));
    EXPECT_LT((result->X - expected).cwiseAbs().maxCoeff(), 1e-8);
  }
}

TEST(SolveCare, ScalarLqrMatchesClosedForm) {
  // ẋ = x + u, q = r = 1: 2x − x² + 1 = 0, so K = x = 1 + √2 and the pole is 1 − K = −√2, tol
  // 1e-12 (closed form, derived by hand).
  const RiccatiResult result = SolveCare(Scalar(1), Scalar(1), Scalar(1), Scalar(1));
  ASSERT_TRUE(Succeeded(result));
  const double gain = result->X(0, 0);  // K = r⁻¹ b x = x
  EXPECT_NEAR(gain, 1 + std::sqrt(2.0), 1e-12);
  EXPECT_NEAR(1 - gain, -std::sqrt(2.0), 1e-12);
}

TEST(SolveCare, ScalarCrossTermMatchesClosedForm) {
  // a = b = 1, q = 2, r = 1, s = 0.5: (x b + s)² = r (2 a x + q) → x² − x − 1.75 = 0, stabilising
  // root x = (1 + 2√2)/2 (closed form, derived by hand; the other root −0.914 gives the pole
  // +1.41).
  const RiccatiResult result = SolveCare(Scalar(1), Scalar(1), Scalar(2), Scalar(1), Scalar(0.5));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR(result->X(0, 0), (1 + 2 * std::sqrt(2.0)) / 2, 1e-12);
  const RiccatiResult by_sign =
      SolveCareBySign(Scalar(1), Scalar(1), Scalar(2), Scalar(1), Scalar(0.5));
  ASSERT_TRUE(Succeeded(by_sign));
  EXPECT_NEAR(by_sign->X(0, 0), (1 + 2 * std::sqrt(2.0)) / 2, 1e-12);
}

TEST(SolveCare, ScalarHinfIndefiniteRMatchesClosedForm) {
  // γ = 2: a = 1 → X = 3.0971675407, a = −1 → X = 0.4305008740, tol 1e-9 (the closed form
  // above, derived by hand; checked numerically with SciPy and SLICOT SB02OD).
  const struct { double a, expected; } cases[] = {{1.0, 3.0971675407}, {-1.0, 0.4305008740}};
  for (const auto& c : cases) {
    const ScalarHinf p = MakeScalarHinf(c.a, 2.0);
    for (const RiccatiResult& result :
         {SolveCare(p.A, p.B, p.Q, p.R), SolveCareBySign(p.A, p.B, p.Q, p.R)}) {
      ASSERT_TRUE(Succeeded(result)) << "a = " << c.a;
      EXPECT_NEAR(result->X(0, 0), c.expected, 1e-9) << "a = " << c.a;
    }
  }
}

TEST(SolveCare, ScalarHinfSolvableJustAboveOptimalGamma) {
  // For a < 0, γ_opt = 1/√(1 + a²), where a² + 1 − γ⁻² reaches 0 (a = −1: 0.70710678; closed
  // form, derived by hand; checked numerically). 1e-4 above it the stabilising X exists, is ≥ 0,
  // and matches the closed form of ScalarHinfClosedForm.
  const double gamma_opt = 1 / std::sqrt(2.0);
  const double gamma = gamma_opt * (1 + 1e-4);
  const ScalarHinf p = MakeScalarHinf(-1.0, gamma);
  const RiccatiResult result = SolveCare(p.A, p.B, p.Q, p.R);
  ASSERT_TRUE(Succeeded(result));
  EXPECT_GE(result->X(0, 0), 0);
  EXPECT_NEAR(result->X(0, 0), ScalarHinfClosedForm(-1.0, gamma), 1e-9);
}

TEST(SolveCare, ScalarHinfFailsJustBelowOptimalGamma) {
  // a = −1, γ_opt = 1/√2 (derived by hand, as above): 1e-4 below it the Hamiltonian
  // [a, −(1 − γ⁻²); −1, −a] has λ² = 2 − γ⁻² < 0, an imaginary pair: no stabilising solution.
  const double gamma = (1 / std::sqrt(2.0)) * (1 - 1e-4);
  const ScalarHinf p = MakeScalarHinf(-1.0, gamma);
  for (const RiccatiResult& result :
       {SolveCare(p.A, p.B, p.Q, p.R), SolveCareBySign(p.A, p.B, p.Q, p.R)}) {
    EXPECT_EQ(FailureOf(result).reason, SolveFailure::kNoStabilisingSolution);
    EXPECT_NE(FailureOf(result).message.find("imaginary axis"), std::string::npos)
        << FailureOf(result).message;
  }
}

TEST(SolveCare, ScalarHinfIndefiniteSolutionRejectedWhenPsdRequired) {
  // a = 1, γ = 0.9 < γ_opt = 1 (for a ≥ 0, X ≥ 0 needs 1 − γ⁻² > 0; derived by hand): 1 − γ⁻² < 0
  // while a² + 1 − γ⁻² > 0, so the stabilising X = (a + √(a² + 1 − γ⁻²))/(1 − γ⁻²) exists but is
  // negative (closed form, derived by hand). With require_psd it must be refused with the typed
  // reason.
  const ScalarHinf p = MakeScalarHinf(1.0, 0.9);
  const double expected = ScalarHinfClosedForm(1.0, 0.9);
  ASSERT_LT(expected, 0);
  const RiccatiResult strict = SolveCare(p.A, p.B, p.Q, p.R);
  EXPECT_EQ(FailureOf(strict).reason, SolveFailure::kNotPositiveSemidefinite);
  RiccatiOptions lenient;
  lenient.require_psd = false;
  const RiccatiResult result = SolveCare(p.A, p.B, p.Q, p.R, {}, lenient);
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR(result->X(0, 0), expected, 1e-9);
}

TEST(SolveCare, KalmanBucyFilterIsTheDualEquation) {
  // ẋ = −x + w, y = x + v, Q = R = 1: −2P − P² + 1 = 0, P = L = √2 − 1, tol 1e-12 (closed form,
  // derived by hand). The filter equation A P + P Aᵀ − P Cᵀ R⁻¹ C P + Q = 0 is the CARE for
  // (Aᵀ, Cᵀ).
  const MatrixXd A = Scalar(-1);
  const MatrixXd C = Scalar(1);
  const MatrixXd R = Scalar(1);
  const RiccatiResult result = SolveCare(A.transpose(), C.transpose(), Scalar(1), R);
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR(result->X(0, 0), std::sqrt(2.0) - 1, 1e-12);
  const MatrixXd L = result->X * C.transpose() * R.inverse();
  EXPECT_NEAR(L(0, 0), std::sqrt(2.0) - 1, 1e-12);
}

TEST(SolveCare, UncontrollableUnstableModeIsNotStabilisable) {
  // A = diag(1, −1), B = [0; 1]: the mode at 1 is unstable and B cannot reach it.
  const MatrixXd A{{1, 0}, {0, -1}};
  const MatrixXd B{{0}, {1}};
  for (const RiccatiResult& result : {SolveCare(A, B, MatrixXd::Identity(2, 2), Scalar(1)),
                                      SolveCareBySign(A, B, MatrixXd::Identity(2, 2), Scalar(1))}) {
    EXPECT_EQ(FailureOf(result).reason, SolveFailure::kNotStabilisable);
    EXPECT_NE(FailureOf(result).message.find("λ = 1 "), std::string::npos)
        << FailureOf(result).message;
  }
}

TEST(SolveCare, UnobservedOscillatorHasNoStabilisingSolution) {
  // A = [0 1; −1 0] (poles ±i), B = [0; 1] (stabilisable), Q = 0: with Q = 0 the Hamiltonian
  // [A, −BR⁻¹Bᵀ; 0, −Aᵀ] is block triangular, and −Aᵀ = A, so every eigenvalue is ±i. The
  // cheapest control is none at all (X = 0), which leaves the oscillation undamped: no
  // stabilising solution, reported as such.
  const MatrixXd A{{0, 1}, {-1, 0}};
  const MatrixXd B{{0}, {1}};
  const MatrixXd Q = MatrixXd::Zero(2, 2);
  for (const RiccatiResult& result :
       {SolveCare(A, B, Q, Scalar(1)), SolveCareBySign(A, B, Q, Scalar(1))}) {
    EXPECT_EQ(FailureOf(result).reason, SolveFailure::kNoStabilisingSolution);
  }
}

TEST(SolveCare, RejectsInvalidInput) {
  const MatrixXd A{{0, 1}, {0, 0}};
  const MatrixXd B{{0}, {1}};
  const MatrixXd Q = MatrixXd::Identity(2, 2);
  const MatrixXd R = Scalar(1);
  const MatrixXd nan_a{{0, NAN}, {0, 0}};
  const MatrixXd skew_q{{1, 0.5}, {0, 1}};
  const struct {
    const char* what;
    RiccatiResult result;
    const char* fragment;
  } cases[] = {
      {"B rows", SolveCare(A, MatrixXd::Ones(3, 1), Q, R), "B is 3x1, expected 2x1"},
      {"A not square", SolveCare(MatrixXd::Zero(2, 3), B, Q, R), "A is 2x3"},
      {"Q size", SolveCare(A, B, MatrixXd::Identity(3, 3), R), "Q is 3x3"},
      {"R size", SolveCare(A, B, Q, MatrixXd::Identity(2, 2)), "R is 2x2"},
      {"S size", SolveCare(A, B, Q, R, MatrixXd::Zero(1, 2)), "S is 1x2"},
      {"Q asymmetric", SolveCare(A, B, skew_q, R), "Q is not symmetric"},
      {"R singular", SolveCare(A, B, Q, Scalar(0)), "R is singular"},
      {"non-finite", SolveCare(nan_a, B, Q, R), "non-finite"},
      {"sign: Q asymmetric", SolveCareBySign(A, B, skew_q, R), "Q is not symmetric"},
  };
  for (const auto& c : cases) {
    ASSERT_FALSE(c.result.has_value()) << c.what;
    EXPECT_EQ(c.result.error().reason, SolveFailure::kInvalidInput) << c.what;
    EXPECT_NE(c.result.error().message.find(c.fragment), std::string::npos)
        << c.what << ": " << c.result.error().message;
  }
}

// A random stabilisable and detectable problem: A, B Gaussian (controllable with probability 1),
// Q = CᵀC, R = DᵀD + I, or with a cross term from z = C x + D u: Q = CᵀC, S = CᵀD, R = DᵀD.
struct RandomProblem {
  MatrixXd A, B, Q, R, S;
};

RandomProblem MakeRandomProblem(unsigned seed, int n, int m, bool cross_term) {
  std::mt19937 rng(seed);
  std::normal_distribution<double> normal;
  const auto random = [&](int rows, int cols) {
    MatrixXd matrix(rows, cols);
    for (double& value : matrix.reshaped()) value = normal(rng);
    return matrix;
  };
  RandomProblem p;
  p.A = random(n, n);
  p.B = random(n, m);
  if (cross_term) {
    const MatrixXd C = random(n + m, n);
    const MatrixXd D = random(n + m, m);
    p.Q = C.transpose() * C;
    p.S = C.transpose() * D;
    p.R = D.transpose() * D;
  } else {
    const MatrixXd C = random(std::max(1, n / 2), n);
    const MatrixXd D = random(m, m);
    p.Q = C.transpose() * C;
    p.R = D.transpose() * D + MatrixXd::Identity(m, m);
  }
  p.Q = 0.5 * (p.Q + p.Q.transpose()).eval();
  p.R = 0.5 * (p.R + p.R.transpose()).eval();
  return p;
}

TEST(SolveCare, SchurAndSignMethodsAgreeOnRandomSystems) {
  // Two independent methods (ordered Schur basis with Newton refinement; sign function with
  // least squares) must find the same stabilising solution to 1e-10 relative.
  double worst = 0;
  int cases = 0;
  for (unsigned seed = 1; seed <= 6; ++seed) {
    for (int n = 1; n <= 8; ++n) {
      const int m = 1 + static_cast<int>((seed + static_cast<unsigned>(n)) % 3);
      const RandomProblem p =
          MakeRandomProblem(seed * 100 + static_cast<unsigned>(n), n, m, seed % 2 == 0);
      const RiccatiResult schur = SolveCare(p.A, p.B, p.Q, p.R, p.S);
      const RiccatiResult sign = SolveCareBySign(p.A, p.B, p.Q, p.R, p.S);
      ASSERT_TRUE(Succeeded(schur)) << "seed " << seed << " n " << n;
      ASSERT_TRUE(Succeeded(sign)) << "seed " << seed << " n " << n;
      const double difference = RelativeDifference(sign->X, schur->X);
      EXPECT_LT(difference, 1e-10) << "seed " << seed << " n " << n << " m " << m;
      worst = std::max(worst, difference);
      ++cases;
    }
  }
  RecordProperty("worst_relative_difference", std::to_string(worst));
  std::printf("Schur vs sign: %d cases, largest relative difference %.3g\n", cases, worst);
}

TEST(SolveCare, SolutionMakesTheClosedLoopStableOnRandomSystems) {
  // The defining property, checked outside the solver: A − B R⁻¹(BᵀX + Sᵀ) is Hurwitz and the
  // equation holds to 1e-12 relative to its largest term.
  for (unsigned seed = 11; seed <= 14; ++seed) {
    const RandomProblem p = MakeRandomProblem(seed, 6, 2, seed % 2 == 1);
    const MatrixXd S = p.S.size() == 0 ? MatrixXd::Zero(6, 2) : p.S;
    const RiccatiResult result = SolveCare(p.A, p.B, p.Q, p.R, p.S);
    ASSERT_TRUE(Succeeded(result));
    const MatrixXd& X = result->X;
    const MatrixXd K = p.R.inverse() * (p.B.transpose() * X + S.transpose());
    EXPECT_LT((p.A - p.B * K).eigenvalues().real().maxCoeff(), 0) << "seed " << seed;
    const MatrixXd residual = p.A.transpose() * X + X * p.A -
                              (X * p.B + S) * p.R.inverse() * (X * p.B + S).transpose() + p.Q;
    EXPECT_LT(residual.norm(), 1e-12 * (p.A.transpose() * X).norm()) << "seed " << seed;
  }
}

TEST(SolveDare, OutputWeightedExampleMatchesPublishedValues) {
  // X = [1.5354 1.2623; 1.2623 10.5596], K = [0.4092 1.7283], tol 1e-4 from the printed digits
  // ([Octave-control, dare.m test]; checked numerically).
  const MatrixXd A{{0.4, 1.7}, {0.9, 3.8}};
  const MatrixXd B{{0.8}, {2.1}};
  const MatrixXd C{{1, -1}};
  const MatrixXd R = Scalar(3);
  const RiccatiResult result = SolveDare(A, B, C.transpose() * C, R);
  ASSERT_TRUE(Succeeded(result));
  const MatrixXd expected{{1.5354, 1.2623}, {1.2623, 10.5596}};
  EXPECT_LT((result->X - expected).cwiseAbs().maxCoeff(), 1e-4);
  const MatrixXd K = (R + B.transpose() * result->X * B).inverse() * B.transpose() * result->X * A;
  EXPECT_NEAR(K(0, 0), 0.4092, 1e-4);
  EXPECT_NEAR(K(0, 1), 1.7283, 1e-4);
  EXPECT_LT(result->relative_residual, 1e-13);
}

TEST(SolveDare, RandomWalkKalmanFilterIsTheDualEquation) {
  // x[k+1] = x[k] + w, y = x + v, Q = R = 1: P = P − P²/(P + 1) + 1 → P² − P − 1 = 0,
  // P⁻ = (1 + √5)/2 = 1.6180340, K = P/(P + 1) = 0.6180340, tol 1e-9 (closed form, derived by
  // hand). The predictor equation is the DARE for (Aᵀ, Cᵀ).
  const RiccatiResult result = SolveDare(Scalar(1), Scalar(1), Scalar(1), Scalar(1));
  ASSERT_TRUE(Succeeded(result));
  const double p = result->X(0, 0);
  EXPECT_NEAR(p, 1.6180340, 1e-7);  // the 8 digits written above
  EXPECT_NEAR(p, (1 + std::sqrt(5.0)) / 2, 1e-9);
  EXPECT_NEAR(p / (p + 1), 0.6180340, 1e-7);
}

TEST(SolveDare, ScalarUnstableLqrMatchesClosedForm) {
  // a = 2, b = q = r = 1: x = a²x − a²x²/(1 + x) + 1 → x² − 4x − 1 = 0, x = 2 + √5 (closed form,
  // derived by hand); closed loop a − a x/(1 + x) = 2/(1 + x) ≈ 0.38.
  const RiccatiResult result = SolveDare(Scalar(2), Scalar(1), Scalar(1), Scalar(1));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR(result->X(0, 0), 2 + std::sqrt(5.0), 1e-12);
}

TEST(SolveDare, ScalarCrossTermMatchesClosedForm) {
  // a = b = 1, q = 2, r = 1, s = 0.5: x − x − (x + 0.5)²/(1 + x) + 2 = 0 → x² − x − 1.75 = 0,
  // x = (1 + 2√2)/2; closed loop 0.5/(1 + x) (closed form, derived by hand).
  const RiccatiResult result = SolveDare(Scalar(1), Scalar(1), Scalar(2), Scalar(1), Scalar(0.5));
  ASSERT_TRUE(Succeeded(result));
  EXPECT_NEAR(result->X(0, 0), (1 + 2 * std::sqrt(2.0)) / 2, 1e-12);
}

TEST(SolveDare, UncontrollableUnstableModeIsNotStabilisable) {
  const MatrixXd A{{2, 0}, {0, 0.5}};
  const MatrixXd B{{0}, {1}};
  const RiccatiResult result = SolveDare(A, B, MatrixXd::Identity(2, 2), Scalar(1));
  EXPECT_EQ(FailureOf(result).reason, SolveFailure::kNotStabilisable);
  EXPECT_NE(FailureOf(result).message.find("λ = 2 "), std::string::npos)
      << FailureOf(result).message;
}

TEST(SolveDare, UnobservedRotationHasNoStabilisingSolution) {
  // A rotation by 0.3 rad (eigenvalues e^{±0.3i} on the unit circle), B = [0; 1], Q = 0: as in the
  // continuous case the cheapest policy is no control, X = 0, which leaves |λ| = 1.
  const double c = std::cos(0.3), s = std::sin(0.3);
  const MatrixXd A{{c, s}, {-s, c}};
  const MatrixXd B{{0}, {1}};
  const RiccatiResult result = SolveDare(A, B, MatrixXd::Zero(2, 2), Scalar(1));
  EXPECT_EQ(FailureOf(result).reason, SolveFailure::kNoStabilisingSolution);
}

TEST(SolveDare, RejectsInvalidInput) {
  const MatrixXd A{{1, 1}, {0, 1}};
  const MatrixXd B{{0}, {1}};
  const MatrixXd Q = MatrixXd::Identity(2, 2);
  EXPECT_EQ(FailureOf(SolveDare(A, MatrixXd::Ones(3, 1), Q, Scalar(1))).reason,
            SolveFailure::kInvalidInput);
  EXPECT_EQ(FailureOf(SolveDare(A, B, MatrixXd{{1, 2}, {0, 1}}, Scalar(1))).reason,
            SolveFailure::kInvalidInput);
  EXPECT_EQ(FailureOf(SolveDare(A, B, Q, Scalar(0))).reason, SolveFailure::kInvalidInput);
  EXPECT_EQ(FailureOf(SolveDare(A, B, Q, Scalar(INFINITY))).reason, SolveFailure::kInvalidInput);
}

TEST(SolveDare, SolutionMakesTheClosedLoopStableOnRandomSystems) {
  // Checked outside the solver: the closed loop is Schur stable and the equation holds.
  for (unsigned seed = 21; seed <= 26; ++seed) {
    RandomProblem p = MakeRandomProblem(seed, 5, 2, seed % 2 == 0);
    const MatrixXd S = p.S.size() == 0 ? MatrixXd::Zero(5, 2) : p.S;
    p.A *= 0.5;  // a spectral radius around 1: a mix of stable and unstable modes
    const RiccatiResult result = SolveDare(p.A, p.B, p.Q, p.R, p.S);
    ASSERT_TRUE(Succeeded(result));
    const MatrixXd& X = result->X;
    const MatrixXd middle = p.R + p.B.transpose() * X * p.B;
    const MatrixXd cross = p.A.transpose() * X * p.B + S;
    const MatrixXd K = middle.inverse() * cross.transpose();
    EXPECT_LT((p.A - p.B * K).eigenvalues().cwiseAbs().maxCoeff(), 1) << "seed " << seed;
    const MatrixXd residual =
        p.A.transpose() * X * p.A - X - cross * middle.inverse() * cross.transpose() + p.Q;
    EXPECT_LT(residual.norm(), 1e-12 * X.norm()) << "seed " << seed;
  }
}

TEST(SolveFailure, HasReadableNames) {
  EXPECT_STREQ(ToString(SolveFailure::kInvalidInput), "invalid_input");
  EXPECT_STREQ(ToString(SolveFailure::kNotStabilisable), "not_stabilisable");
  EXPECT_STREQ(ToString(SolveFailure::kNotPositiveSemidefinite), "not_positive_semidefinite");
}

}  // namespace
}  // namespace upright::design
