// The speed filter: its steady-state gains against the tracking-index closed form and the Kalman
// filter's own covariance recursion, its noise ratio against the error dynamics' Lyapunov
// recursion, no lag where the one-period encoder difference lags half a period, and the
// quantisation noise it leaves against the one-period difference's Δ/(T√6).
#include "kit/speed_filter.hpp"

#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <numbers>

#include "upright/model/conventions.hpp"

namespace upright::controllers {
namespace {

// The steady-state Kalman gain of the piecewise-constant white acceleration model (x, v; F =
// [[1, T], [0, 1]], G = [T²/2, T], Q = σ_a² G Gᵀ, H = [1, 0], R = σ_z²), by iterating the filter's
// covariance recursion P⁻ = F P Fᵀ + Q, K = P⁻ Hᵀ / (H P⁻ Hᵀ + R), P = (I − K H) P⁻ (the Kalman
// filter's equations, written out here independently of the closed form).
Eigen::Vector2d RiccatiGain(double T, double sigma_a, double sigma_z) {
  Eigen::Matrix2d F;
  F << 1, T, 0, 1;
  const Eigen::Vector2d G(T * T / 2, T);
  const Eigen::Matrix2d Q = sigma_a * sigma_a * G * G.transpose();
  Eigen::Matrix2d P = Eigen::Matrix2d::Identity();
  Eigen::Vector2d K = Eigen::Vector2d::Zero();
  for (int i = 0; i < 20000; ++i) {
    const Eigen::Matrix2d prior = F * P * F.transpose() + Q;
    K = prior.col(0) / (prior(0, 0) + sigma_z * sigma_z);
    P = prior - K * prior.row(0);
  }
  return K;
}

TEST(SpeedGains, MatchTheKalmanFiltersSteadyStateForAnyTrackingIndex) {
  // Kalata's closed form (from memory; speed_filter.hpp) against the recursion above.
  const double T = 0.01, sigma_z = 1e-4;
  for (double lambda : {0.01, 0.0723, 0.33, 1.0, 5.0}) {
    const SpeedGains g = SpeedGains::ForTrackingIndex(lambda);
    const Eigen::Vector2d K = RiccatiGain(T, lambda * sigma_z / (T * T), sigma_z);
    EXPECT_NEAR(g.position, K(0), 1e-9) << "lambda " << lambda;
    EXPECT_NEAR(g.speed, K(1) * T, 1e-9) << "lambda " << lambda;
  }
  // λ = 1: α = 3/4, β = 1/2 exactly ((1 + 8 − 5·3)/−8 and (1 + 4 − 3)/4).
  EXPECT_NEAR(SpeedGains::ForTrackingIndex(1).position, 0.75, 1e-15);
  EXPECT_NEAR(SpeedGains::ForTrackingIndex(1).speed, 0.5, 1e-15);
}

TEST(SpeedGains, NoiseRatioIsTheErrorDynamicsSteadyVariance) {
  // Position noise alone: the estimate's error e_k = A e_(k−1) + K n_k, A = (I − K H) F; its
  // steady covariance by iterating P = A P Aᵀ + K Kᵀ (unit noise), the speed's variance against
  // 2β² / (α (4 − 2α − β)) over T².
  const double T = 0.01;
  for (double lambda : {0.0723, 0.33, 1.0}) {
    const SpeedGains g = SpeedGains::ForTrackingIndex(lambda);
    Eigen::Matrix2d F;
    F << 1, T, 0, 1;
    const Eigen::Vector2d K(g.position, g.speed / T);
    const Eigen::Matrix2d A = (Eigen::Matrix2d::Identity() - K * Eigen::RowVector2d(1, 0)) * F;
    Eigen::Matrix2d P = Eigen::Matrix2d::Zero();
    for (int i = 0; i < 20000; ++i) P = A * P * A.transpose() + K * K.transpose();
    EXPECT_NEAR(P(1, 1) * T * T, g.SpeedNoiseRatio(), 1e-9 * g.SpeedNoiseRatio())
        << "lambda " << lambda;
  }
}

TEST(SpeedFilter, FollowsALinearlyChangingAccelerationExactlyWithoutLag) {
  // x = v₀ t + a₀ t²/2 + j t³/6 with the exact acceleration a₀ + j t as input and exact travel:
  // the prediction is exact for an acceleration linear over the tick, so the innovation is zero
  // and the speed is v₀ + a₀ t + j t²/2 at every tick. The one-period difference of the same
  // travel is the mean speed over the last period: with j = 0 it lags by a₀ T / 2.
  const double T = 0.01, v0 = 0.2, a0 = 0.8, j = -0.6;
  SpeedFilter filter(T, SpeedGains::ForTrackingIndex(0.07));
  const auto travel = [&](double t) { return v0 * t + a0 * t * t / 2 + j * t * t * t / 6; };
  filter.Start(0, v0, a0);
  for (int k = 1; k <= 300; ++k) {
    const double t = k * T;
    filter.Update(travel(t), a0 + j * t);
    ASSERT_NEAR(filter.speed_m_s(), v0 + a0 * t + j * t * t / 2, 1e-12) << "t = " << t;
    ASSERT_NEAR(filter.travel_m(), travel(t), 1e-12);
  }
  const double t = 1.0;
  const double difference =
      (v0 * t + a0 * t * t / 2 - (v0 * (t - T) + a0 * (t - T) * (t - T) / 2)) / T;
  EXPECT_NEAR(v0 + a0 * t - difference, a0 * T / 2, 1e-12);
}

TEST(SpeedFilter, TakesTheQuantisationNoiseOfCoarseEncodersOutOfTheSpeed) {
  // A 700-count encoder on a 35 mm wheel at 100 Hz: one count is Δ = 2π · 0.035 / 700 = 0.314 mm
  // of travel, 0.031 m/s for one count per tick. The robot rolls at 0.3 m/s with a slow swing
  // (±0.22 m/s at 0.7 Hz), the travel quantised down to whole counts, the acceleration known.
  // One-period difference: two uniform quantisation errors, variance 2 Δ²/12 over T² (W. R.
  // Bennett, Bell System Technical Journal 27, 1948; from memory): σ = Δ / (T √6) = 12.8 mm/s.
  // The filter at the tracking index of that robot's accelerometer, λ = 0.0723: σ² = ratio ·
  // (Δ²/12) / T², the ratio from SpeedNoiseRatio (checked above), σ = 0.75 mm/s.
  const double T = 0.01, count = 2 * std::numbers::pi * 0.035 / 700;
  const SpeedGains gains = SpeedGains::ForTrackingIndex(0.0723);
  SpeedFilter filter(T, gains);
  const double w = 2 * std::numbers::pi * 0.7, swing = 0.05;
  const auto travel = [&](double t) { return 0.3 * t + swing * std::sin(w * t); };
  const auto speed = [&](double t) { return 0.3 + swing * w * std::cos(w * t); };
  const auto accel = [&](double t) { return -swing * w * w * std::sin(w * t); };
  const auto counted = [&](double t) { return count * std::floor(travel(t) / count); };
  filter.Start(counted(0), speed(0), accel(0));
  double filter_sum = 0, difference_sum = 0;
  const int ticks = 200000, settle = 1000;
  for (int k = 1; k <= ticks; ++k) {
    const double t = k * T;
    filter.Update(counted(t), accel(t));
    if (k <= settle) continue;
    const double filter_error = filter.speed_m_s() - speed(t);
    // The difference's own error: against the exact travel's difference, so that only the
    // quantisation counts (not its half-period lag).
    const double difference_error =
        (counted(t) - counted(t - T)) / T - (travel(t) - travel(t - T)) / T;
    filter_sum += filter_error * filter_error;
    difference_sum += difference_error * difference_error;
  }
  const double n = ticks - settle;
  const double difference_rms = std::sqrt(difference_sum / n);
  const double filter_rms = std::sqrt(filter_sum / n);
  const double sigma_z = count / std::sqrt(12.0);
  EXPECT_NEAR(difference_rms, count / (T * std::sqrt(6.0)), 0.03 * count / (T * std::sqrt(6.0)));
  const double predicted = std::sqrt(gains.SpeedNoiseRatio()) * sigma_z / T;
  // 10 %: the quantisation errors of successive ticks are not quite independent, as the formula
  // assumes, when the travel per tick changes slowly (common practice).
  EXPECT_NEAR(filter_rms, predicted, 0.10 * predicted);
  EXPECT_LT(filter_rms, difference_rms / 10);
}

}  // namespace
}  // namespace upright::controllers
