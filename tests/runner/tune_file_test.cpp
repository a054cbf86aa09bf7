// Tune files: a full file into exact values, and every rule's refusal at its path:line; the
// objective's scoring of hand-made runs.
#include "upright/runner/tune/tune_file.hpp"

#include <gtest/gtest.h>

#include <string>

#include "succeeded.hpp"
#include "upright/runner/tune/objective.hpp"

namespace upright::runner {
namespace {

bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

TEST(TuneFile, ReadsKnobsAndTheObjective) {
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="lqr">
    <knob setting="max_tilt_deg" lo="1" hi="10"/>
    <knob setting="max_drift_m" lo="0.1" hi="2" scale="linear"/>
  </controller>
  <objective>
    <term metric="rms_tilt_deg" weight="2"/>
    <term metric="energy_J"/>
    <bound metric="peak_current_A" max="18"/>
    <bound metric="end_time_s" min="3"/>
  </objective>
</tune>)",
                                              "t.xml");
  ASSERT_TRUE(Succeeded(spec));
  ASSERT_EQ(spec->knobs.at("lqr").size(), 2u);
  const Knob& tilt = spec->knobs.at("lqr")[0];
  EXPECT_EQ(tilt.setting, "max_tilt_deg");
  EXPECT_EQ(tilt.lo, 1);
  EXPECT_EQ(tilt.hi, 10);
  EXPECT_EQ(tilt.scale, KnobScale::kLog);  // the default scale
  EXPECT_EQ(tilt.line, 3);
  EXPECT_EQ(spec->knobs.at("lqr")[1].scale, KnobScale::kLinear);
  ASSERT_EQ(spec->objective.terms.size(), 2u);
  EXPECT_EQ(spec->objective.terms[0].metric, "rms_tilt_deg");
  EXPECT_EQ(spec->objective.terms[0].weight, 2);
  EXPECT_EQ(spec->objective.terms[1].weight, 1);
  ASSERT_EQ(spec->objective.bounds.size(), 2u);
  EXPECT_EQ(spec->objective.bounds[0].Text(), "peak_current_A <= 18");
  EXPECT_EQ(spec->objective.bounds[1].Text(), "end_time_s >= 3");
}

TEST(TuneFile, BoundsAloneKeepTheDefaultTerms) {
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <objective><bound metric="peak_current_A" max="18"/></objective>
</tune>)",
                                              "t.xml");
  ASSERT_TRUE(Succeeded(spec));
  EXPECT_EQ(spec->objective.Text(), DefaultObjective().Text());
  EXPECT_EQ(spec->objective.bounds.size(), 1u);
}

// Each broken rule, with the line it is on.
TEST(TuneFile, RefusesEachBrokenRuleAtItsLine) {
  const struct {
    std::string body;
    std::string expected;
  } cases[] = {
      {R"(<controller name="lqr"><knob setting="max_tilt_deg" lo="10" hi="1"/></controller>)",
       "t.xml:2: knob max_tilt_deg: lo = 10 must be below hi = 1"},
      {R"(<controller name="lqr"><knob setting="x" lo="0" hi="1" scale="log"/></controller>)",
       "t.xml:2: knob x: lo = 0: a log scale needs a range above 0"},
      {R"(<controller name="lqr"><knob setting="x" lo="1" hi="2" scale="cubic"/></controller>)",
       "t.xml:2:"},
      {R"(<controller name="lqr"><knob lo="1" hi="2"/></controller>)", "t.xml:2:"},
      {R"(<controller name="lqr"><knob setting="x" lo="1" hi="2" step="1"/></controller>)", "step"},
      {R"(<controller name="lqr"/>)", "t.xml:2: controller lqr: no <knob>"},
      {"<controller name=\"lqr\"><knob setting=\"x\" lo=\"1\" hi=\"2\"/></controller>\n"
       "<controller name=\"lqr\"><knob setting=\"x\" lo=\"1\" hi=\"2\"/></controller>",
       "t.xml:3: controller lqr: given twice (first at line 2)"},
      {"<controller name=\"lqr\">\n<knob setting=\"x\" lo=\"1\" hi=\"2\"/>\n"
       "<knob setting=\"x\" lo=\"1\" hi=\"3\"/></controller>",
       "t.xml:4: knob x: given twice"},
      {R"(<objective><term metric="tilt" weight="1"/></objective>)",
       "t.xml:2: term metric = tilt: no such metric"},
      {R"(<objective><term metric="max_tilt_deg" weight="-1"/></objective>)",
       "t.xml:2: term max_tilt_deg: weight = -1, must be > 0"},
      {R"(<objective><bound metric="peak_current_A" max="18" min="1"/></objective>)",
       "t.xml:2: bound: give exactly one of max or min (both given)"},
      {R"(<objective><bound metric="peak_amps" max="18"/></objective>)",
       "t.xml:2: bound metric = peak_amps: no such metric"},
  };
  for (const auto& c : cases) {
    const Result<TuneSpec> spec =
        ParseTuneText("<tune schema=\"1\">\n" + c.body + "\n</tune>", "t.xml");
    const std::string why = FailureOf(spec);
    EXPECT_TRUE(Contains(why, c.expected)) << c.body << "\n  gave: " << why;
  }
  EXPECT_TRUE(Contains(FailureOf(ParseTuneText("<tune schema=\"2\"/>", "t.xml")),
                       "t.xml:1: tune schema = 2: unsupported"));
  EXPECT_TRUE(Contains(FailureOf(ParseTuneText("<scenario/>", "t.xml")),
                       "t.xml:1: root element is <scenario>, expected <tune>"));
  EXPECT_TRUE(Contains(FailureOf(ReadTuneFile("/nonexistent/t.xml")), "/nonexistent/t.xml"));
}

RunResult Survived(double tilt_deg, double drift_m, double current_A) {
  RunResult run;
  run.scenario = "s";
  run.seed = 1;
  run.steps = 100;
  run.metrics.status = RunStatus::kOk;
  run.metrics.message = "survived";
  run.metrics.end_time_s = 8;
  run.metrics.max_tilt_deg = tilt_deg;
  run.metrics.max_drift_m = drift_m;
  run.metrics.peak_current_A = current_A;
  return run;
}

TEST(TuneObjective, ScoresSurvivorsByTheWeightedMeans) {
  Objective objective = DefaultObjective();
  objective.bounds = {{"peak_current_A", MetricBound::Kind::kAtMost, 18, 0}};
  const std::vector<RunResult> runs = {Survived(2, 0.1, 12), Survived(4, 0.3, 20)};
  const std::vector<double> durations = {8, 8};
  const EvaluationScore score = ScoreRuns(objective, runs, durations);
  // 1 × mean(2, 4) + 10 × mean(0.1, 0.3) = 3 + 2 = 5 (derived by hand).
  EXPECT_NEAR(score.objective, 5, 1e-12);
  EXPECT_EQ(score.survived, 2);
  ASSERT_EQ(score.worst.size(), 1u);
  EXPECT_EQ(score.worst[0], 20);     // the worst run's peak current
  EXPECT_EQ(score.violation[0], 2);  // 20 − 18
  EXPECT_FALSE(score.feasible());
}

TEST(TuneObjective, ScoresAFallByTheTimeLost) {
  RunResult fell = Survived(30, 0.5, 25);
  fell.metrics.status = RunStatus::kFell;
  fell.metrics.message = "fell at t = 2 s";
  fell.metrics.end_time_s = 2;
  const std::vector<RunResult> runs = {Survived(2, 0.1, 12), fell};
  const std::vector<double> durations = {8, 8};
  const EvaluationScore score = ScoreRuns(DefaultObjective(), runs, durations);
  // One run of two lost 6 s of 8: 1e6 × (1 + 0.75 / 2) (derived by hand).
  EXPECT_NEAR(score.objective, 1.375e6, 1e-6);
  EXPECT_EQ(score.survived, 1);
  EXPECT_TRUE(Contains(score.failure, "s seed 1: fell: fell at t = 2 s"));
  // A run that never stepped loses all its time.
  RunResult refused;
  refused.metrics.status = RunStatus::kSetupFailed;
  const std::vector<RunResult> none = {refused};
  EXPECT_NEAR(ScoreRuns(DefaultObjective(), none, std::vector<double>{8}).objective, 2e6, 1e-6);
}

}  // namespace
}  // namespace upright::runner
