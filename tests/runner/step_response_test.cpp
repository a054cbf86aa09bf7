#include "upright/runner/metrics/step_response.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstddef>
#include <numbers>
#include <vector>

namespace upright::runner {
namespace {

constexpr double kDt = 0.001;  // 1 kHz sampling

// Unit step response of the standard underdamped second-order system ωn² / (s² + 2ζωn s + ωn²):
// y(t) = 1 − e^{−ζωn t} (cos ωd t + ζ/√(1−ζ²) sin ωd t), ωd = ωn √(1−ζ²)
// (handbook formula: Ogata, Modern Control Engineering, ch. 5, transient response of second-order
// systems).
struct SecondOrder {
  double zeta;
  double wn;
  double wd() const { return wn * std::sqrt(1 - zeta * zeta); }
  double sigma() const { return zeta * wn; }
  double Y(double t) const {
    const double r = zeta / std::sqrt(1 - zeta * zeta);
    return 1 - std::exp(-sigma() * t) * (std::cos(wd() * t) + r * std::sin(wd() * t));
  }
  // |y − 1| on the decaying side of lobe k. y − 1 = −e^{−σt} sin(ωd t + φ) / √(1−ζ²) with
  // φ = acos ζ, so y' ∝ sin(ωd t): the extrema are at t_k = kπ/ωd, where |y − 1| = e^{−σ t_k},
  // and |y − 1| falls monotonically from t_k to the zero at ((k+1)π − φ)/ωd.
  double PeakDeviation(int k) const { return std::exp(-sigma() * k * std::numbers::pi / wd()); }
  // The exact settling time into ±band: the last time |y − 1| = band, on the falling side of the
  // last lobe whose peak exceeds the band, found by bisection to 1e-13 s.
  double ExactSettlingTime(double band) const {
    int k = 0;
    while (PeakDeviation(k + 1) > band) ++k;
    double lo = k * std::numbers::pi / wd();
    double hi = ((k + 1) * std::numbers::pi - std::acos(zeta)) / wd();
    while (hi - lo > 1e-13) {
      const double mid = 0.5 * (lo + hi);
      (std::abs(Y(mid) - 1) > band ? lo : hi) = mid;
    }
    return hi;
  }
  std::vector<double> Sampled(double duration_s) const {
    std::vector<double> y;
    for (long i = 0; static_cast<double>(i) * kDt <= duration_s; ++i) {
      y.push_back(Y(static_cast<double>(i) * kDt));
    }
    return y;
  }
};

class SecondOrderStep : public ::testing::TestWithParam<double> {};

TEST_P(SecondOrderStep, ReboundIsThePercentOvershoot) {
  // The step from 0 to 1 starts 1 from its final value: that is its peak excursion, and the
  // rebound past 1 after it is the overshoot, so R / P · 100 = Mp = 100 exp(−ζπ / √(1−ζ²)) %
  // (Ogata, Modern Control Engineering, §5-3).
  const SecondOrder sys{GetParam(), 2 * std::numbers::pi};
  const std::vector<double> y = sys.Sampled(10);
  const Rebound r = PeakAndRebound(y, kDt, 1);
  EXPECT_EQ(r.peak, 1);
  EXPECT_EQ(r.peak_time_s, 0);
  const double expected =
      100 * std::exp(-sys.zeta * std::numbers::pi / std::sqrt(1 - sys.zeta * sys.zeta));
  // As for the overshoot above: the sampled maximum is low by at most ½ ωn² dt².
  const double tolerance_pct = 100 * 0.5 * sys.wn * sys.wn * kDt * kDt;
  EXPECT_LE(r.rebound_pct, expected + 1e-9);
  EXPECT_NEAR(r.rebound_pct, expected, tolerance_pct);
}

TEST_P(SecondOrderStep, SettlingTimeMatchesTheExactLastBandCrossing) {
  const SecondOrder sys{GetParam(), 2 * std::numbers::pi};
  const std::vector<double> y = sys.Sampled(10);
  const double band = 0.02;  // the 2 % criterion
  const double exact = sys.ExactSettlingTime(band);
  const double measured = SettlingTime(y, kDt, 1, band);
  // Samples are held: the answer is the first sample after the last crossing, so within
  // [exact, exact + dt).
  EXPECT_GE(measured, exact - 1e-12);
  EXPECT_LT(measured, exact + kDt);
  // The envelope e^{−σt}/√(1−ζ²) bounds |y − 1|, so the settling time can be no later than the
  // envelope's own time into the band (of which 4/(ζωn) is the usual rounding); it is an upper
  // bound, not an estimate.
  const double envelope_s = std::log(1 / (band * std::sqrt(1 - sys.zeta * sys.zeta))) / sys.sigma();
  EXPECT_LE(exact, envelope_s);
}

INSTANTIATE_TEST_SUITE_P(Damping, SecondOrderStep, ::testing::Values(0.2, 0.5, 0.7));

// Impulse response of the same system, up to its gain: h(t) = (1/ωd) e^{−σt} sin ωd t, which
// starts and ends at 0 (Ogata, Modern Control Engineering, §5-3).
class SecondOrderImpulse : public ::testing::TestWithParam<double> {};

TEST_P(SecondOrderImpulse, ReboundRatioIsTheDecayBetweenOppositePeaks) {
  const SecondOrder sys{GetParam(), 2 * std::numbers::pi};
  const double a = sys.sigma(), w = sys.wd();
  std::vector<double> y;
  for (long i = 0; static_cast<double>(i) * kDt <= 10; ++i) {
    const double t = static_cast<double>(i) * kDt;
    y.push_back(std::exp(-a * t) * std::sin(w * t) / w);
  }
  const Rebound r = PeakAndRebound(y, kDt, 0);
  // h' ∝ e^{−σt}(ωd cos ωd t − σ sin ωd t) = 0 where tan ωd t = ωd/σ: the peak at
  // t₁ = atan(ωd/σ)/ωd, and half a period later the opposite peak, e^{−σπ/ωd} of it: the
  // logarithmic decrement, e^{−σπ/ωd} = exp(−ζπ/√(1−ζ²)), the step's Mp / 100 again.
  EXPECT_NEAR(r.peak_time_s, std::atan(w / a) / w, kDt);
  const double expected =
      100 * std::exp(-sys.zeta * std::numbers::pi / std::sqrt(1 - sys.zeta * sys.zeta));
  // Each sampled peak is low by at most ½|y''| dt² with |y''| ≤ e^{−σt}(ωd + σ)² / ωd, relative
  // to a peak of e^{−σt} / √(σ² + ωd²); the ratio's relative error is at most twice that.
  const double peak_rel = 0.5 * (w + a) * (w + a) * kDt * kDt * std::sqrt(a * a + w * w) / w;
  EXPECT_NEAR(r.rebound_pct, expected, expected * 2 * peak_rel);
  EXPECT_LE(r.rebound_pct, 100);
}

INSTANTIATE_TEST_SUITE_P(Damping, SecondOrderImpulse, ::testing::Values(0.2, 0.5, 0.7));

TEST(SettlingTime, AllSamplesInBandIsZero) {
  const std::vector<double> y = {1.01, 0.99, 1.0, 1.015};
  EXPECT_EQ(SettlingTime(y, kDt, 1.0, 0.02), 0);
}

TEST(SettlingTime, LastSampleOutOfBandIsNaN) {
  const std::vector<double> y = {1.0, 1.0, 1.0, 1.05};
  EXPECT_TRUE(std::isnan(SettlingTime(y, kDt, 1.0, 0.02)));
}

TEST(SettlingTime, IsTheTimeOfTheFirstSampleOfTheFinalInBandRun) {
  // Out, in, out, in, in: the final in-band run starts at index 3.
  const std::vector<double> y = {2.0, 1.0, 0.5, 1.01, 0.99};
  EXPECT_DOUBLE_EQ(SettlingTime(y, 0.25, 1.0, 0.02), 0.75);
}

TEST(SettlingTime, NonFiniteSampleCountsAsOutOfBand) {
  const std::vector<double> y = {1.0, std::nan(""), 1.0};
  EXPECT_DOUBLE_EQ(SettlingTime(y, 0.5, 1.0, 0.02), 1.0);
}

TEST(SettlingTime, EmptySignalIsNaN) { EXPECT_TRUE(std::isnan(SettlingTime({}, kDt, 1.0, 0.02))); }

TEST(PeakAndRebound, NegativePeakIsMirrored) {
  const std::vector<double> y = {0.0, -1.0, -4.0, -2.0, 1.0, 0.5, -0.2};
  const Rebound r = PeakAndRebound(y, 0.1, 0);
  EXPECT_DOUBLE_EQ(r.peak, 4.0);
  EXPECT_DOUBLE_EQ(r.peak_time_s, 0.2);
  EXPECT_DOUBLE_EQ(r.rebound, 1.0);
  EXPECT_DOUBLE_EQ(r.rebound_pct, 25.0);
}

TEST(PeakAndRebound, ExcursionsBeforeThePeakDoNotCount) {
  // A small first swing up, the peak down, a rebound up: 0.5 of 3, not 3 of 1.
  const std::vector<double> y = {0.0, 1.0, -3.0, 0.5, 0.0};
  const Rebound r = PeakAndRebound(y, 0.1, 0);
  EXPECT_DOUBLE_EQ(r.peak, 3.0);
  EXPECT_DOUBLE_EQ(r.rebound, 0.5);
  EXPECT_DOUBLE_EQ(r.rebound_pct, 100.0 / 6.0);
}

TEST(PeakAndRebound, NoCrossingIsNoRebound) {
  const std::vector<double> y = {3.0, 2.0, 1.5, 1.1, 1.0};
  const Rebound r = PeakAndRebound(y, 0.1, 1.0);
  EXPECT_DOUBLE_EQ(r.peak, 2.0);
  EXPECT_EQ(r.peak_time_s, 0);
  EXPECT_EQ(r.rebound, 0);
  EXPECT_EQ(r.rebound_pct, 0);
}

TEST(PeakAndRebound, SignalAtTheFinalValueHasNoRatio) {
  const std::vector<double> y = {2.0, 2.0, 2.0};
  const Rebound r = PeakAndRebound(y, 0.1, 2.0);
  EXPECT_EQ(r.peak, 0);
  EXPECT_EQ(r.rebound, 0);
  EXPECT_TRUE(std::isnan(r.rebound_pct));
  EXPECT_TRUE(std::isnan(PeakAndRebound({}, 0.1, 0).rebound_pct));
}

TEST(StepRebound, DownwardStepMeasuresBelowTheFinalValue) {
  // From 10 down to 4, undershooting to 3: a peak excursion of 6 at the start, a rebound of 1 past
  // the final value on the other side, 1 / 6 of the step.
  const std::vector<double> y = {10.0, 6.0, 3.0, 4.5, 4.0};
  const Rebound r = PeakAndRebound(y, 0.5, 4);
  EXPECT_EQ(r.peak, 6);
  EXPECT_EQ(r.peak_time_s, 0);
  EXPECT_EQ(r.rebound, 1);
  EXPECT_NEAR(r.rebound_pct, 100.0 / 6.0, 1e-12);
}

TEST(StepRebound, MonotoneResponseHasNone) {
  const std::vector<double> y = {0.0, 0.5, 0.9, 1.0};
  const Rebound r = PeakAndRebound(y, 0.5, 1);
  EXPECT_EQ(r.peak, 1);
  EXPECT_EQ(r.rebound, 0);
  EXPECT_EQ(r.rebound_pct, 0);
}

}  // namespace
}  // namespace upright::runner
