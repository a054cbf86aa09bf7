// Sweep sampling: each draw set where the path says (robot fields on the robot as built only),
// draws that follow their spread, rejected draws redrawn, and each dispersion on its own stream.
#include "upright/runner/sweep/sweep_sampling.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "run_test_support.hpp"

namespace upright::runner {
namespace {

using testing::ScenarioFromText;

// The demo courier robot (chassis mass 24 kg), one push, two spreads.
const char* kScenario = R"(<scenario name="sampled" schema="1" duration_s="1">
  <description>Test: a push on a parked courier with a dispersed mass and push.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.2" shape="half-sine" peak_N="100" duration_s="0.2"/>
  </timeline>
  <controllers>
    <controller name="lqr" builtin="lqr"/>
  </controllers>
  <dispersions>
    <spread param="robot/chassis.mass_kg" kind="normal" sd="2"/>
    <spread param="timeline/push[1].peak_N" kind="uniform" lo="80" hi="120"/>
  </dispersions>
</scenario>)";

TEST(SweepSampling, SetsEachDrawWhereItsPathPoints) {
  const Scenario nominal = ScenarioFromText(kScenario);
  ASSERT_EQ(nominal.dispersions.size(), 2u);
  const SampledScenario s = SampleScenario(nominal, 7, 3);
  ASSERT_TRUE(s.error.empty()) << s.error;
  ASSERT_EQ(s.values.size(), 2u);
  ASSERT_TRUE(s.scenario.plant_model.has_value());
  EXPECT_EQ(s.scenario.plant_model->chassis.mass_kg, s.values[0]);
  EXPECT_EQ(s.scenario.model.chassis.mass_kg, 24);  // the controllers' design model is untouched
  EXPECT_EQ(s.scenario.pushes.at(0).peak_N, s.values[1]);
  EXPECT_GE(s.values[1], 80);
  EXPECT_LT(s.values[1], 120);
  EXPECT_NE(s.values[0], 24);
}

TEST(SweepSampling, DependsOnlyOnTheSeedAndTheIndex) {
  const Scenario nominal = ScenarioFromText(kScenario);
  const SampledScenario a = SampleScenario(nominal, 7, 3), b = SampleScenario(nominal, 7, 3);
  EXPECT_EQ(a.values, b.values);
  EXPECT_NE(SampleScenario(nominal, 7, 4).values, a.values);
  EXPECT_NE(SampleScenario(nominal, 8, 3).values, a.values);
  EXPECT_EQ(SampleNoiseSeed(0), 1u);
  EXPECT_EQ(SampleNoiseSeed(41), 42u);
}

// Dropping the second spread leaves the first one's draws as they were: every dispersion has its
// own stream.
TEST(SweepSampling, EachDispersionDrawsFromItsOwnStream) {
  const Scenario both = ScenarioFromText(kScenario);
  Scenario first_only = both;
  first_only.dispersions.pop_back();
  for (std::size_t i = 0; i < 5; ++i) {
    EXPECT_EQ(SampleScenario(both, 3, i).values.at(0),
              SampleScenario(first_only, 3, i).values.at(0))
        << "sample " << i;
  }
  EXPECT_NE(DispersionStreamSeed(3, 0, 0), DispersionStreamSeed(3, 0, 1));
  EXPECT_NE(DispersionStreamSeed(3, 0, 1), DispersionStreamSeed(3, 1, 0));
}

// 2000 draws of the mass alone: their mean within 4 standard errors of 24 kg, their standard
// deviation within 10 % of 2 kg (for 2000 normal draws the sample sd's own relative standard
// error is 1/sqrt(2·1999) = 1.6 %, common practice), the uniform draws within [80, 120) with a
// mean within 4 standard errors (40/sqrt(12·2000) = 0.26 N) of 100.
TEST(SweepSampling, DrawsFollowTheirSpreads) {
  const Scenario nominal = ScenarioFromText(kScenario);
  constexpr int kDraws = 2000;
  double sum = 0, sum_sq = 0, sum_u = 0;
  for (int i = 0; i < kDraws; ++i) {
    const SampledScenario s = SampleScenario(nominal, 11, static_cast<std::size_t>(i));
    ASSERT_TRUE(s.error.empty()) << s.error;
    sum += s.values[0];
    sum_sq += s.values[0] * s.values[0];
    ASSERT_GE(s.values[1], 80);
    ASSERT_LT(s.values[1], 120);
    sum_u += s.values[1];
  }
  const double mean = sum / kDraws;
  const double sd = std::sqrt((sum_sq - kDraws * mean * mean) / (kDraws - 1));
  EXPECT_NEAR(mean, 24, 4 * 2 / std::sqrt(kDraws));
  EXPECT_NEAR(sd, 2, 0.2);
  EXPECT_NEAR(sum_u / kDraws, 100, 4 * 40 / std::sqrt(12.0 * kDraws));
}

// A spread wider than the parameter allows (mass > 0) is truncated by redrawing: every accepted
// draw is positive and some were redrawn.
TEST(SweepSampling, RedrawsValuesTheParameterRejects) {
  Scenario nominal = ScenarioFromText(kScenario);
  nominal.dispersions.resize(1);
  nominal.dispersions[0].mean = 2;
  nominal.dispersions[0].sd = 4;
  int redrawn = 0;
  for (std::size_t i = 0; i < 50; ++i) {
    const SampledScenario s = SampleScenario(nominal, 5, i);
    ASSERT_TRUE(s.error.empty()) << s.error;
    EXPECT_GT(s.values[0], 0);
    EXPECT_EQ(s.scenario.plant_model->chassis.mass_kg, s.values[0]);
    redrawn += s.redraws[0];
  }
  // P[draw <= 0] = Φ(−0.5) = 0.31, so 50 samples redraw about 22 times; none would be a bug.
  EXPECT_GT(redrawn, 0);
}

TEST(SweepSampling, GivesUpAfterTheLastRedraw) {
  Scenario nominal = ScenarioFromText(kScenario);
  nominal.dispersions[0].kind = SpreadKind::kUniform;
  nominal.dispersions[0].lo = -10;
  nominal.dispersions[0].hi = -5;
  const SampledScenario s = SampleScenario(nominal, 1, 0);
  EXPECT_NE(s.error.find("robot/chassis.mass_kg: 101 draws in a row rejected (last: "),
            std::string::npos)
      << s.error;
  EXPECT_TRUE(std::isnan(s.values[0]));
  EXPECT_TRUE(std::isnan(s.values[1]));  // later dispersions are not drawn
  EXPECT_EQ(s.redraws[0], kMaxRedraws + 1);
}

}  // namespace
}  // namespace upright::runner
