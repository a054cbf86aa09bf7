// Tuning the pid module's pole choices: its default knobs, a tune on them, and a searched setting
// the module refuses (a speed pair above half the tilt pair, inside ranges whose ends it
// accepts), which scores as a failed evaluation with the module's reason and never stops the tune.
#include <gtest/gtest.h>

#include <string>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "tune_test_scenarios.hpp"
#include "upright/base/number_text.hpp"
#include "upright/design/pid.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_writer.hpp"

namespace upright::runner {
namespace {

using testing::Contains;
using testing::ScenarioFromText;
using testing::ShoveText;

// A parked courier shoved once, for 2.5 s, on seed 1, with the pid module alone.
Scenario PidShove() {
  return ScenarioFromText(ShoveText(R"(<controller name="pid" builtin="pid"/>)"));
}

// The knobs' values of evaluation `e`, by setting.
double Value(const ControllerTune& tune, const TuneEvaluation& e, const std::string& setting) {
  for (std::size_t k = 0; k < tune.knobs.size(); ++k) {
    if (tune.knobs[k].setting == setting) return e.values[k];
  }
  ADD_FAILURE() << "no knob " << setting;
  return 0;
}

TEST(TunePidPoles, DefaultKnobsSearchThePolesWithEndsTheModuleAccepts) {
  const std::vector<Knob> knobs = DefaultKnobs("pid");
  ASSERT_EQ(knobs.size(), 4u);
  EXPECT_EQ(knobs[0].setting, "tilt_pole_factor");
  EXPECT_EQ(knobs[0].lo, 1);
  EXPECT_EQ(knobs[0].hi, 6);
  EXPECT_EQ(knobs[1].setting, "speed_pole_factor");
  EXPECT_EQ(knobs[1].lo, 0.1);
  EXPECT_EQ(knobs[1].hi, 1);
  EXPECT_EQ(knobs[2].setting, "max_tilt_deg");
  EXPECT_EQ(knobs[3].setting, "tilt_filter_s");
  for (const Knob& knob : knobs) EXPECT_EQ(knob.scale, KnobScale::kLog) << knob.setting;
  // The rule's defaults (2 and 1/3) lie inside.
  EXPECT_LT(knobs[0].lo, 2);
  EXPECT_GT(knobs[0].hi, 2);
  EXPECT_LT(knobs[1].lo, 1.0 / 3);
  EXPECT_GT(knobs[1].hi, 1.0 / 3);
  // The share of the box the module refuses, as knob.cpp states it: the triangle where
  // 0.1 · 10^v > 6^u / 2, of area ½ · u₀ · (1 − log10 5) with u₀ = (1 − log10 5) / log10 6,
  // 0.058; counted on a 400 × 400 grid of cell centres, within 0.005 (the grid's edge error).
  int refused = 0;
  constexpr int kCells = 400;
  for (int i = 0; i < kCells; ++i) {
    for (int j = 0; j < kCells; ++j) {
      const design::PidPoles poles{.tilt_pole_factor = knobs[0].ValueAt((i + 0.5) / kCells),
                                   .speed_pole_factor = knobs[1].ValueAt((j + 0.5) / kCells)};
      if (!poles.Validate()) ++refused;
    }
  }
  EXPECT_NEAR(static_cast<double>(refused) / (kCells * kCells), 0.058, 0.005);
  // Both ends of every range are created in the scenario before a tune starts.
  const std::vector<Scenario> scenarios = {PidShove()};
  TuneOptions options;
  options.budget_runs = 6;
  const Result<TunePlan> plan = PlanTune(scenarios, options, TuneSpec{});
  ASSERT_TRUE(Succeeded(plan));
  const auto start = CheckTuneStart(scenarios, *plan, options);
  EXPECT_TRUE(start.has_value()) << (start ? "" : start.error().message);
}

TEST(TunePidPoles, TunesThePidOnItsDefaultKnobs) {
  const std::vector<Scenario> scenarios = {PidShove()};
  TuneOptions options;
  options.budget_runs = 6;  // the default and five settings of one seed
  options.holdout_seeds = 0;
  options.jobs = 2;
  const Result<TunePlan> plan = PlanTune(scenarios, options, TuneSpec{});
  ASSERT_TRUE(Succeeded(plan));
  const TuneResult result = RunTune(scenarios, options, *plan, "test", {});
  ASSERT_EQ(result.controllers.size(), 1u);
  const ControllerTune& pid = result.controllers[0];
  EXPECT_TRUE(pid.setup_error.empty()) << pid.setup_error;
  ASSERT_GE(pid.evaluations.size(), 3u);
  EXPECT_LE(pid.evaluations.size(), 6u);
  // The default survives the shove, so the tuned setting, the best evaluated, does too.
  const EvaluationScore& base = pid.evaluations[0].score;
  ASSERT_EQ(base.survived, 1) << base.failure;
  const TuneEvaluation& best = pid.evaluations[pid.best];
  EXPECT_LE(best.score.objective, base.objective);
  EXPECT_EQ(best.score.survived, 1) << best.score.failure;
  for (std::size_t i = 1; i < pid.evaluations.size(); ++i) {
    ASSERT_EQ(pid.evaluations[i].values.size(), 4u);
  }
  if (pid.best > 0) {
    for (const char* setting :
         {"tilt_pole_factor", "speed_pole_factor", "max_tilt_deg", "tilt_filter_s"}) {
      EXPECT_TRUE(Contains(pid.element, std::string("<setting key=\"") + setting + "\""))
          << pid.element;
    }
  }
}

TEST(TunePidPoles, ARefusedSettingScoresAsAFailedEvaluationWithTheModulesReason) {
  // Linear ranges whose ends the module accepts ((1, 0.1) and (4, 1.9)) but whose box it refuses
  // wherever speed > tilt / 2: about 36 % of it, so the seeded search draws both kinds.
  const std::vector<Scenario> scenarios = {PidShove()};
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="pid">
    <knob setting="tilt_pole_factor" lo="1" hi="4" scale="linear"/>
    <knob setting="speed_pole_factor" lo="0.1" hi="1.9" scale="linear"/>
  </controller>
</tune>)",
                                              "t.xml");
  ASSERT_TRUE(Succeeded(spec));
  TuneOptions options;
  options.budget_runs = 10;
  options.holdout_seeds = 1;
  options.jobs = 2;
  const Result<TunePlan> plan = PlanTune(scenarios, options, *spec);
  ASSERT_TRUE(Succeeded(plan));
  ASSERT_TRUE(CheckTuneStart(scenarios, *plan, options).has_value());
  const TuneResult result = RunTune(scenarios, options, *plan, "test", {});
  ASSERT_EQ(result.controllers.size(), 1u);
  const ControllerTune& pid = result.controllers[0];
  EXPECT_TRUE(pid.setup_error.empty()) << pid.setup_error;
  int refused = 0, played = 0;
  for (std::size_t i = 1; i < pid.evaluations.size(); ++i) {
    const TuneEvaluation& e = pid.evaluations[i];
    const double tilt = Value(pid, e, "tilt_pole_factor");
    const double speed = Value(pid, e, "speed_pole_factor");
    if (speed > tilt / 2) {
      ++refused;
      // No run stepped: every run's whole time lost, the worst score there is.
      EXPECT_EQ(e.score.survived, 0);
      EXPECT_EQ(e.score.objective, 2 * kFallPenalty);
      EXPECT_TRUE(Contains(e.score.failure, "setup_failed")) << e.score.failure;
      EXPECT_TRUE(Contains(e.score.failure, "speed_pole_factor = " + ShortestText(speed) +
                                                ": must be at most half of tilt_pole_factor"))
          << e.score.failure;
    } else {
      ++played;
      EXPECT_LT(e.score.objective, 2 * kFallPenalty) << e.score.failure;
      EXPECT_FALSE(Contains(e.score.failure, "setup_failed")) << e.score.failure;
    }
  }
  EXPECT_GT(refused, 0);
  EXPECT_GT(played, 0);
  // The tuned setting is one the module accepts, and the held-out replays ran it.
  const TuneEvaluation& best = pid.evaluations[pid.best];
  if (pid.best > 0) {
    EXPECT_LE(Value(pid, best, "speed_pole_factor"), Value(pid, best, "tilt_pole_factor") / 2);
  }
  ASSERT_EQ(pid.held_out.size(), 2u);
  EXPECT_FALSE(Contains(pid.held_out[1].score.failure, "setup_failed"));
  // tune.csv keeps the reason on the refused rows.
  EXPECT_TRUE(Contains(TuneCsv(result), "must be at most half of tilt_pole_factor"));
}

}  // namespace
}  // namespace upright::runner
