// DiscreteHinfNorm against closed forms of first-order discrete systems and against direct
// evaluation of σ̄(G(e^{jθ})) on a dense grid of the unit circle.
#include "upright/design/discrete_norm.hpp"

#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <complex>
#include <limits>
#include <random>

#include "succeeded.hpp"

namespace upright::design {
namespace {

constexpr double kPi = 3.14159265358979323846;

Eigen::MatrixXd Scalar(double x) { return Eigen::MatrixXd::Constant(1, 1, x); }

// σ̄(G(e^{jθ})) evaluated directly, independent of the library.
double GainOnTheCircle(const StateSpace& s, double theta) {
  using Cd = std::complex<double>;
  Eigen::MatrixXcd m = -s.A.cast<Cd>();
  m.diagonal().array() += std::polar(1.0, theta);
  const Eigen::MatrixXcd g =
      s.C.cast<Cd>() * m.partialPivLu().solve(s.B.cast<Cd>()) + s.D.cast<Cd>();
  return Eigen::JacobiSVD<Eigen::MatrixXcd>(g).singularValues()(0);
}

// The largest gain on 20 001 points of [0, π], then refined by golden-section search around the
// best point: a lower bound of the norm that should reach it closely.
double SweptNorm(const StateSpace& s) {
  constexpr int kPoints = 20001;
  const double step = kPi / (kPoints - 1);
  int best = 0;
  double best_gain = 0;
  for (int i = 0; i < kPoints; ++i) {
    const double g = GainOnTheCircle(s, i * step);
    if (g > best_gain) {
      best_gain = g;
      best = i;
    }
  }
  double lo = std::max(0.0, (best - 1) * step), hi = std::min(kPi, (best + 1) * step);
  const double ratio = (std::sqrt(5.0) - 1) / 2;
  for (int k = 0; k < 80; ++k) {
    const double a = hi - ratio * (hi - lo), b = lo + ratio * (hi - lo);
    const double gain_a = GainOnTheCircle(s, a), gain_b = GainOnTheCircle(s, b);
    if (gain_a > gain_b) {
      hi = b;
    } else {
      lo = a;
    }
    best_gain = std::max({best_gain, gain_a, gain_b});
  }
  return best_gain;
}

TEST(DiscreteHinfNorm, FirstOrderLagPeaksAtDcOrAtNyquist) {
  // G(z) = k / (z − p), |p| < 1: |G(e^{jθ})| = |k| / |e^{jθ} − p| is largest where the circle
  // is nearest p, at θ = 0 (p ≥ 0, norm |k| / (1 − p)) or θ = π (p < 0, norm |k| / (1 + p))
  // (derived by hand).
  const double period_s = 0.01;
  struct Case {
    double k, p, norm, peak_rad_s;
  };
  for (const Case c :
       {Case{2, 0.5, 4, 0}, Case{-1, 0.9, 10, 0}, Case{0.5, -0.75, 2, kPi / period_s}}) {
    const AnalysisResult<NormPeak> r =
        DiscreteHinfNorm({Scalar(c.p), Scalar(1), Scalar(c.k), Scalar(0)}, period_s);
    ASSERT_TRUE(Succeeded(r));
    EXPECT_NEAR(r->norm, c.norm, 1e-9 * c.norm) << "p = " << c.p;
    EXPECT_NEAR(r->peak_rad_s, c.peak_rad_s, 1e-6 / period_s) << "p = " << c.p;
  }
}

TEST(DiscreteHinfNorm, FeedthroughAddsToTheLag) {
  // G(z) = 1 + 1 / (z − 0.5) = (z + 0.5) / (z − 0.5): |G| is largest at θ = 0, 1.5 / 0.5 = 3,
  // and smallest at θ = π, 0.5 / 1.5 (derived by hand).
  const AnalysisResult<NormPeak> r =
      DiscreteHinfNorm({Scalar(0.5), Scalar(1), Scalar(1), Scalar(1)}, 0.1);
  ASSERT_TRUE(Succeeded(r));
  EXPECT_NEAR(r->norm, 3, 1e-9);
  EXPECT_NEAR(r->peak_rad_s, 0, 1e-6);
}

TEST(DiscreteHinfNorm, RandomSystemsAgreeWithADenseSweepOfTheCircle) {
  // The sweep is a lower bound reached within its refinement; HinfNorm's tolerance bounds the
  // norm from above by (1 + 2·1e-10) times the value it returns.
  std::mt19937_64 engine(20240611);
  std::uniform_real_distribution<double> uniform(-1, 1);
  const auto matrix = [&](Eigen::Index rows, Eigen::Index cols) {
    Eigen::MatrixXd x(rows, cols);
    for (double& v : x.reshaped()) v = uniform(engine);
    return x;
  };
  for (int trial = 0; trial < 12; ++trial) {
    const Eigen::Index n = 1 + trial % 6, m = 1 + trial % 2, p = 1 + trial % 3;
    Eigen::MatrixXd a = matrix(n, n);
    // Spectral radius between 0.5 and 0.98, some poles near the circle.
    const double radius = a.eigenvalues().cwiseAbs().maxCoeff();
    a *= (0.5 + 0.48 * (trial % 4) / 3.0) / radius;
    const StateSpace s{a, matrix(n, m), matrix(p, n),
                       trial % 2 ? matrix(p, m) : Eigen::MatrixXd::Zero(p, m)};
    const AnalysisResult<NormPeak> r = DiscreteHinfNorm(s, 0.02);
    ASSERT_TRUE(Succeeded(r)) << "trial " << trial;
    const double swept = SweptNorm(s);
    EXPECT_LE(swept, r->norm * (1 + 1e-9)) << "trial " << trial;
    EXPECT_GE(swept, r->norm * (1 - 1e-7)) << "trial " << trial;
    // The peak is where the norm is reached.
    EXPECT_NEAR(GainOnTheCircle(s, r->peak_rad_s * 0.02), r->norm, 1e-7 * r->norm)
        << "trial " << trial;
  }
}

TEST(DiscreteHinfNorm, UnstableSystemHasInfiniteNormAndNamesTheEigenvalue) {
  const AnalysisFailure<NormPeak> on_circle =
      FailureOf(DiscreteHinfNorm({Scalar(1), Scalar(1), Scalar(1), Scalar(0)}, 0.01));
  EXPECT_EQ(on_circle.found.norm, std::numeric_limits<double>::infinity());
  EXPECT_NE(on_circle.message.find("not inside the unit circle"), std::string::npos)
      << on_circle.message;
  EXPECT_EQ(
      FailureOf(DiscreteHinfNorm({Scalar(-1.5), Scalar(1), Scalar(1), Scalar(0)}, 0.01)).found.norm,
      std::numeric_limits<double>::infinity());
  const AnalysisFailure<NormPeak> bad_period =
      FailureOf(DiscreteHinfNorm({Scalar(0.5), Scalar(1), Scalar(1), Scalar(0)}, 0));
  EXPECT_NE(bad_period.message.find("period_s = 0"), std::string::npos) << bad_period.message;
}

}  // namespace
}  // namespace upright::design
