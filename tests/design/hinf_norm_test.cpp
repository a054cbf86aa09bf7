// HinfNorm against closed forms, a handbook check value, direct evaluation of σ̄(G(jω)) on dense
// grids, and its own invariances. The comparison with SLICOT AB13DD is in slicot_norm_test.cpp.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <cstdint>
#include <limits>
#include <random>
#include <string>

#include "succeeded.hpp"
#include "upright/design/analysis.hpp"

namespace upright::design {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

Eigen::MatrixXd Scalar(double x) { return Eigen::MatrixXd::Constant(1, 1, x); }

// k/(s + a).
StateSpace Lag(double k, double a) { return {Scalar(-a), Scalar(1), Scalar(k), Scalar(0)}; }

// 1/(s² + 2ζω s + ω²) in companion form, output the position.
StateSpace SecondOrder(double zeta, double omega) {
  Eigen::MatrixXd a(2, 2);
  a << 0, 1, -omega * omega, -2 * zeta * omega;
  return {a, Eigen::Vector2d(0, 1), Eigen::RowVector2d(1, 0), Scalar(0)};
}

// Block-diagonal connection of two systems (inputs and outputs stacked).
StateSpace Append(const StateSpace& g, const StateSpace& h) {
  const auto diagonal = [](const Eigen::MatrixXd& x, const Eigen::MatrixXd& y) {
    Eigen::MatrixXd z = Eigen::MatrixXd::Zero(x.rows() + y.rows(), x.cols() + y.cols());
    z.topLeftCorner(x.rows(), x.cols()) = x;
    z.bottomRightCorner(y.rows(), y.cols()) = y;
    return z;
  };
  return {diagonal(g.A, h.A), diagonal(g.B, h.B), diagonal(g.C, h.C), diagonal(g.D, h.D)};
}

// σ̄(G(jω)) evaluated directly, independent of the library.
double Gain(const StateSpace& s, double omega) {
  using Cd = std::complex<double>;
  Eigen::MatrixXcd m = -s.A.cast<Cd>();
  m.diagonal().array() += Cd(0, omega);
  const Eigen::MatrixXcd g =
      s.C.cast<Cd>() * m.partialPivLu().solve(s.B.cast<Cd>()) + s.D.cast<Cd>();
  return Eigen::JacobiSVD<Eigen::MatrixXcd>(g).singularValues()(0);
}

// Uniform numbers in [−1, 1) from the standard 64-bit Mersenne Twister (its sequence is fixed by
// the C++ standard).
class Random {
 public:
  explicit Random(std::uint64_t seed) : engine_(seed) {}
  double Uniform() { return static_cast<double>(engine_() >> 11) * 0x1.0p-52 - 1.0; }
  Eigen::MatrixXd Matrix(Eigen::Index rows, Eigen::Index cols) {
    Eigen::MatrixXd x(rows, cols);
    for (Eigen::Index j = 0; j < cols; ++j) {
      for (Eigen::Index i = 0; i < rows; ++i) x(i, j) = Uniform();
    }
    return x;
  }

 private:
  std::mt19937_64 engine_;
};

StateSpace RandomStable(Random& random, Eigen::Index n, Eigen::Index p, Eigen::Index m) {
  const Eigen::MatrixXd base = 2 * random.Matrix(n, n);
  const double shift = base.eigenvalues().real().maxCoeff() + 0.05 + 0.5 * (random.Uniform() + 1);
  return {base - shift * Eigen::MatrixXd::Identity(n, n), random.Matrix(n, m), random.Matrix(p, n),
          random.Matrix(p, m)};
}

TEST(HinfNorm, PureGainIsTheLargestSingularValue) {
  // [1 2; 2 1] has singular values 3 and 1 (symmetric, eigenvalues 1 ± 2; derived by hand).
  Eigen::MatrixXd d(2, 2);
  d << 1, 2, 2, 1;
  const AnalysisResult<NormPeak> r =
      HinfNorm({Eigen::MatrixXd(0, 0), Eigen::MatrixXd(0, 2), Eigen::MatrixXd(2, 0), d});
  ASSERT_TRUE(Succeeded(r));
  EXPECT_NEAR(r->norm, 3.0, 1e-14);
  EXPECT_EQ(r->peak_rad_s, 0.0);  // every frequency is a peak; DC is reported
  // B and C may also be left empty.
  const AnalysisResult<NormPeak> empty =
      HinfNorm({Eigen::MatrixXd(), Eigen::MatrixXd(), Eigen::MatrixXd(), d});
  ASSERT_TRUE(Succeeded(empty));
  EXPECT_NEAR(empty->norm, 3.0, 1e-14);
}

TEST(HinfNorm, FirstOrderLagPeaksAtDc) {
  // |1/(jω + a)| = 1/√(ω² + a²): the norm is 1/a at ω = 0 (derived by hand).
  for (double a : {0.01, 0.5, 2.0, 300.0}) {
    const AnalysisResult<NormPeak> r = HinfNorm(Lag(1, a));
    ASSERT_TRUE(Succeeded(r));
    EXPECT_NEAR(r->norm, 1 / a, 1e-12 / a) << "a = " << a;
    EXPECT_EQ(r->peak_rad_s, 0.0) << "a = " << a;
  }
}

TEST(HinfNorm, LightlyDampedResonanceMatchesTheHandbook) {
  // 1/(s² + 0.2 s + 1): peak 5.02518908 at 0.98994949 rad/s; Mr = 1/(2ζ√(1 − ζ²)) at
  // ω = √(1 − 2ζ²) (handbook, from memory; it is the minimum over ω² of (1 − ω²)² + 4ζ²ω²,
  // derived by hand; checked numerically; tolerance 1e-8 from the printed digits).
  const AnalysisResult<NormPeak> r = HinfNorm(SecondOrder(0.1, 1.0));
  ASSERT_TRUE(Succeeded(r));
  EXPECT_NEAR(r->norm, 5.02518908, 1e-8);
  EXPECT_NEAR(r->peak_rad_s, 0.98994949, 1e-8);
  EXPECT_NEAR(r->norm, 1 / (2 * 0.1 * std::sqrt(1 - 0.01)), 1e-9);
  EXPECT_NEAR(r->peak_rad_s, std::sqrt(1 - 2 * 0.01), 1e-6);
}

TEST(HinfNorm, VerySharpResonanceIsFound) {
  // s/(s² + c s + ω0²) is c⁻¹ · (jcω)/(ω0² − ω² + jcω): its gain is at most 1/c, reached exactly
  // at ω0 (derived by hand). With c = 2e-6 the peak is 1e-6 wide and 5e5 high.
  const double c = 2e-6;
  const double omega0 = std::sqrt(2.0);
  StateSpace g = SecondOrder(c / (2 * omega0), omega0);
  g.C = Eigen::RowVector2d(0, 1);  // output the velocity: numerator s
  const AnalysisResult<NormPeak> r = HinfNorm(g);
  ASSERT_TRUE(Succeeded(r));
  EXPECT_NEAR(r->norm / (1 / c), 1.0, 1e-9);
  EXPECT_NEAR(r->peak_rad_s / omega0, 1.0, 1e-9);
}

TEST(HinfNorm, FeedthroughPeakAtInfinity) {
  // 2 − 1/(s + 1) = (2s + 1)/(s + 1): |G|² = (4ω² + 1)/(ω² + 1) rises from 1 towards 4, so the
  // norm is 2, approached as ω → ∞ (derived by hand).
  const AnalysisResult<NormPeak> r = HinfNorm({Scalar(-1), Scalar(1), Scalar(-1), Scalar(2)});
  ASSERT_TRUE(Succeeded(r));
  EXPECT_NEAR(r->norm, 2.0, 4e-10);  // within the documented factor 1 + 2e-10
  EXPECT_EQ(r->peak_rad_s, kInf);
}

TEST(HinfNorm, FeedthroughWithAnInteriorPeak) {
  // 1 + 1/(s² + 0.2 s + 1) = (s² + 0.2 s + 2)/(s² + 0.2 s + 1): 2 at DC, 1 at infinity and
  // |1 + 0.2j|/0.2 ≈ 5.1 at ω = 1, so the peak is interior. It has no short closed form: the
  // result is checked against direct evaluation on a fine grid around ω = 1.
  StateSpace g = SecondOrder(0.1, 1.0);
  g.D = Scalar(1);
  const AnalysisResult<NormPeak> r = HinfNorm(g);
  ASSERT_TRUE(Succeeded(r));
  double grid = 0;
  for (int i = 0; i <= 200000; ++i) grid = std::max(grid, Gain(g, 0.5 + 1.0 * i / 200000));
  EXPECT_GE(r->norm, grid * (1 - 1e-12));
  EXPECT_LE(r->norm, grid * (1 + 1e-6));  // grid step 5e-6 near a peak of width 0.2
  EXPECT_NEAR(Gain(g, r->peak_rad_s), r->norm, 1e-12 * r->norm);
}

TEST(HinfNorm, MimoDiagonalIsTheLargestChannel) {
  // diag(4/(s + 2), 1/(s² + s + 1), 1/(s² + 0.2 s + 1)): channel norms 2 (DC), 1/(2·0.5·√0.75) =
  // 1.1547 and 5.0252 (the resonance formula above, derived by hand); the largest wins.
  const StateSpace a = Lag(4, 2);
  const StateSpace b = SecondOrder(0.5, 1.0);
  const StateSpace c = SecondOrder(0.1, 1.0);
  const double resonance = 1 / (2 * 0.1 * std::sqrt(1 - 0.01));
  const AnalysisResult<NormPeak> abc = HinfNorm(Append(Append(a, b), c));
  ASSERT_TRUE(Succeeded(abc));
  EXPECT_NEAR(abc->norm, resonance, 1e-9);
  EXPECT_NEAR(abc->peak_rad_s, std::sqrt(0.98), 1e-6);
  const AnalysisResult<NormPeak> ab = HinfNorm(Append(b, a));
  ASSERT_TRUE(Succeeded(ab));
  EXPECT_NEAR(ab->norm, 2.0, 1e-12);
  EXPECT_EQ(ab->peak_rad_s, 0.0);
}

TEST(HinfNorm, UnstableSystemHasInfiniteNormAndNamesTheEigenvalue) {
  StateSpace g = Lag(1, 1);
  g.A = Eigen::Vector2d(-1, 2.5).asDiagonal();
  g.B = Eigen::Vector2d(1, 1);
  g.C = Eigen::RowVector2d(1, 1);
  const AnalysisFailure<NormPeak> r = FailureOf(HinfNorm(g));
  EXPECT_EQ(r.found.norm, kInf);
  EXPECT_NE(r.message.find("2.5"), std::string::npos) << r.message;
  // An integrator is on the stability boundary: also infinite.
  EXPECT_EQ(FailureOf(HinfNorm(Lag(1, 0))).found.norm, kInf);
}

TEST(HinfNorm, ZeroTransferFunctionHasZeroNorm) {
  StateSpace g = SecondOrder(0.3, 2.0);
  g.C.setZero();
  const AnalysisResult<NormPeak> r = HinfNorm(g);
  ASSERT_TRUE(Succeeded(r));
  EXPECT_EQ(r->norm, 0.0);
}

TEST(HinfNorm, RejectsInconsistentSizesAndTolerances) {
  StateSpace g = SecondOrder(0.3, 2.0);
  g.B = Eigen::Vector3d(1, 2, 3);
  const AnalysisFailure<NormPeak> r = FailureOf(HinfNorm(g));
  EXPECT_NE(r.message.find("B is 3×1"), std::string::npos) << r.message;
  StateSpace d_wrong = SecondOrder(0.3, 2.0);
  d_wrong.D = Eigen::MatrixXd::Zero(2, 1);
  EXPECT_FALSE(HinfNorm(d_wrong).has_value());
  const AnalysisFailure<NormPeak> t = FailureOf(HinfNorm(SecondOrder(0.3, 2.0), 0.0));
  EXPECT_NE(t.message.find("relative_tolerance = 0"), std::string::npos) << t.message;
  StateSpace nan = SecondOrder(0.3, 2.0);
  nan.A(0, 0) = std::numeric_limits<double>::quiet_NaN();
  EXPECT_FALSE(HinfNorm(nan).has_value());
}

TEST(HinfNorm, LooseToleranceStillBracketsTheNorm) {
  // The result is a value of σ̄ (never above the norm) within a factor 1 + 2 tol of it; the norm
  // of the handbook resonance is 1/(2ζ√(1 − ζ²)) (derived by hand).
  const double exact = 1 / (2 * 0.1 * std::sqrt(1 - 0.01));
  const AnalysisResult<NormPeak> r = HinfNorm(SecondOrder(0.1, 1.0), 1e-3);
  ASSERT_TRUE(Succeeded(r));
  EXPECT_LE(r->norm, exact * (1 + 1e-14));
  EXPECT_GE(r->norm * (1 + 2e-3), exact);
}

TEST(HinfNorm, RandomSystemsAgreeWithDenseGrids) {
  // Direct evaluation on a fine grid, refined around its best point by golden-section search,
  // bounds the norm from below; the reported peak must reach the reported norm. Default tolerance
  // 1e-10.
  Random random(5);
  for (int trial = 0; trial < 24; ++trial) {
    const Eigen::Index n = 1 + trial % 8;
    const StateSpace g = RandomStable(random, n, 1 + trial % 3, 1 + (trial / 3) % 3);
    const AnalysisResult<NormPeak> r = HinfNorm(g);
    ASSERT_TRUE(Succeeded(r));
    double best = std::max(Gain(g, 0), Eigen::JacobiSVD<Eigen::MatrixXd>(g.D).singularValues()(0));
    double best_log_omega = -4;
    constexpr int kPoints = 8000;
    for (int i = 0; i <= kPoints; ++i) {
      const double log_omega = -4 + 8.0 * i / kPoints;
      const double value = Gain(g, std::pow(10.0, log_omega));
      if (value > best) {
        best = value;
        best_log_omega = log_omega;
      }
    }
    double low = best_log_omega - 8.0 / kPoints, high = best_log_omega + 8.0 / kPoints;
    for (int i = 0; i < 80; ++i) {
      const double a = low + (high - low) * 0.382, b = low + (high - low) * 0.618;
      if (Gain(g, std::pow(10.0, a)) > Gain(g, std::pow(10.0, b))) {
        high = b;
      } else {
        low = a;
      }
    }
    best = std::max(best, Gain(g, std::pow(10.0, 0.5 * (low + high))));
    // The documented bound, with 1e-14 for rounding; the refined grid reaches the norm to 1e-6.
    EXPECT_GE(r->norm * (1 + 2e-10 + 1e-14), best) << "trial " << trial;
    EXPECT_LE(r->norm, best * (1 + 1e-6)) << "trial " << trial;
    const double at_peak = std::isinf(r->peak_rad_s)
                               ? Eigen::JacobiSVD<Eigen::MatrixXd>(g.D).singularValues()(0)
                               : Gain(g, r->peak_rad_s);
    EXPECT_NEAR(at_peak, r->norm, 1e-12 * r->norm) << "trial " << trial;
  }
}

TEST(HinfNorm, UnchangedByBadlyScaledCoordinates) {
  // x → T x with T = diag(10^−4 … 10^4) leaves the transfer function, and so the norm, alone.
  Random random(9);
  for (int trial = 0; trial < 10; ++trial) {
    const Eigen::Index n = 2 + trial % 7;
    const StateSpace g = RandomStable(random, n, 2, 2);
    Eigen::VectorXd t(n);
    for (Eigen::Index i = 0; i < n; ++i) t(i) = std::pow(10.0, 4 * random.Uniform());
    const StateSpace scaled{t.asDiagonal() * g.A * t.cwiseInverse().asDiagonal(),
                            t.asDiagonal() * g.B, g.C * t.cwiseInverse().asDiagonal(), g.D};
    const AnalysisResult<NormPeak> a = HinfNorm(g);
    const AnalysisResult<NormPeak> b = HinfNorm(scaled);
    ASSERT_TRUE(Succeeded(a));
    ASSERT_TRUE(Succeeded(b));
    EXPECT_NEAR(b->norm / a->norm, 1.0, 1e-9) << "trial " << trial;
  }
}

TEST(HinfNorm, NormJustAboveTheFeedthroughIsNotMissed) {
  // G = D + ε G₀ with σ̄(D) = 1: the level sets near σ̄(D) are the ill-conditioned case of the
  // method. The documented bound must still hold: no grid point exceeds (1 + 2 tol) · result.
  Random random(17);
  for (int trial = 0; trial < 12; ++trial) {
    StateSpace g = RandomStable(random, 3 + trial % 4, 2, 2);
    g.D /= Eigen::JacobiSVD<Eigen::MatrixXd>(g.D).singularValues()(0);
    g.C *= std::pow(10.0, -5 - (trial % 4));  // ε = 1e-5 … 1e-8
    const AnalysisResult<NormPeak> r = HinfNorm(g);
    ASSERT_TRUE(Succeeded(r));
    double grid = 1;
    for (int i = 0; i <= 4000; ++i) {
      grid = std::max(grid, Gain(g, std::pow(10.0, -3 + 6.0 * i / 4000)));
    }
    EXPECT_GE(r->norm * (1 + 2e-10 + 1e-14), grid) << "trial " << trial;
  }
}

}  // namespace
}  // namespace upright::design
