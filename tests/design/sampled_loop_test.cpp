// The loop as the modules sample it: the zero-order-hold pole map, convergence to the continuous
// loop as the rate grows, and the separation of regulator and filter poles in discrete time.
#include "upright/design/sampled_loop.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <complex>
#include <string>
#include <vector>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;
using Poles = std::vector<std::complex<double>>;

Poles Eigenvalues(const MatrixXd& m) {
  const Eigen::VectorXcd e = m.eigenvalues();
  return Poles(e.data(), e.data() + e.size());
}

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

// The loops as sampled without the sensors' latency (delayed_loop_test.cpp adds it): the
// latency-free figures are the ones these checks derive.
model::RobotModel WithoutLatency(model::RobotModel model) {
  model.sensors.latency_s = 0;
  return model;
}

class SampledLoopTest : public ::testing::TestWithParam<const char*> {
 protected:
  model::RobotModel model_ = WithoutLatency(Demo(GetParam()));
  LinearModel plant_ = Linearise(model_, InputKind::kTorque);
  double period_s_ = 1 / model_.control_rate_hz;
};

TEST_P(SampledLoopTest, WithoutFeedbackThePolesAreTheOpenLoopsThroughZEqualsExpST) {
  // A zero-order hold maps each pole s of A to z = e^{sT} (Franklin, Powell and Workman, Digital
  // Control of Dynamic Systems, 3rd ed., ch. 4; from memory): log z / T gives them back, the
  // falling robot's unstable pole included.
  const Result<SampledPoles, SolveError> sampled_result =
      SampledStateFeedback(plant_, Gain::Zero(), period_s_);
  ASSERT_TRUE(Succeeded(sampled_result));
  const SampledPoles& sampled = *sampled_result;
  EXPECT_LT(Mismatch(Eigenvalues(plant_.A), sampled.s), 1e-9);
  EXPECT_NEAR(sampled.max_abs_z, std::exp(plant_.fall_rate_1_s * period_s_), 1e-12);
}

TEST_P(SampledLoopTest, StateFeedbackApproachesTheContinuousLoopAsTheRateGrows) {
  // The continuous LQR gain held over T: the sampled poles tend to eig(A − B K), the error first
  // order in T (the hold's half-sample lag; common practice). The weights keep the poles apart: a
  // nearly double pole (the courier's at a 2.2° tilt weight) splits like √T under a perturbation
  // of order T, and would hide the first order at these rates.
  DesignWeights weights;
  weights.max_tilt_deg = 3;
  const Result<Eigen::MatrixXd, SolveError> lqr =
      RobotLqr(plant_, StateWeight(weights), InputWeight(weights, model_, InputKind::kTorque));
  ASSERT_TRUE(Succeeded(lqr));
  const Poles continuous = Eigenvalues(plant_.A - plant_.B * (*lqr));
  constexpr int kHalvings = 6;
  double error[kHalvings];
  for (int k = 0; k < kHalvings; ++k) {
    const double T = period_s_ / (1 << k);
    error[k] = Mismatch(continuous, SampledStateFeedback(plant_, (*lqr), T).value().s);
    if (k > 0) {
      EXPECT_LT(error[k], error[k - 1]) << "T = " << T;
    }
  }
  EXPECT_NEAR(error[kHalvings - 1] / error[kHalvings - 2], 0.5, 0.05);
  EXPECT_NEAR(error[kHalvings - 2] / error[kHalvings - 3], 0.5, 0.05);
  EXPECT_LT(error[kHalvings - 1], 0.03);
}

TEST_P(SampledLoopTest, LqgPolesAreTheRegulatorsAndTheFiltersTogether) {
  // The separation principle in discrete time (handbook; from memory): with the a-priori filter
  // the loop's poles are eig(Ad − Bd K) and eig(Ad (I − L C)).
  const DesignSet d = DesignAll(model_, DesignRequest{});
  ASSERT_TRUE(d.lqg.ok) << d.lqg.message;
  const Result<LqgFilter, SolveError> designed =
      DesignLqgFilter(model_, plant_, plant_, DefaultFilterNoise(model_, plant_), period_s_);
  ASSERT_TRUE(Succeeded(designed));
  const LqgFilter& filter = *designed;
  const MatrixXd I = MatrixXd::Identity(kStates, kStates);
  Poles z = Eigenvalues(filter.Ad - filter.Bd * d.lqg.K_discrete);
  const Poles estimator = Eigenvalues(filter.Ad * (I - filter.L_discrete * filter.sensors.C));
  z.insert(z.end(), estimator.begin(), estimator.end());
  Poles s;
  for (const auto& p : z) s.push_back(std::log(p) / period_s_);
  EXPECT_LT(Mismatch(s, d.lqg.sampled.s), 1e-7);
  EXPECT_LT(Mismatch(d.lqg.sampled.s, s), 1e-7);
  double max_abs_z = 0;
  for (const auto& p : z) max_abs_z = std::max(max_abs_z, std::abs(p));
  EXPECT_NEAR(d.lqg.sampled.max_abs_z, max_abs_z, 1e-12);
}

TEST_P(SampledLoopTest, DesignSamplesTheLawsTheModulesRun) {
  // The discrete LQR and the discrete H-infinity design are stable by construction (their
  // Riccati solutions; Franklin, Powell and Workman, ch. 9, and Başar and Bernhard, ch. 3; from
  // memory); PID is not sampled here.
  const DesignSet d = DesignAll(model_, DesignRequest{});
  ASSERT_TRUE(d.all_ok());
  EXPECT_EQ(d.lqr.sampled.period_s, period_s_);
  EXPECT_LT(d.lqr.sampled.max_abs_z, 1);
  EXPECT_LT(Mismatch(SampledStateFeedback(plant_, d.lqr.K_discrete, period_s_).value().s,
                     d.lqr.sampled.s),
            1e-12);
  EXPECT_EQ(d.hinf.sampled.period_s, period_s_);
  EXPECT_LT(d.hinf.sampled.max_abs_z, 1);
  EXPECT_LT(Mismatch(SampledStateFeedback(plant_, d.hinf.K_discrete, period_s_).value().s,
                     d.hinf.sampled.s),
            1e-12);
  EXPECT_FALSE(d.pid.sampled.analysed());
}

INSTANTIATE_TEST_SUITE_P(Robots, SampledLoopTest, ::testing::Values("courier.xml", "tabletop.xml"),
                         [](const ::testing::TestParamInfo<const char*>& param) {
                           const std::string name = param.param;
                           return name.substr(0, name.find('.'));
                         });

}  // namespace
}  // namespace upright::design
