// The design push and the linear loop's peaks under it: against the closed-form response of a
// first-order loop to a half-sine, and against an independent Runge–Kutta integration of a demo
// robot's closed loop.
#include "upright/design/design_push.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <string>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

TEST(DesignPush, CarriesThePushScaleForOneSecondOverTwoFallTimeConstants) {
  // A half-sine F sin(πt/T) over T carries ∫ = 2 F T / π (calculus, derived by hand), so its
  // peak for an impulse J is π J / (2 T).
  const LinearModel plant = Linearise(Demo("courier.xml"), InputKind::kTorque);
  const DesignPush push = DesignPushFor(plant, 31.4);
  EXPECT_NEAR(push.impulse_Ns, 31.4, 1e-12);
  EXPECT_NEAR(push.duration_s, 2 / plant.fall_rate_1_s, 1e-12);
  EXPECT_NEAR(push.peak_N() * 2 * push.duration_s / std::numbers::pi, 31.4, 1e-12);
}

// A loop of decoupled first-order states ẋ_i = −a_i x_i (B = 0, so K only reads the state),
// the push entering the pitch alone.
LinearModel FirstOrderLoop(double a_pitch, double e_pitch) {
  LinearModel plant;
  plant.A = -StateMatrix::Identity();
  plant.A(kPitch, kPitch) = -a_pitch;
  plant.B.setZero();
  plant.E.setZero();
  plant.E(kPitch, 0) = e_pitch;
  return plant;
}

TEST(LinearPushPeaks, FollowTheClosedFormOfAFirstOrderLoop) {
  // θ̇ = −a θ + e F sin ωt for t ≤ T (ω = π / T), from rest:
  // θ(t) = e F (a sin ωt − ω cos ωt + ω e^{−at}) / (a² + ω²) (first-order linear ODE, derived by
  // hand); after T it decays, so the peak is where θ̇ = 0 inside the push. Found here by bisection
  // on θ̇ = −a θ + e F sin ωt, which changes sign once on (0, T).
  const double a = 3, e = 0.02, gain = 40;
  const LinearModel plant = FirstOrderLoop(a, e);
  const DesignPush push{12, 0.4};
  const double F = push.peak_N(), w = std::numbers::pi / push.duration_s;
  const auto theta = [&](double t) {
    return e * F * (a * std::sin(w * t) - w * std::cos(w * t) + w * std::exp(-a * t)) /
           (a * a + w * w);
  };
  const auto rate = [&](double t) { return -a * theta(t) + e * F * std::sin(w * t); };
  double lo = push.duration_s / 2, hi = push.duration_s;  // θ̇ > 0 at T/2, < 0 at T
  ASSERT_GT(rate(lo), 0);
  ASSERT_LT(rate(hi), 0);
  for (int i = 0; i < 100; ++i) (rate((lo + hi) / 2) > 0 ? lo : hi) = (lo + hi) / 2;
  const double peak = theta(lo);

  Gain K = Gain::Zero();
  K(model::kLeft, kPitch) = gain;  // u_left = −40 θ; with B = 0 it reaches nothing
  CurrentMap current;
  current.per_input = 0.5;
  const Result<PushPeaks> peaks = LinearPushPeaks(plant, K, current, push);
  ASSERT_TRUE(Succeeded(peaks));
  // Sampled every T/200, the largest sample lies within (ω_θ Δt)²/8 of the peak, relative.
  EXPECT_NEAR(peaks->tilt_rad, peak, 1e-4 * peak);
  EXPECT_NEAR(peaks->current_A, 0.5 * gain * peaks->tilt_rad, 1e-12);
}

TEST(LinearPushPeaks, RefuseAnUnstableLoopAndAPushOfNoSize) {
  const LinearModel plant = FirstOrderLoop(-1, 0.02);  // θ̇ = +θ: unstable
  EXPECT_FALSE(LinearPushPeaks(plant, Gain::Zero(), CurrentMap{}, DesignPush{12, 0.4}));
  const LinearModel stable = FirstOrderLoop(3, 0.02);
  EXPECT_FALSE(LinearPushPeaks(stable, Gain::Zero(), CurrentMap{}, DesignPush{0, 0.4}));
  EXPECT_FALSE(LinearPushPeaks(stable, Gain::Zero(), CurrentMap{}, DesignPush{12, 0}));
  EXPECT_FALSE(LinearPushPeaks(stable, Gain::Zero(), CurrentMap{}, DesignPush{NAN, 0.4}));
}

TEST(LinearPushPeaks, AgreeWithARungeKuttaIntegrationOfTheRobotsLoop) {
  // The LQR loop of a demo robot, integrated by the classical fourth-order Runge–Kutta method at
  // 20 µs (Press et al., Numerical Recipes, from memory): its largest |θ| and current over 4 s
  // match the exact solution's to the sampling of the peak.
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const model::RobotModel model = Demo(name);
    const DesignSet d = DesignAll(model, DesignRequest{});
    ASSERT_TRUE(d.lqr.ok) << d.lqr.message;
    const LinearModel& plant = d.plant;
    const Gain K = d.lqr.K;
    const DesignPush push = DesignPushFor(plant, d.performance.push_scale_N);
    const CurrentMap current = MotorCurrent(model, InputKind::kTorque);
    const StateMatrix closed = plant.A - plant.B * K;
    const auto f = [&](double t, const StateVector& x) -> StateVector {
      const double force = t < push.duration_s
                               ? push.peak_N() * std::sin(std::numbers::pi * t / push.duration_s)
                               : 0;
      return closed * x + plant.E.col(0) * force;
    };
    StateVector x = StateVector::Zero();
    double tilt = 0, amps = 0;
    const double h = 2e-5;
    for (int k = 0; k < 200000; ++k) {
      const double t = k * h;
      const StateVector k1 = f(t, x), k2 = f(t + h / 2, x + h / 2 * k1),
                        k3 = f(t + h / 2, x + h / 2 * k2), k4 = f(t + h, x + h * k3);
      x += h / 6 * (k1 + 2 * k2 + 2 * k3 + k4);
      tilt = std::max(tilt, std::abs(x(kPitch)));
      amps = std::max(amps, current.per_input * (K * x).cwiseAbs().maxCoeff());
    }
    const Result<PushPeaks> peaks = LinearPushPeaks(plant, K, current, push);
    ASSERT_TRUE(Succeeded(peaks)) << name;
    EXPECT_NEAR(peaks->tilt_rad, tilt, 1e-4 * tilt) << name;
    EXPECT_NEAR(peaks->current_A, amps, 1e-3 * amps) << name;
  }
}

TEST(SampledPushPeaks, AgreeWithARungeKuttaIntegrationOfTheHeldInput) {
  // The discrete LQR of a demo robot at its rate, u_k = −K x(kT) held for T: the classical
  // fourth-order Runge–Kutta method at a step dividing T (Press et al., Numerical Recipes, from
  // memory), the input recomputed at each tick, gives the same peaks over 4 s.
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const model::RobotModel model = Demo(name);
    const DesignSet d = DesignAll(model, DesignRequest{});
    ASSERT_TRUE(d.lqr.ok) << d.lqr.message;
    const LinearModel& plant = d.plant;
    const Gain K = d.lqr.K_discrete;
    const double period_s = 1 / d.request.rate_hz;
    const DesignPush push = DesignPushFor(plant, d.performance.push_scale_N);
    const CurrentMap current = MotorCurrent(model, InputKind::kTorque);
    Eigen::Vector2d u = Eigen::Vector2d::Zero();
    const auto f = [&](double t, const StateVector& x) -> StateVector {
      const double force = t < push.duration_s
                               ? push.peak_N() * std::sin(std::numbers::pi * t / push.duration_s)
                               : 0;
      return plant.A * x + plant.B * u + plant.E.col(0) * force;
    };
    constexpr int kPerPeriod = 250;
    const double h = period_s / kPerPeriod;
    StateVector x = StateVector::Zero();
    double tilt = 0, amps = 0;
    for (int k = 0; k < static_cast<int>(4 / period_s); ++k) {
      u = -K * x;
      amps = std::max(amps, current.per_input * u.cwiseAbs().maxCoeff());
      for (int j = 0; j < kPerPeriod; ++j) {
        const double t = static_cast<double>(k * kPerPeriod + j) * h;
        const StateVector k1 = f(t, x), k2 = f(t + h / 2, x + h / 2 * k1),
                          k3 = f(t + h / 2, x + h / 2 * k2), k4 = f(t + h, x + h * k3);
        x += h / 6 * (k1 + 2 * k2 + 2 * k3 + k4);
        tilt = std::max(tilt, std::abs(x(kPitch)));
      }
    }
    const Result<PushPeaks> peaks = SampledPushPeaks(plant, K, current, push, period_s);
    ASSERT_TRUE(Succeeded(peaks)) << name;
    EXPECT_NEAR(peaks->tilt_rad, tilt, 1e-4 * tilt) << name;
    EXPECT_NEAR(peaks->current_A, amps, 1e-6 * amps) << name;  // held: a tick's, exactly
  }
}

TEST(SampledPushPeaks, TendToTheContinuousLoopsAsThePeriodShrinks) {
  // A continuous gain held over T lags like half a period (common practice): the sampled peaks
  // approach the continuous loop's, the gap about halving with T.
  const model::RobotModel model = Demo("courier.xml");
  const DesignSet d = DesignAll(model, DesignRequest{});
  ASSERT_TRUE(d.lqr.ok) << d.lqr.message;
  const DesignPush push = DesignPushFor(d.plant, d.performance.push_scale_N);
  const CurrentMap current = MotorCurrent(model, InputKind::kTorque);
  const Result<PushPeaks> continuous = LinearPushPeaks(d.plant, d.lqr.K, current, push);
  ASSERT_TRUE(Succeeded(continuous));
  double gap[3];
  for (int k = 0; k < 3; ++k) {
    const Result<PushPeaks> sampled =
        SampledPushPeaks(d.plant, d.lqr.K, current, push, 4e-3 / (1 << k));
    ASSERT_TRUE(Succeeded(sampled));
    gap[k] = std::abs(sampled->tilt_rad - continuous->tilt_rad) / continuous->tilt_rad;
  }
  EXPECT_LT(gap[2], 0.01);
  EXPECT_NEAR(gap[1] / gap[0], 0.5, 0.1);
  EXPECT_NEAR(gap[2] / gap[1], 0.5, 0.1);
}

TEST(SampledPushPeaks, RefuseAPeriodThatIsNoneAndALoopItCannotHold) {
  const model::RobotModel model = Demo("courier.xml");
  const LinearModel plant = Linearise(model, InputKind::kTorque);
  const DesignPush push = DesignPushFor(plant, 31.4);
  const CurrentMap current = MotorCurrent(model, InputKind::kTorque);
  EXPECT_FALSE(SampledPushPeaks(plant, Gain::Zero(), current, push, 0.005));  // open loop falls
  const DesignSet d = DesignAll(model, DesignRequest{});
  EXPECT_FALSE(SampledPushPeaks(plant, d.lqr.K_discrete, current, push, 0));
  EXPECT_FALSE(SampledPushPeaks(plant, d.lqr.K_discrete, current, push, NAN));
  EXPECT_FALSE(SampledPushPeaks(plant, d.lqr.K_discrete, current, DesignPush{0, 0.3}, 0.005));
}

}  // namespace
}  // namespace upright::design
