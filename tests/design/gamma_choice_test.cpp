// The H-infinity γ rule and its trade-off table, on the discrete design the hinf module runs at
// the robot's control rate: the choice is the smallest γ whose design push stays within the
// robot's limits, it meets the H-infinity bound, explicit settings win, and the table runs from
// near γ_opt to the LQR as the theory says it must.
#include "upright/design/gamma_choice.hpp"

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

// The design push on the sampled loop of the discrete H-infinity design at γ = factor × the
// discrete γ_opt of `d`, at its rate.
PushPeaks PeaksAt(const model::RobotModel& model, const DesignSet& d, double factor) {
  const double period_s = 1 / d.request.rate_hz;
  const Result<Eigen::MatrixXd, SolveError> K =
      RobotDiscreteHinf(d.plant, d.performance.Q, d.performance.R, d.performance.push_scale_N,
                        factor * d.hinf.gamma_opt_discrete, period_s);
  EXPECT_TRUE(Succeeded(K));
  const Result<PushPeaks> peaks =
      SampledPushPeaks(d.plant, K.value_or(Eigen::MatrixXd::Zero(kInputs, kStates)),
                       MotorCurrent(model, d.plant.input),
                       DesignPushFor(d.plant, d.performance.push_scale_N), period_s);
  EXPECT_TRUE(Succeeded(peaks));
  return peaks.value_or(PushPeaks{});
}

bool Within(const PushPeaks& p, const PushLimits& limits) {
  return p.tilt_rad <= limits.tilt_rad && p.current_A <= limits.current_A;
}

class GammaRule : public ::testing::TestWithParam<std::string> {
 protected:
  model::RobotModel model_ = Demo(GetParam());
  DesignSet design_ = DesignAll(model_, DesignRequest{});
};

TEST_P(GammaRule, ChoosesTheSmallestGammaWhoseDesignPushStaysWithinTheLimits) {
  const HinfReport& h = design_.hinf;
  ASSERT_TRUE(h.ok) << h.message;
  ASSERT_EQ(h.source, GammaSource::kRule);
  ASSERT_TRUE(h.choice.limits_met);
  const PushLimits limits = PushLimitsOf(model_, design_.plant.equilibrium_pitch_rad);
  EXPECT_NEAR(limits.tilt_rad, design_.limits.ground_contact.smallest_rad(), 0);
  EXPECT_EQ(limits.current_A, model_.motor.current_limit_A);
  // The factor is the discrete design's; the continuous one sits at the same factor of its own.
  EXPECT_NEAR(h.gamma_discrete, h.choice.gamma, 1e-12 * h.gamma_discrete);
  EXPECT_NEAR(h.choice.gamma, h.choice.factor * h.gamma_opt_discrete, 1e-12 * h.choice.gamma);
  EXPECT_NEAR(h.gamma, h.choice.factor * h.gamma_opt, 1e-12 * h.gamma);
  EXPECT_GT(h.choice.factor, kGammaFactorLowest);
  EXPECT_LT(h.choice.factor, kGammaFactorHighest);
  // Within the limits at the choice, outside them 1 % below it (the bisection's resolution).
  const PushPeaks at = PeaksAt(model_, design_, h.choice.factor);
  EXPECT_TRUE(Within(at, limits));
  EXPECT_NEAR(at.tilt_rad, h.choice.peaks.tilt_rad, 1e-12);
  EXPECT_FALSE(Within(PeaksAt(model_, design_, h.choice.factor / 1.0101), limits));
  // The H-infinity bound holds at the chosen γ, sampled and continuous (Doyle, Glover,
  // Khargonekar and Francis 1989; Başar and Bernhard 1995).
  EXPECT_LT(h.norm_discrete, h.gamma_discrete);
  EXPECT_LT(h.loop.push_norm, h.gamma);
}

TEST_P(GammaRule, TheTradeOffRunsFromNearTheOptimumToTheLqr) {
  // As γ grows the central controller's Riccati solution falls towards the LQR's and the gain
  // with it (Doyle et al. 1989; from memory); each design keeps ‖T_zw‖∞ < γ, and none beats
  // γ_opt.
  const HinfReport& h = design_.hinf;
  const std::vector<GammaPoint>& rows = h.trade_off;
  ASSERT_EQ(rows.size(), std::size(kTradeOffFactors) + 1);
  for (std::size_t i = 0; i < rows.size(); ++i) {
    ASSERT_TRUE(rows[i].ok) << i;
    EXPECT_GE(rows[i].push_norm, h.gamma_opt_discrete * (1 - 1e-4)) << i;
    if (i + 1 < rows.size()) {
      EXPECT_EQ(rows[i].factor, kTradeOffFactors[i]);
      EXPECT_LT(rows[i].push_norm, rows[i].gamma) << i;
    }
    if (i > 0) {
      EXPECT_LT(rows[i].gain_norm, rows[i - 1].gain_norm) << i;
      EXPECT_LT(rows[i].peaks.tilt_rad, rows[i - 1].peaks.tilt_rad) << i;
      EXPECT_GT(rows[i].push_norm, rows[i - 1].push_norm) << i;
    }
    EXPECT_EQ(rows[i].within_limits,
              Within(rows[i].peaks, PushLimitsOf(model_, design_.plant.equilibrium_pitch_rad)))
        << i;
  }
  const GammaPoint& lqr = rows.back();
  EXPECT_TRUE(std::isinf(lqr.factor));
  EXPECT_TRUE(std::isinf(lqr.gamma));
  // The discrete LQR at the rate, the lqr module's gain, and its sampled loop's push norm.
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(Eigen::MatrixXd(design_.lqr.K_discrete));
  EXPECT_NEAR(lqr.gain_norm, svd.singularValues()(0), 1e-12 * lqr.gain_norm);
  const AnalysisResult<NormPeak> sampled = SampledPushNorm(
      design_.plant, design_.lqr.K_discrete, design_.performance, 1 / design_.request.rate_hz);
  ASSERT_TRUE(sampled.has_value());
  EXPECT_NEAR(lqr.push_norm, sampled->norm, 1e-9 * lqr.push_norm);
  // The first row sits on the cliff: its gain is several times the LQR's.
  EXPECT_GT(rows.front().gain_norm, 3 * lqr.gain_norm);
}

std::string RobotName(const ::testing::TestParamInfo<std::string>& p) {
  return p.param.substr(0, p.param.find('.'));
}

INSTANTIATE_TEST_SUITE_P(Robots, GammaRule, ::testing::Values("courier.xml", "tabletop.xml"),
                         RobotName);

TEST(GammaRule, TakesTheLowestFactorWhenEvenItStaysWithinTheLimits) {
  // A robot whose chassis never reaches the ground (outline inside the wheels: 90°) and whose
  // drive allows a thousand times the current: nothing binds.
  model::RobotModel model = Demo("courier.xml");
  model.chassis.outline_bottom_m = -0.01;
  model.chassis.outline_top_m = 0.01;
  model.chassis.outline_front_m = 0.01;
  model.chassis.outline_rear_m = -0.01;
  model.motor.current_limit_A *= 1000;
  DesignRequest request;
  request.weights.max_tilt_deg = 3;
  const DesignSet d = DesignAll(model, request);
  ASSERT_TRUE(d.hinf.ok) << d.hinf.message;
  EXPECT_EQ(d.hinf.choice.factor, kGammaFactorLowest);
  EXPECT_TRUE(d.hinf.choice.limits_met);
}

TEST(GammaRule, TakesTheHighestFactorAndSaysSoWhenNoneStaysWithinTheLimits) {
  // A drive limited to a hundredth of an ampere: no design carries the push.
  model::RobotModel model = Demo("courier.xml");
  model.motor.current_limit_A = 0.01;
  const DesignSet d = DesignAll(model, DesignRequest{});
  EXPECT_EQ(d.hinf.source, GammaSource::kRule);
  EXPECT_EQ(d.hinf.choice.factor, kGammaFactorHighest);
  EXPECT_FALSE(d.hinf.choice.limits_met);
  EXPECT_NEAR(d.hinf.gamma, kGammaFactorHighest * d.hinf.gamma_opt, 1e-12 * d.hinf.gamma);
  EXPECT_NEAR(d.hinf.gamma_discrete, kGammaFactorHighest * d.hinf.gamma_opt_discrete,
              1e-12 * d.hinf.gamma_discrete);
}

TEST(GammaRule, AGivenGammaOrFactorWinsOverTheRule) {
  const model::RobotModel model = Demo("courier.xml");
  DesignRequest request;
  request.gamma_factor = 1.5;
  const DesignSet by_factor = DesignAll(model, request);
  EXPECT_EQ(by_factor.hinf.source, GammaSource::kFactor);
  EXPECT_NEAR(by_factor.hinf.gamma, 1.5 * by_factor.hinf.gamma_opt, 1e-12 * by_factor.hinf.gamma);
  request.gamma = 9;
  const DesignSet given = DesignAll(model, request);
  EXPECT_EQ(given.hinf.source, GammaSource::kGiven);
  EXPECT_EQ(given.hinf.gamma, 9);
  EXPECT_EQ(given.request.gamma, 9);
}

TEST(GammaRule, ADefaultTiltIsAFifthOfTheGroundContactTiltAndAGivenOneStays) {
  const model::RobotModel model = Demo("courier.xml");
  const DesignSet d = DesignAll(model, DesignRequest{});
  EXPECT_NEAR(d.request.weights.max_tilt_deg,
              0.2 * d.limits.ground_contact.smallest_rad() * 180 / std::numbers::pi, 1e-12);
  DesignRequest request;
  request.weights.max_tilt_deg = 4;
  EXPECT_EQ(DesignAll(model, request).request.weights.max_tilt_deg, 4);
}

TEST(GammaRule, RefusesAGammaOptThatIsNoNumber) {
  const model::RobotModel model = Demo("courier.xml");
  const DesignSet d = DesignAll(model, DesignRequest{});
  for (const double bad : {0.0, -1.0, double{NAN}, double{INFINITY}}) {
    EXPECT_FALSE(ChooseGamma(d.plant, d.performance, bad, model)) << bad;
  }
}

TEST(DesignRequest, AGammaFactorMustBeAboveOneOrZeroForTheRule) {
  DesignRequest request;
  EXPECT_TRUE(Succeeded(request.Validate()));
  request.gamma_factor = 1;
  EXPECT_EQ(FailureOf(request.Validate()),
            "DesignRequest::gamma_factor = 1, must be > 1 (or 0 for the rule of the design push)");
  request.gamma_factor = 0;
  request.weights.max_tilt_deg = -1;
  EXPECT_EQ(FailureOf(request.Validate()),
            "DesignWeights::max_tilt_deg = -1, must be > 0 (or 0 for a fifth of the ground-contact "
            "tilt)");
}

}  // namespace
}  // namespace upright::design
