// SisoMargins, InputMargins and WorstInputMargins against published check values, closed forms
// derived by hand, the LQR guarantees, and brute-force stability sweeps that share nothing with
// the crossover analysis. Sources cited as [Key] are listed in tests/REFERENCES.md.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <cstdint>
#include <limits>
#include <numbers>
#include <random>
#include <string>
#include <vector>

#include "succeeded.hpp"
#include "upright/design/analysis.hpp"

namespace upright::design {
namespace {

using Cd = std::complex<double>;
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kDeg = 180 / std::numbers::pi;

Eigen::MatrixXd Scalar(double x) { return Eigen::MatrixXd::Constant(1, 1, x); }

// k / (s³ + a2 s² + a1 s + a0) in companion form.
StateSpace ThirdOrder(double k, double a2, double a1, double a0) {
  Eigen::MatrixXd a(3, 3);
  a << 0, 1, 0, 0, 0, 1, -a0, -a1, -a2;
  return {a, Eigen::Vector3d(0, 0, 1), Eigen::RowVector3d(k, 0, 0), Scalar(0)};
}

// k / (s + a).
StateSpace Lag(double k, double a) { return {Scalar(-a), Scalar(1), Scalar(k), Scalar(0)}; }

// L(jω), evaluated directly.
Cd Response(const StateSpace& l, double omega) {
  Eigen::MatrixXcd m = -l.A.cast<Cd>();
  m.diagonal().array() += Cd(0, omega);
  return (l.C.cast<Cd>() * m.partialPivLu().solve(l.B.cast<Cd>()))(0, 0) + l.D(0, 0);
}

bool Hurwitz(const Eigen::MatrixXcd& a) {
  return Eigen::ComplexEigenSolver<Eigen::MatrixXcd>(a, false).eigenvalues().real().maxCoeff() < 0;
}

// Is the loop with the complex gain k in front of L (D = 0) stable? A − k B C.
bool StableWithGain(const StateSpace& l, Cd k) {
  return Hurwitz(l.A.cast<Cd>() - k * (l.B * l.C).cast<Cd>());
}

// Brute force, independent of the library: the first gain factor past which the loop is unstable,
// scanning geometrically from 1 towards `end` and bisecting; inf (or 0) if none is found.
double ScanGain(const StateSpace& l, double end) {
  constexpr int kSteps = 600;
  double previous = 1;
  for (int i = 1; i <= kSteps; ++i) {
    const double k = std::pow(end, static_cast<double>(i) / kSteps);
    if (StableWithGain(l, k)) {
      previous = k;
      continue;
    }
    double stable = previous, unstable = k;
    for (int j = 0; j < 80; ++j) {
      const double middle = std::sqrt(stable * unstable);
      if (StableWithGain(l, middle)) {
        stable = middle;
      } else {
        unstable = middle;
      }
    }
    return stable;
  }
  return end > 1 ? kInf : 0;
}

// Brute force: the smallest phase θ (degrees) for which e^{−jθ} L destabilises the loop.
double ScanPhase(const StateSpace& l) {
  constexpr int kSteps = 720;
  double previous = 0;
  for (int i = 1; i <= kSteps; ++i) {
    const double theta = std::numbers::pi * i / kSteps;
    if (StableWithGain(l, std::polar(1.0, -theta))) {
      previous = theta;
      continue;
    }
    double stable = previous, unstable = theta;
    for (int j = 0; j < 60; ++j) {
      const double middle = 0.5 * (stable + unstable);
      if (StableWithGain(l, std::polar(1.0, -middle))) {
        stable = middle;
      } else {
        unstable = middle;
      }
    }
    return stable * kDeg;
  }
  return kInf;
}

// Brute force: min over a dense grid of 2 |1 + L| / |1 − L|, which is ≥ α = 1/‖S − ½‖∞.
double ScanDisk(const StateSpace& l) {
  double alpha = kInf;
  for (int i = 0; i <= 40000; ++i) {
    const Cd value = Response(l, std::pow(10.0, -4 + 8.0 * i / 40000));
    alpha = std::min(alpha, 2 * std::abs(1.0 + value) / std::abs(1.0 - value));
  }
  return alpha;
}

// Closed loop of L (D = 0) with the input delayed by τ, the delay replaced by its (6,6) Padé
// approximant: all-pass like the delay, and with the delay's phase to better than 1e-6 rad for
// ωτ ≤ 3. Stable?
bool StableWithDelay(const StateSpace& l, double tau) {
  constexpr int kOrder = 6;
  // e^{−sτ} ≈ N(sτ)/D(sτ), D(x) = Σ c_k x^k, N(x) = Σ (−1)^k c_k x^k,
  // c_k = (2n − k)! n! / ((2n)! k! (n − k)!).
  std::vector<double> c(kOrder + 1);
  c[0] = 1;
  for (int k = 1; k <= kOrder; ++k) {
    c[k] = c[k - 1] * (kOrder - k + 1) / (k * (2.0 * kOrder - k + 1));
  }
  // Controllable canonical form of N(x)/D(x) in x = sτ (monic D), then x → sτ by dividing the
  // state and input matrices by τ; this keeps the entries moderate.
  Eigen::MatrixXd ad = Eigen::MatrixXd::Zero(kOrder, kOrder);
  Eigen::VectorXd bd = Eigen::VectorXd::Zero(kOrder);
  Eigen::RowVectorXd cd(kOrder);
  const double dd = (kOrder % 2 == 0 ? 1.0 : -1.0);  // leading coefficient of N over that of D
  for (int k = 0; k < kOrder; ++k) {
    const double den = c[k] / c[kOrder];
    const double num = (k % 2 == 0 ? 1.0 : -1.0) * den;
    if (k + 1 < kOrder) ad(k, k + 1) = 1;
    ad(kOrder - 1, k) = -den;
    cd(k) = num - dd * den;
  }
  bd(kOrder - 1) = 1;
  ad /= tau;
  bd /= tau;
  // Series: delay then L, closed by u = −y: states [x; xd].
  const Eigen::Index n = l.A.rows();
  Eigen::MatrixXd a = Eigen::MatrixXd::Zero(n + kOrder, n + kOrder);
  a.topLeftCorner(n, n) = l.A - dd * l.B * l.C;
  a.topRightCorner(n, kOrder) = l.B * cd;
  a.bottomLeftCorner(kOrder, n) = -bd * l.C;
  a.bottomRightCorner(kOrder, kOrder) = ad;
  return Hurwitz(a.cast<Cd>());
}

void ExpectDiskFieldsFollowAlpha(const LoopMargins& m) {
  const double a = m.disk_alpha;
  EXPECT_NEAR(m.disk_gain_low, (2 - a) / (2 + a), 1e-14);
  EXPECT_NEAR(m.disk_gain_high, (2 + a) / (2 - a), 1e-12);
  EXPECT_NEAR(m.disk_phase_deg, 2 * std::atan(a / 2) * kDeg, 1e-12);
}

// Disks inside the classical margins: the disk of gains and phases that α guarantees contains the
// real interval [disk_gain_low, disk_gain_high] and the unit-circle arc up to disk_phase_deg, so
// it cannot reach past the classical margins (the disk of [SPG2020]; derived by hand).
void ExpectDiskWithinClassical(const LoopMargins& m) {
  EXPECT_GE(m.disk_gain_low, m.gain_low - 1e-12);
  EXPECT_LE(m.disk_gain_high, m.gain_high + 1e-12);
  EXPECT_LE(m.disk_phase_deg, m.phase_deg + 1e-9);
}

TEST(SisoMargins, ThirdOrderLoopMatchesThePublishedMargins) {
  // 24/((s + 1)(s + 2)(s + 3)) = 24/(s³ + 6s² + 11s + 6): GM 2.5 at √11, PM 35.425° at
  // 2.0638 rad/s ([Octave-control, margin.m]; checked numerically; tolerance 1e-3 from the
  // printed digits).
  const AnalysisResult<LoopMargins> m_result = SisoMargins(ThirdOrder(24, 6, 11, 6));
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_NEAR(m.gain_high, 2.5, 1e-3);
  EXPECT_NEAR(m.gain_high_rad_s, std::sqrt(11.0), 1e-3);
  EXPECT_NEAR(m.phase_deg, 35.425, 1e-3);
  EXPECT_NEAR(m.phase_rad_s, 2.0638, 1e-3);
  // By hand: L(j√11) = 24/(6 − 6·11) = −0.4 exactly, so GM = 2.5 (tighter tolerance).
  EXPECT_NEAR(m.gain_high, 2.5, 1e-10);
  EXPECT_NEAR(m.gain_high_rad_s, std::sqrt(11.0), 1e-10);
  // L(0) = 4 > 0: no gain reduction destabilises (derived by hand).
  EXPECT_EQ(m.gain_low, 0.0);
  EXPECT_TRUE(std::isnan(m.gain_low_rad_s));
  // ∠L = −(180° − PM) at the crossover and a delay τ adds ω_c τ of lag, so the delay margin is
  // PM_rad / ω_c (derived by hand), here from the published PM and ω_c (tolerance from their
  // rounding).
  EXPECT_NEAR(m.delay_s, 35.425 / kDeg / 2.0638, 1e-4);
  ExpectDiskFieldsFollowAlpha(m);
  ExpectDiskWithinClassical(m);
}

TEST(SisoMargins, DiskMarginMatchesThePublishedExample) {
  // 25/(s³ + 10s² + 10s + 10): disk margin α = 0.45809, gain 4.0508 dB, phase 25.80° ([SPG2020];
  // [python-control]; checked numerically; tolerances from the printed digits).
  const AnalysisResult<LoopMargins> m_result = SisoMargins(ThirdOrder(25, 10, 10, 10));
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_NEAR(m.disk_alpha, 0.45809, 1e-5);
  EXPECT_NEAR(20 * std::log10(m.disk_gain_high), 4.0508, 1e-4);
  EXPECT_NEAR(20 * std::log10(m.disk_gain_low), -4.0508, 1e-4);
  EXPECT_NEAR(m.disk_phase_deg, 25.80, 1e-2);
  ExpectDiskFieldsFollowAlpha(m);
  ExpectDiskWithinClassical(m);
}

TEST(SisoMargins, IntegratorHasDelayMarginPiOverTwoK) {
  // L = k/s: |L| = 1 at ω = k with phase −90°, so PM = 90° and the delay margin is π/(2k); the
  // closed loop s + k is stable for every gain factor (derived by hand).
  for (double k : {0.5, 2.0, 40.0}) {
    const AnalysisResult<LoopMargins> m_result =
        SisoMargins({Scalar(0), Scalar(1), Scalar(k), Scalar(0)});
    ASSERT_TRUE(Succeeded(m_result));
    const LoopMargins& m = *m_result;
    EXPECT_NEAR(m.delay_s, std::numbers::pi / (2 * k), 1e-12 / k) << "k = " << k;
    EXPECT_NEAR(m.delay_rad_s, k, 1e-12 * k);
    EXPECT_NEAR(m.phase_deg, 90, 1e-10);
    EXPECT_EQ(m.gain_high, kInf);
    EXPECT_EQ(m.gain_low, 0.0);
    // S − ½ = (s − k)/(2(s + k)) is all-pass times ½: α = 2, disk gains [0, inf) (by hand).
    EXPECT_NEAR(m.disk_alpha, 2, 1e-9);
  }
}

TEST(SisoMargins, FirstOrderLagPhaseMargin) {
  // L = k/(s + 1), k > 1: |L| = 1 at ω = √(k² − 1), PM = 180° − atan √(k² − 1), no phase
  // crossover so gain_high = inf; delay margin (π − atan ω_c)/ω_c (derived by hand).
  for (double k : {1.5, 3.0, 100.0}) {
    const AnalysisResult<LoopMargins> m_result = SisoMargins(Lag(k, 1));
    ASSERT_TRUE(Succeeded(m_result));
    const LoopMargins& m = *m_result;
    const double wc = std::sqrt(k * k - 1);
    EXPECT_NEAR(m.phase_deg, 180 - std::atan(wc) * kDeg, 1e-9) << "k = " << k;
    EXPECT_NEAR(m.phase_rad_s, wc, 1e-9 * wc);
    EXPECT_NEAR(m.delay_s, (std::numbers::pi - std::atan(wc)) / wc, 1e-9 / wc);
    EXPECT_EQ(m.gain_high, kInf);
    EXPECT_EQ(m.gain_low, 0.0);
    ExpectDiskWithinClassical(m);
  }
}

TEST(SisoMargins, FeedthroughShiftsTheCrossovers) {
  // L = 0.5 + 2/(s + 1) = (0.5 s + 2.5)/(s + 1): |L|² = (0.25ω² + 6.25)/(ω² + 1) = 1 at ω = √7;
  // PM = 180° − (atan √7 − atan(√7/5)); 1 + kL has the pole −(1 + 2.5k)/(1 + 0.5k) < 0 for all
  // k > 0 (derived by hand).
  const AnalysisResult<LoopMargins> m_result =
      SisoMargins({Scalar(-1), Scalar(1), Scalar(2), Scalar(0.5)});
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  const double wc = std::sqrt(7.0);
  EXPECT_NEAR(m.phase_rad_s, wc, 1e-9);
  EXPECT_NEAR(m.phase_deg, 180 - (std::atan(wc) - std::atan(wc / 5)) * kDeg, 1e-9);
  EXPECT_EQ(m.gain_high, kInf);
  EXPECT_EQ(m.gain_low, 0.0);
}

TEST(SisoMargins, NegativeFeedthroughLosesAPoleThroughInfinity) {
  // L = −0.5 + 3/(s + 1) = (−0.5 s + 2.5)/(s + 1): 1 + kL ∝ (1 − 0.5k) s + (1 + 2.5k), whose
  // pole leaves through infinity at k = 2 (derived by hand).
  const AnalysisResult<LoopMargins> m_result =
      SisoMargins({Scalar(-1), Scalar(1), Scalar(3), Scalar(-0.5)});
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_NEAR(m.gain_high, 2.0, 1e-12);
  EXPECT_EQ(m.gain_high_rad_s, kInf);
  EXPECT_EQ(m.gain_low, 0.0);
}

TEST(InputMargins, UnstablePlantHasAGainReductionMargin) {
  // ẋ = x + u, u = −2x: L = 2/(s − 1). L(0) = −2, so gain_low = 0.5 at DC; no other phase
  // crossover, gain_high = inf. |L| = 1 at ω = √3 with ∠L = −120°: PM = 60°, delay margin
  // (π/3)/√3. S − ½ = (s − 3)/(2(s + 1)) peaks at DC at 3/2: α = 2/3 (derived by hand).
  const AnalysisResult<LoopMargins> m_result = InputMargins(Scalar(1), Scalar(1), Scalar(2), 0);
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_NEAR(m.gain_low, 0.5, 1e-12);
  EXPECT_EQ(m.gain_low_rad_s, 0.0);
  EXPECT_EQ(m.gain_high, kInf);
  EXPECT_TRUE(std::isnan(m.gain_high_rad_s));
  EXPECT_NEAR(m.phase_deg, 60, 1e-9);
  EXPECT_NEAR(m.phase_rad_s, std::sqrt(3.0), 1e-9);
  EXPECT_NEAR(m.delay_s, std::numbers::pi / 3 / std::sqrt(3.0), 1e-10);
  EXPECT_NEAR(m.disk_alpha, 2.0 / 3, 1e-9);
  EXPECT_EQ(m.disk_rad_s, 0.0);
  ExpectDiskWithinClassical(m);
}

TEST(InputMargins, ScalarLqrHasTheGuaranteedMargins) {
  // ẋ = x + u, q = r = 1: 2x − x² + 1 = 0, K = x = 1 + √2 (closed form, derived by hand). The
  // LQR guarantees ‖S‖∞ ≤ 1, gain_low ≤ ½, gain_high = inf, PM ≥ 60° ([SA1977], from memory;
  // tolerance 1e-9). Here exactly (by hand): L = K/(s − 1), gain_low = 1/K = √2 − 1;
  // |L| = 1 at ω = √(K² − 1) with PM = atan ω; S = (s − 1)/(s + √2) has ‖S‖∞ = 1 at infinity;
  // S − ½ = (s − 2 − √2)/(2(s + √2)) peaks at DC: α = 2√2/(2 + √2) = 2(√2 − 1).
  const double k = 1 + std::sqrt(2.0);
  const AnalysisResult<LoopMargins> m_result = InputMargins(Scalar(1), Scalar(1), Scalar(k), 0);
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_LE(m.gain_low, 0.5 + 1e-9);
  EXPECT_EQ(m.gain_high, kInf);
  EXPECT_GE(m.phase_deg, 60 - 1e-9);
  EXPECT_NEAR(m.gain_low, std::sqrt(2.0) - 1, 1e-12);
  EXPECT_NEAR(m.phase_deg, std::atan(std::sqrt(k * k - 1)) * kDeg, 1e-9);
  EXPECT_NEAR(m.disk_alpha, 2 * (std::sqrt(2.0) - 1), 1e-9);
  const AnalysisResult<NormPeak> s_result =
      HinfNorm(InputSensitivity(Scalar(1), Scalar(1), Scalar(k)));
  ASSERT_TRUE(Succeeded(s_result));
  const NormPeak& s = *s_result;
  EXPECT_LE(s.norm, 1 + 1e-9);
  EXPECT_NEAR(s.norm, 1, 1e-9);
  EXPECT_EQ(s.peak_rad_s, kInf);
}

TEST(InputMargins, DoubleIntegratorLqrHasTheGuaranteedMargins) {
  // A = [0 1; 0 0], B = [0; 1], Q = I, R = 1: K = [1 √3] ([SB02OD] documentation example;
  // checked numerically). Guarantees as above ([SA1977], tolerance 1e-9). By hand:
  // L = (√3 s + 1)/s²; 1 + kL ∝ s² + √3k s + k is stable for every k > 0 (gain_low = 0,
  // gain_high = inf); |L| = 1 at ω² = (3 + √13)/2 with PM = atan(√3 ω);
  // S = s²/(s² + √3 s + 1), |S|² = ω⁴/(ω⁴ + ω² + 1) < 1, so ‖S‖∞ = 1 at infinity.
  Eigen::MatrixXd a(2, 2);
  a << 0, 1, 0, 0;
  const Eigen::MatrixXd b = Eigen::Vector2d(0, 1);
  const Eigen::MatrixXd k = Eigen::RowVector2d(1, std::sqrt(3.0));
  const AnalysisResult<LoopMargins> m_result = InputMargins(a, b, k, 0);
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_LE(m.gain_low, 0.5 + 1e-9);
  EXPECT_GE(m.phase_deg, 60 - 1e-9);
  EXPECT_EQ(m.gain_low, 0.0);
  EXPECT_EQ(m.gain_high, kInf);
  const double wc = std::sqrt((3 + std::sqrt(13.0)) / 2);
  EXPECT_NEAR(m.phase_rad_s, wc, 1e-9);
  EXPECT_NEAR(m.phase_deg, std::atan(std::sqrt(3.0) * wc) * kDeg, 1e-9);
  const AnalysisResult<NormPeak> s_result = HinfNorm(InputSensitivity(a, b, k));
  ASSERT_TRUE(Succeeded(s_result));
  const NormPeak& s = *s_result;
  EXPECT_LE(s.norm, 1 + 1e-9);
  EXPECT_EQ(s.peak_rad_s, kInf);
  ExpectDiskWithinClassical(m);
}

TEST(InputMargins, LoopAtATimeMatchesScalingOneInput) {
  // Coupled 3-state, 2-input loop. Gain margins of channel j are the factors on input j alone
  // that destabilise A − B diag(…, k, …) K: found here by brute-force stability scans.
  Eigen::MatrixXd a(3, 3), b(3, 2), k(2, 3);
  a << 0, 1, 0, 2, -0.5, 1, 0, -1, 0.3;
  b << 0, 1, 1, 0, 0.5, 1;
  k << 5, 2, 0, 0, 1, 3;
  ASSERT_TRUE(Hurwitz((a - b * k).cast<Cd>()));
  for (int j = 0; j < 2; ++j) {
    // The loop seen by a gain on input j: L_j built from the definition, independently.
    const auto stable = [&](double factor) {
      Eigen::Matrix2d scale = Eigen::Matrix2d::Identity();
      scale(j, j) = factor;
      return Hurwitz((a - b * scale * k).cast<Cd>());
    };
    // Scan from 1 towards `end` by factors of 1.01, then bisect the first unstable step.
    const auto boundary = [&](double end) {
      const double step = end > 1 ? 1.01 : 1 / 1.01;
      for (double f = step; end > 1 ? f < end : f > end; f *= step) {
        if (stable(f)) continue;
        double s = f / step, u = f;
        for (int i = 0; i < 80; ++i) {
          const double middle = std::sqrt(s * u);
          if (stable(middle)) {
            s = middle;
          } else {
            u = middle;
          }
        }
        return s;
      }
      return end > 1 ? kInf : 0.0;
    };
    const double high = boundary(1e4), low = boundary(1e-4);
    const AnalysisResult<LoopMargins> m_result = InputMargins(a, b, k, j);
    ASSERT_TRUE(Succeeded(m_result));
    const LoopMargins& m = *m_result;
    if (std::isinf(high)) {
      EXPECT_EQ(m.gain_high, kInf) << "channel " << j;
    } else {
      EXPECT_NEAR(m.gain_high / high, 1, 1e-8) << "channel " << j;
    }
    EXPECT_NEAR(m.gain_low, low, 1e-8 * std::max(low, 1.0)) << "channel " << j;
    // This example is chosen so that the margins are finite where they matter.
    EXPECT_TRUE(std::isfinite(high)) << "channel " << j;
    if (j == 0) {
      EXPECT_GT(low, 0);
    }
  }
}

TEST(InputSensitivity, LeavesMismatchedSizesForHinfNormToReport) {
  const AnalysisFailure<NormPeak> r =
      FailureOf(HinfNorm(InputSensitivity(Scalar(-1), Eigen::MatrixXd::Ones(2, 1), Scalar(1))));
  EXPECT_NE(r.message.find("B is 2×1"), std::string::npos) << r.message;
}

TEST(WorstInputMargins, TakesTheWorstOfEachFigure) {
  // Decoupled: ẋ1 = x1 + u1 with u1 = −2x1 (L = 2/(s − 1): gain_low ½, PM 60°, delay
  // π/(3√3) ≈ 0.605 s, α = 2/3), ẋ2 = −x2 + u2 with u2 = −3x2 (L = 3/(s + 1): gain_low 0,
  // PM 180° − atan √8 ≈ 109.5°, delay (π − atan √8)/√8 ≈ 0.676 s, S − ½ = (s − 2)/(2(s + 4)) →
  // α = 2 at infinity) (derived by hand).
  const Eigen::MatrixXd a = Eigen::Vector2d(1, -1).asDiagonal();
  const Eigen::MatrixXd b = Eigen::Matrix2d::Identity();
  const Eigen::MatrixXd k = Eigen::Vector2d(2, 3).asDiagonal();
  const AnalysisResult<LoopMargins> second_result = InputMargins(a, b, k, 1);
  ASSERT_TRUE(Succeeded(second_result));
  const LoopMargins& second = *second_result;
  EXPECT_NEAR(second.phase_deg, 180 - std::atan(std::sqrt(8.0)) * kDeg, 1e-9);
  EXPECT_NEAR(second.delay_s, (std::numbers::pi - std::atan(std::sqrt(8.0))) / std::sqrt(8.0),
              1e-10);
  EXPECT_NEAR(second.disk_alpha, 2, 1e-8);
  const AnalysisResult<LoopMargins> w_result = WorstInputMargins(a, b, k);
  ASSERT_TRUE(Succeeded(w_result));
  const LoopMargins& w = *w_result;
  EXPECT_NEAR(w.gain_low, 0.5, 1e-12);
  EXPECT_EQ(w.gain_high, kInf);
  EXPECT_NEAR(w.phase_deg, 60, 1e-9);
  EXPECT_NEAR(w.delay_s, std::numbers::pi / 3 / std::sqrt(3.0), 1e-10);
  EXPECT_NEAR(w.disk_alpha, 2.0 / 3, 1e-9);
  ExpectDiskFieldsFollowAlpha(w);
  // The same with the channels swapped.
  const Eigen::MatrixXd swap = (Eigen::Matrix2d() << 0, 1, 1, 0).finished();
  const AnalysisResult<LoopMargins> swapped_result =
      WorstInputMargins(swap * a * swap, swap * b, k * swap);
  ASSERT_TRUE(Succeeded(swapped_result));
  const LoopMargins& swapped = *swapped_result;
  EXPECT_NEAR(swapped.gain_low, 0.5, 1e-12);
  EXPECT_NEAR(swapped.phase_deg, 60, 1e-9);
  EXPECT_NEAR(swapped.disk_alpha, 2.0 / 3, 1e-9);
}

TEST(SisoMargins, PureGainLoop) {
  // L = 2: 1 + 2k never vanishes for k > 0 and |L| never equals 1, so every classical margin is
  // infinite; S − ½ = 1/3 − 1/2 = −1/6 gives α = 6, beyond 2: disk gains [0, inf) and disk phase
  // 2 atan 3 (derived by hand).
  const AnalysisResult<LoopMargins> m_result =
      SisoMargins({Eigen::MatrixXd(0, 0), Eigen::MatrixXd(0, 1), Eigen::MatrixXd(1, 0), Scalar(2)});
  ASSERT_TRUE(Succeeded(m_result));
  const LoopMargins& m = *m_result;
  EXPECT_EQ(m.gain_low, 0.0);
  EXPECT_EQ(m.gain_high, kInf);
  EXPECT_EQ(m.phase_deg, kInf);
  EXPECT_EQ(m.delay_s, kInf);
  EXPECT_NEAR(m.disk_alpha, 6, 1e-12);
  EXPECT_EQ(m.disk_gain_low, 0.0);
  EXPECT_EQ(m.disk_gain_high, kInf);
  EXPECT_NEAR(m.disk_phase_deg, 2 * std::atan(3.0) * kDeg, 1e-10);
}

TEST(SisoMargins, UnstableClosedLoopIsReported) {
  // L = 0.5/(s − 1): 1 + L ∝ s − 0.5, unstable (derived by hand).
  const AnalysisFailure<LoopMargins> m =
      FailureOf(SisoMargins({Scalar(1), Scalar(1), Scalar(0.5), Scalar(0)}));
  EXPECT_NE(m.message.find("unstable"), std::string::npos) << m.message;
  EXPECT_NE(m.message.find("0.5"), std::string::npos) << m.message;
  const AnalysisFailure<LoopMargins> in =
      FailureOf(InputMargins(Scalar(1), Scalar(1), Scalar(0.5), 0));
  EXPECT_NE(in.message.find("input channel 0"), std::string::npos) << in.message;
  EXPECT_FALSE(WorstInputMargins(Scalar(1), Scalar(1), Scalar(0.5)).has_value());
}

TEST(SisoMargins, RejectsBadInput) {
  EXPECT_FALSE(
      SisoMargins({Scalar(-1), Eigen::MatrixXd::Ones(1, 2), Scalar(1), Scalar(0)}).has_value());
  const AnalysisFailure<LoopMargins> ill_posed =
      FailureOf(SisoMargins({Scalar(-1), Scalar(1), Scalar(1), Scalar(-1)}));
  EXPECT_NE(ill_posed.message.find("1 + D = 0"), std::string::npos) << ill_posed.message;
  const AnalysisFailure<LoopMargins> channel =
      FailureOf(InputMargins(Scalar(-1), Scalar(1), Scalar(1), 1));
  EXPECT_NE(channel.message.find("channel = 1"), std::string::npos) << channel.message;
  EXPECT_FALSE(InputMargins(Scalar(-1), Scalar(1), Eigen::MatrixXd::Ones(1, 2), 0).has_value());
}

// Uniform numbers in [−1, 1) from the standard 64-bit Mersenne Twister (its sequence is fixed by
// the C++ standard).
class Random {
 public:
  explicit Random(std::uint64_t seed) : engine_(seed) {}
  double Uniform() { return static_cast<double>(engine_() >> 11) * 0x1.0p-52 - 1.0; }

 private:
  std::mt19937_64 engine_;
};

// A random single-input loop L = K (sI − A)⁻¹ b, K placing the closed-loop poles at random stable
// locations (Ackermann's formula), A random and usually unstable.
StateSpace RandomLoop(Random& random, int n) {
  Eigen::MatrixXd a(n, n);
  Eigen::VectorXd b(n);
  for (int i = 0; i < n; ++i) {
    b(i) = random.Uniform();
    for (int j = 0; j < n; ++j) a(i, j) = 2 * random.Uniform();
  }
  std::vector<Cd> poles;
  while (static_cast<int>(poles.size()) < n) {
    const double re = -0.2 - (random.Uniform() + 1);
    if (static_cast<int>(poles.size()) + 1 < n && random.Uniform() > 0) {
      const double im = 0.2 + 1.5 * (random.Uniform() + 1);
      poles.insert(poles.end(), {Cd(re, im), Cd(re, -im)});
    } else {
      poles.push_back(re);
    }
  }
  Eigen::VectorXcd coefficients = Eigen::VectorXcd::Zero(n + 1);  // of Π (s − p), low order first
  coefficients(0) = 1;
  for (const Cd& p : poles) {
    Eigen::VectorXcd next = Eigen::VectorXcd::Zero(n + 1);
    next.tail(n) = coefficients.head(n);
    next -= p * coefficients;
    coefficients = next;
  }
  Eigen::MatrixXd controllability(n, n), polynomial = Eigen::MatrixXd::Zero(n, n);
  Eigen::MatrixXd power = Eigen::MatrixXd::Identity(n, n);
  for (int i = 0; i <= n; ++i) {
    if (i < n) controllability.col(i) = power * b;
    polynomial += coefficients(i).real() * power;
    power = power * a;
  }
  Eigen::RowVectorXd last = Eigen::RowVectorXd::Zero(n);
  last(n - 1) = 1;
  const Eigen::RowVectorXd k = last * controllability.inverse() * polynomial;
  return {a, b, k, Scalar(0)};
}

TEST(SisoMargins, RandomLoopsAgreeWithBruteForce) {
  // Gain margins against stability scans over real gains, the phase margin against scans over
  // e^{−jθ}, the disk margin against a dense grid, and the delay margin against a Padé model of
  // the delay just inside and just outside it. None of these uses crossover frequencies.
  Random random(3);
  int checked_delay = 0;
  for (int trial = 0; trial < 24; ++trial) {
    const StateSpace l = RandomLoop(random, 1 + trial % 6);
    ASSERT_TRUE(StableWithGain(l, 1.0));
    const AnalysisResult<LoopMargins> m_result = SisoMargins(l);
    ASSERT_TRUE(Succeeded(m_result));
    const LoopMargins& m = *m_result;
    const double high = ScanGain(l, 1e4), low = ScanGain(l, 1e-4);
    if (std::isinf(high)) {
      EXPECT_TRUE(std::isinf(m.gain_high) || m.gain_high > 1e4) << "trial " << trial;
    } else {
      EXPECT_NEAR(m.gain_high / high, 1, 1e-7) << "trial " << trial;
    }
    EXPECT_NEAR(m.gain_low, low, 1e-7 * std::max(low, 1e-4)) << "trial " << trial;
    const double phase = ScanPhase(l);
    if (std::isinf(phase)) {
      EXPECT_EQ(m.phase_deg, kInf) << "trial " << trial;
    } else {
      EXPECT_NEAR(m.phase_deg, phase, 1e-6) << "trial " << trial;
    }
    const double disk = ScanDisk(l);
    EXPECT_LE(m.disk_alpha, disk * (1 + 1e-9)) << "trial " << trial;
    EXPECT_GE(m.disk_alpha, disk * (1 - 1e-3)) << "trial " << trial;
    ExpectDiskWithinClassical(m);
    // At the delay margin the delayed loop passes through −1 at delay_rad_s.
    if (std::isfinite(m.delay_s) && m.delay_rad_s * m.delay_s <= 3) {
      ++checked_delay;
      EXPECT_TRUE(StableWithDelay(l, m.delay_s * (1 - 1e-4))) << "trial " << trial;
      EXPECT_FALSE(StableWithDelay(l, m.delay_s * (1 + 1e-4))) << "trial " << trial;
    }
  }
  EXPECT_GE(checked_delay, 12);
}

}  // namespace
}  // namespace upright::design
