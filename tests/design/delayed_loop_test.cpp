// The delay-augmented sampled plant against closed forms of a scalar plant (one sample and half a
// sample of delay), the latency-free case against the plain sampled loop, the discrete LQR on the
// delayed plant against the predictor form it must take for a whole sample, and the sampled
// loop's margins with the latency at their edges.
#include "upright/design/delayed_loop.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <complex>
#include <vector>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/design/delay_augmented.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/riccati.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;
using Poles = std::vector<std::complex<double>>;

// The largest distance from a pole of `a` to its nearest in `b`, relative to max(1, |pole|).
double Mismatch(const Poles& a, const Poles& b) {
  double worst = 0;
  for (const auto& p : a) {
    double nearest = 1e300;
    for (const auto& q : b) nearest = std::min(nearest, std::abs(p - q));
    worst = std::max(worst, nearest / std::max(1.0, std::abs(p)));
  }
  return worst;
}

// ẋ = a x + b u, the scalar plant of the closed forms.
constexpr double kA = 3, kB = 2, kT = 0.1;
MatrixXd Scalar(double x) { return MatrixXd::Constant(1, 1, x); }
// ∫₀ʰ e^{as} ds b, the hold's input matrix over h.
double HeldInput(double h) { return (std::exp(kA * h) - 1) / kA * kB; }

TEST(DelayInputs, OneSampleOfDelayIsTheStoredPreviousInput) {
  // τ = T: x_{k+1} = φ x_k + γ u_{k−1}, so ξ = [x; u_{k−1}], Φ = [φ γ; 0 0], Γ = [0; 1], and
  // under u = −k x the characteristic polynomial is z² − φ z + k γ (derived by hand).
  const Result<DelayedPlant, SolveError> d = DelayInputs(Scalar(kA), Scalar(kB), kT, {kT});
  ASSERT_TRUE(Succeeded(d));
  const double phi = std::exp(kA * kT), gamma = HeldInput(kT);
  ASSERT_EQ(d->states(), 2);
  EXPECT_EQ(d->stored, std::vector<int>{1});
  EXPECT_NEAR(d->Phi(0, 0), phi, 1e-14 * phi);
  EXPECT_NEAR(d->Phi(0, 1), gamma, 1e-14 * gamma);
  EXPECT_EQ(d->Phi(1, 0), 0);
  EXPECT_EQ(d->Phi(1, 1), 0);
  EXPECT_EQ(d->Gamma(0, 0), 0);
  EXPECT_EQ(d->Gamma(1, 0), 1);
  const double k = 0.4;
  const MatrixXd closed = d->Phi - d->Gamma * (MatrixXd(1, 2) << k, 0).finished();
  const Eigen::VectorXcd z = closed.eigenvalues();
  const std::complex<double> root = std::sqrt(std::complex<double>(phi * phi - 4 * k * gamma));
  EXPECT_LT(Mismatch({z(0), z(1)}, {(phi + root) / 2.0, (phi - root) / 2.0}), 1e-12);
}

TEST(DelayInputs, HalfASampleSplitsThePeriod) {
  // τ = T/2: u_{k−1} acts for the first half, u_k for the second:
  // x_{k+1} = φ x_k + e^{aT/2} γ(T/2) u_{k−1} + γ(T/2) u_k, so under u = −k x the characteristic
  // polynomial is z² − (φ − k γ0) z + k γ1 with γ0 = γ(T/2), γ1 = e^{aT/2} γ(T/2) (derived by
  // hand; the modified z-transform with m = ½).
  const Result<DelayedPlant, SolveError> d = DelayInputs(Scalar(kA), Scalar(kB), kT, {kT / 2});
  ASSERT_TRUE(Succeeded(d));
  const double phi = std::exp(kA * kT), g0 = HeldInput(kT / 2),
               g1 = std::exp(kA * kT / 2) * HeldInput(kT / 2);
  ASSERT_EQ(d->states(), 2);
  EXPECT_NEAR(d->Phi(0, 1), g1, 1e-14 * g1);
  EXPECT_NEAR(d->Gamma(0, 0), g0, 1e-14 * g0);
  EXPECT_NEAR(g0 + g1, HeldInput(kT), 1e-14);  // the two halves make the whole period's input
  const double k = 0.4;
  const MatrixXd closed = d->Phi - d->Gamma * (MatrixXd(1, 2) << k, 0).finished();
  const Eigen::VectorXcd z = closed.eigenvalues();
  const double b = phi - k * g0;
  const std::complex<double> root = std::sqrt(std::complex<double>(b * b - 4 * k * g1));
  EXPECT_LT(Mismatch({z(0), z(1)}, {(b + root) / 2.0, (b - root) / 2.0}), 1e-12);
}

TEST(DelayInputs, KeepsWholePeriodsAndRefusesBadDelays) {
  // 2.5 periods keep three past inputs, 2 periods two; a delay a rounding error off a whole
  // number of periods is that number.
  EXPECT_EQ(DelayInputs(Scalar(kA), Scalar(kB), kT, {2.5 * kT})->stored, std::vector<int>{3});
  EXPECT_EQ(DelayInputs(Scalar(kA), Scalar(kB), kT, {2 * kT})->stored, std::vector<int>{2});
  EXPECT_EQ(DelayInputs(Scalar(kA), Scalar(kB), kT, {0.3 / 3 * 3})->stored, std::vector<int>{3});
  EXPECT_EQ(DelayInputs(Scalar(kA), Scalar(kB), kT, {0}, {2})->stored, std::vector<int>{2});
  EXPECT_NE(FailureOf(DelayInputs(Scalar(kA), Scalar(kB), kT, {-1})).message.find(">= 0"),
            std::string::npos);
  EXPECT_NE(FailureOf(DelayInputs(Scalar(kA), Scalar(kB), kT, {0, 0})).message.find("2 delays"),
            std::string::npos);
  EXPECT_NE(FailureOf(DelayInputs(Scalar(kA), Scalar(kB), 0, {0})).message.find("period_s"),
            std::string::npos);
}

class DelayedLoopTest : public ::testing::TestWithParam<const char*> {
 protected:
  model::RobotModel model_ = Demo(GetParam());
  LinearModel plant_ = Linearise(model_, InputKind::kTorque);
  double period_s_ = 1 / model_.control_rate_hz;
  // The weights `upright design` uses for the robot.
  DesignWeights weights_ =
      WeightsForRobot(DesignWeights{}, model_, plant_.equilibrium_pitch_rad).value();
  StateMatrix Q_ = StateWeight(weights_);
  Eigen::Matrix2d R_ = InputWeight(weights_, model_, InputKind::kTorque);
};

TEST_P(DelayedLoopTest, WithoutLatencyThePolesAreThePlainSampledLoops) {
  const Result<MatrixXd, SolveError> K = RobotDiscreteLqr(plant_, Q_, R_, period_s_);
  ASSERT_TRUE(Succeeded(K));
  const Result<DelayedLoop, SolveError> loop =
      SampledDelayedLoop(plant_, SampledLaw{*K}, period_s_, {0, 0});
  ASSERT_TRUE(Succeeded(loop));
  const SampledPoles plain = SampledStateFeedback(plant_, Gain(*K), period_s_).value();
  ASSERT_EQ(loop->poles.s.size(), plain.s.size());
  EXPECT_LT(Mismatch(loop->poles.s, plain.s), 1e-12);
  EXPECT_NEAR(loop->poles.max_abs_z, plain.max_abs_z, 1e-14);
}

TEST_P(DelayedLoopTest, LatencyAddsTwoPolesPerStoredPeriod) {
  // A latency of 1.5 periods keeps two past inputs per wheel: 6 + 4 poles.
  const Result<MatrixXd, SolveError> K = RobotDiscreteLqr(plant_, Q_, R_, period_s_);
  ASSERT_TRUE(Succeeded(K));
  const Result<DelayedLoop, SolveError> loop =
      SampledDelayedLoop(plant_, SampledLaw{*K}, period_s_, {1.5 * period_s_, 1.5 * period_s_});
  ASSERT_TRUE(Succeeded(loop));
  EXPECT_EQ(loop->poles.s.size(), 10u);
}

TEST_P(DelayedLoopTest, DelayedLqrForOneSampleIsLqrOnThePredictedState) {
  // With one whole sample of delay x_{k+1} = Ad x_k + Bd u_{k−1} is known at tick k, and u_k acts
  // on x_{k+1} as u_k acts on x_k without delay: the optimal law is the delay-free discrete LQR
  // on the prediction, u_k = −K (Ad x_k + Bd u_{k−1}) (the certainty-equivalent predictor;
  // derived by hand: the cost's first term x_0ᵀ Q x_0 is beyond any input's reach).
  const Result<MatrixXd, SolveError> K = RobotDiscreteLqr(plant_, Q_, R_, period_s_);
  const Result<MatrixXd, SolveError> delayed =
      RobotDelayedLqr(plant_, Q_, R_, period_s_, period_s_);
  const Result<ZohSystem, SolveError> zoh = DiscretiseZoh(plant_.A, plant_.B, period_s_);
  ASSERT_TRUE(Succeeded(K));
  ASSERT_TRUE(Succeeded(delayed));
  ASSERT_TRUE(Succeeded(zoh));
  MatrixXd predictor(kInputs, kStates + kInputs);
  predictor << *K * zoh->Ad, *K * zoh->Bd;
  // DelayInputs orders the stored inputs wheel by wheel; with one each that is [u_l; u_r].
  EXPECT_LT((*delayed - predictor).norm(), 1e-8 * predictor.norm());
  // Without delay it is the discrete LQR itself.
  const Result<MatrixXd, SolveError> none = RobotDelayedLqr(plant_, Q_, R_, period_s_, 0);
  ASSERT_TRUE(Succeeded(none));
  EXPECT_LT((*none - *K).norm(), 1e-12 * K->norm());
}

TEST_P(DelayedLoopTest, SampledMarginsAreAtTheEdgeOfStability) {
  // At the latency plus the delay margin the delayed loop is on its edge: stable just below,
  // unstable just above (relative 1e-6); the same for the common gain margins.
  const DesignSet d = DesignAll(model_, DesignRequest{});
  ASSERT_TRUE(d.hinf.ok) << d.hinf.message;
  const SampledMargins& m = d.hinf.sampled_margins;
  ASSERT_TRUE(m.analysed());
  const double latency = model_.sensors.latency_s;
  const SampledLaw law{d.hinf.K_discrete};  // the hinf module's gain
  const auto max_abs_z = [&](double extra_s, const std::vector<int>& wheels, double gain) {
    std::vector<double> delays(kInputs, latency);
    for (int j : wheels) delays[static_cast<size_t>(j)] += extra_s;
    const DelayedLoop loop = SampledDelayedLoop(plant_, law, period_s_, delays).value();
    MatrixXd scaled_c = loop.open.C;
    for (int j : wheels) scaled_c.row(j) *= gain;
    return (loop.open.A - loop.open.B * scaled_c).eigenvalues().cwiseAbs().maxCoeff();
  };
  const double both = m.both_wheels.delay_s;
  EXPECT_LT(max_abs_z(both * (1 - 1e-6), {0, 1}, 1), 1);
  EXPECT_GT(max_abs_z(both * (1 + 1e-6), {0, 1}, 1), 1);
  const double left = m.wheels[0].delay_s;
  EXPECT_LT(max_abs_z(left * (1 - 1e-6), {0}, 1), 1);
  EXPECT_GT(max_abs_z(left * (1 + 1e-6), {0}, 1), 1);
  EXPECT_LT(max_abs_z(0, {0, 1}, m.both_wheels.gain_high * (1 - 1e-9)), 1);
  EXPECT_GT(max_abs_z(0, {0, 1}, m.both_wheels.gain_high * (1 + 1e-9)), 1);
  EXPECT_LT(max_abs_z(0, {0, 1}, m.both_wheels.gain_low * (1 + 1e-9)), 1);
  EXPECT_GT(max_abs_z(0, {0, 1}, m.both_wheels.gain_low * (1 - 1e-9)), 1);
  // Both wheels at once never beat the worst wheel (derived by hand: it includes one at a time).
  EXPECT_LE(both, m.worst_wheel.delay_s);
  EXPECT_LE(m.both_wheels.disk_alpha, m.worst_wheel.disk_alpha);
}

TEST_P(DelayedLoopTest, SampledDelayMarginApproachesTheContinuousOneAsTheRateGrows) {
  // Without latency, at a high rate the hold lags by about T/2 (common practice): the sampled
  // common-mode delay margin tends to the continuous one less T/2.
  const Result<MatrixXd, SolveError> K = RobotLqr(plant_, Q_, R_);
  ASSERT_TRUE(Succeeded(K));
  const DesignSet d = DesignAll(model_, DesignRequest{});
  const double continuous = d.lqr.loop.both_wheels.delay_s;
  const double T = 1e-3;
  const AnalysisResult<SampledMargins> m = AnalyseSampledMargins(plant_, SampledLaw{*K}, T, 0);
  ASSERT_TRUE(Succeeded(m));
  const BrokenLoop continuous_loop{plant_.A, plant_.B, *K};
  const double exact = SimultaneousMargins(continuous_loop).value().delay_s;
  EXPECT_NEAR(m->both_wheels.delay_s, exact - T / 2, 0.05 * T);
  EXPECT_GT(continuous, 0);
}

TEST_P(DelayedLoopTest, LqgLoopWithLatencyMatchesItsBrokenForm) {
  // The poles printed (the loop with the module's memory folded into the plant's stored inputs)
  // are the broken loop's closed again, less the folded modes (at z = 0). Poles this close to
  // z = 0 (faster than 1e-6 per period) are left out of both: log z / T of them is rounding.
  const DesignSet d = DesignAll(model_, DesignRequest{});
  ASSERT_TRUE(d.lqg.ok) << d.lqg.message;
  const Result<LqgFilter, SolveError> filter =
      DesignLqgFilter(model_, plant_, plant_, DefaultFilterNoise(model_, plant_), period_s_);
  ASSERT_TRUE(Succeeded(filter));
  const double latency = 0.7 * period_s_;
  const DelayedLoop loop = SampledDelayedLoop(plant_, SampledLaw{d.lqg.K_discrete, 0, &*filter},
                                              period_s_, {latency, latency})
                               .value();
  const Eigen::VectorXcd z = (loop.open.A - loop.open.B * loop.open.C).eigenvalues();
  Poles closed, printed;
  for (const auto& p : z) {
    if (std::abs(p) > 1e-6) closed.push_back(std::log(p) / period_s_);
  }
  for (const auto& s : loop.poles.s) {
    if (std::exp(s.real() * period_s_) > 1e-6) printed.push_back(s);
  }
  EXPECT_EQ(printed.size(), closed.size());
  EXPECT_LT(Mismatch(printed, closed), 1e-7);
  EXPECT_LT(Mismatch(closed, printed), 1e-7);
}

INSTANTIATE_TEST_SUITE_P(Robots, DelayedLoopTest, ::testing::Values("courier.xml", "tabletop.xml"),
                         [](const ::testing::TestParamInfo<const char*>& param) {
                           const std::string name = param.param;
                           return name.substr(0, name.find('.'));
                         });

}  // namespace
}  // namespace upright::design
