// The tilt filter against the closed forms of its error dynamics (tilt_filter.hpp, derived by
// hand there from the 2 × 2 error matrix and its eigenvalues): a constant gyro bias learnt tick by
// tick, a pitch seen by the accelerometer alone, the first-order filter as the bias's time
// constant grows without bound, and the gate.
#include "kit/tilt_filter.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

namespace upright::controllers {
namespace {

constexpr double kPeriod = 0.005;  // 200 Hz
constexpr double kTau = 0.5, kTauBias = 2;
constexpr double kNoGate = 10;  // rad: no innovation below reaches it

// The error poles exp(−T/τ) and exp(−T/τ_b) at the tests' period.
struct Poles {
  double p1 = std::exp(-kPeriod / kTau), p2 = std::exp(-kPeriod / kTauBias);
};

TEST(TiltFilter, GainsPlaceTheErrorPolesAtTheContinuousPolesMapped) {
  const TiltFilter filter(kPeriod, kTau, kTauBias, kNoGate);
  const double p1 = std::exp(-kPeriod / kTau), p2 = std::exp(-kPeriod / kTauBias);
  const double l1 = filter.tilt_gain(), l2 = filter.bias_gain();
  // M = [[1 − l₁, 1 − l₁], [−l₂, 1 − l₂]]: trace p₁ + p₂, determinant p₁ p₂.
  EXPECT_NEAR(2 - l1 - l2, p1 + p2, 1e-15);
  EXPECT_NEAR(1 - l1, p1 * p2, 1e-15);
}

TEST(TiltFilter, LearnsAConstantGyroBiasAsItsClosedForm) {
  // Standing still (true pitch 0, the accelerometer reads 0) while the gyro reads a bias the
  // filter does not know at the start.
  const double bias = 0.02;  // rad/s
  const Poles run;
  const double p1 = run.p1, p2 = run.p2;
  TiltFilter filter(kPeriod, kTau, kTauBias, kNoGate);
  filter.Start(0);
  for (int k = 1; k <= 4000; ++k) {  // 20 s, 10 τ_b
    filter.Update(bias, 0);
    const double learnt =
        bias * (1 - (std::pow(p1, k + 1) * (1 - p2) - std::pow(p2, k + 1) * (1 - p1)) / (p1 - p2));
    const double tilt_error =
        kPeriod * bias * p1 * p2 * (std::pow(p1, k) - std::pow(p2, k)) / (p1 - p2);
    ASSERT_NEAR(filter.bias_rad_s(), learnt, 1e-12 * bias) << "tick " << k;
    ASSERT_NEAR(filter.pitch_rad(), tilt_error, 1e-14) << "tick " << k;
  }
  // After 5 τ_b = 10 s, with τ_b = 4 τ: within 1 % of the bias (0.9 % by the closed form, about
  // e^(−5) τ_b / (τ_b − τ) in continuous time). The tilt error peaked near 0.32 b s.
  TiltFilter again(kPeriod, kTau, kTauBias, kNoGate);
  again.Start(0);
  double peak = 0;
  for (int k = 1; k <= 2000; ++k) {
    again.Update(bias, 0);
    peak = std::max(peak, again.pitch_rad());
  }
  EXPECT_NEAR(again.bias_rad_s(), bias, 0.01 * bias);
  EXPECT_GT(std::abs(again.bias_rad_s() - bias), 0.005 * bias);
  // Continuous time: b (e^(−t/τ_b) − e^(−t/τ)) / (1/τ − 1/τ_b), largest at
  // t = ln(τ_b/τ) τ τ_b / (τ_b − τ) = 0.924 s, where it is 0.315 b s (derived by hand).
  EXPECT_NEAR(peak, 0.315 * bias, 0.01 * 0.315 * bias);
}

TEST(TiltFilter, WithEqualTimeConstantsLearnsTheBiasAsTheDoublePole) {
  const double bias = -0.01;
  const double p = std::exp(-kPeriod / kTau);
  TiltFilter filter(kPeriod, kTau, kTau, kNoGate);
  filter.Start(0);
  for (int k = 1; k <= 1000; ++k) {
    filter.Update(bias, 0);
    ASSERT_NEAR(filter.bias_rad_s(), bias * (1 - std::pow(p, k) * (1 + k * (1 - p))),
                1e-12 * std::abs(bias))
        << "tick " << k;
    ASSERT_NEAR(filter.pitch_rad(), kPeriod * bias * k * std::pow(p, k + 1), 1e-14);
  }
  // 5 τ = 500 ticks: p^500 (1 + 500 (1 − p)) = e^(−5) · 6 to within the discrete form's 0.7 %.
  TiltFilter again(kPeriod, kTau, kTau, kNoGate);
  again.Start(0);
  for (int k = 1; k <= 500; ++k) again.Update(bias, 0);
  EXPECT_NEAR(1 - again.bias_rad_s() / bias, 6 * std::exp(-5.0), 0.007 * 6 * std::exp(-5.0));
}

TEST(TiltFilter, ApproachesAPitchTheAccelerometerAloneSees) {
  const double tilt = 0.1;
  const Poles run;
  const double p1 = run.p1, p2 = run.p2;
  TiltFilter filter(kPeriod, kTau, kTauBias, kNoGate);
  filter.Start(0);
  for (int k = 1; k <= 2000; ++k) {
    filter.Update(0, tilt);
    const double expected =
        tilt *
        (1 - (p1 * std::pow(p2, k) * (1 - p2) - p2 * std::pow(p1, k) * (1 - p1)) / (p1 - p2));
    ASSERT_NEAR(filter.pitch_rad(), expected, 1e-14) << "tick " << k;
  }
}

TEST(TiltFilter, WithoutABiasTermIsTheFirstOrderComplementaryFilter) {
  // τ_b → ∞: l₂ = 0, θ̂ = p θ⁻ + (1 − p) θ_a, and a constant accelerometer pitch is approached
  // as 1 − p^k, the sampled 1 − e^(−t/τ), exactly.
  const double tilt = 0.1, p = std::exp(-kPeriod / kTau);
  TiltFilter filter(kPeriod, kTau, std::numeric_limits<double>::infinity(), kNoGate);
  EXPECT_EQ(filter.bias_gain(), 0);
  filter.Start(0);
  for (int k = 1; k <= 600; ++k) {
    filter.Update(0, tilt);
    ASSERT_NEAR(filter.pitch_rad(), tilt * (1 - std::pow(p, k)), 1e-14) << "tick " << k;
  }
  EXPECT_EQ(filter.bias_rad_s(), 0);
}

TEST(TiltFilter, TheGateKeepsThePredictionAndTheBias) {
  TiltFilter filter(kPeriod, kTau, kTauBias, /*gate_rad=*/0.2);
  filter.Start(0.05);
  for (int k = 0; k < 100; ++k) filter.Update(0.01, 0.05);  // a little bias learnt
  const double pitch = filter.pitch_rad(), bias = filter.bias_rad_s();
  ASSERT_FALSE(filter.gated());
  // A knock: the accelerometer reads 1 rad for a tick while the gyro reads 0.3 rad/s.
  filter.Update(0.3, 1.0);
  EXPECT_TRUE(filter.gated());
  EXPECT_NEAR(filter.pitch_rad(), pitch + kPeriod * (0.3 - bias), 1e-15);
  EXPECT_EQ(filter.bias_rad_s(), bias);
  // Just inside the gate the correction is taken.
  filter.Update(0, filter.pitch_rad() - filter.bias_rad_s() * kPeriod + 0.19);
  EXPECT_FALSE(filter.gated());
  // A reading with no value (NaN) is never taken.
  filter.Update(0, std::numeric_limits<double>::quiet_NaN());
  EXPECT_TRUE(filter.gated());
  EXPECT_TRUE(std::isfinite(filter.pitch_rad()));
}

TEST(TiltFilter, TakesADisagreementThatOutlastsItsTimeConstant) {
  // The estimate 0.3 rad off (beyond the 0.2 rad gate) for good: τ / T = 100 ticks dropped, then
  // the corrections are taken, and once inside the gate the filter runs as usual and reaches it.
  TiltFilter filter(kPeriod, kTau, kTauBias, /*gate_rad=*/0.2);
  filter.Start(0);
  for (int k = 1; k <= 100; ++k) {
    filter.Update(0, 0.3);
    ASSERT_TRUE(filter.gated()) << "tick " << k;
    ASSERT_EQ(filter.pitch_rad(), 0);
  }
  filter.Update(0, 0.3);
  EXPECT_FALSE(filter.gated());
  EXPECT_GT(filter.pitch_rad(), 0);
  for (int k = 0; k < 4000; ++k) filter.Update(0, 0.3);
  EXPECT_NEAR(filter.pitch_rad(), 0.3, 1e-4 * 0.3);  // 20 s later, 10 τ_b
}

}  // namespace
}  // namespace upright::controllers
