// Tunes end to end on the courier demo robot: the plan's defaults and refusals, the knob ends a
// module refuses, and a small real tune of the lqr and pid modules whose tables are the same on one
// job and on two, never worse than the default, with an element that pastes back into a scenario.
#include <gtest/gtest.h>

#include <fstream>
#include <string>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "tune_test_scenarios.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_writer.hpp"

namespace upright::runner {
namespace {

using testing::Contains;
using testing::kAllFour;
using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;
using testing::ShoveText;

TEST(TunePlan, TakesEveryControllerWithItsDefaultKnobs) {
  const std::vector<Scenario> scenarios = {ScenarioFromText(ShoveText(kAllFour, "1 2"))};
  TuneOptions options;
  options.budget_runs = 41;
  const Result<TunePlan> plan = PlanTune(scenarios, options, TuneSpec{});
  ASSERT_TRUE(Succeeded(plan));
  ASSERT_EQ(plan->controllers.size(), 4u);
  EXPECT_EQ(plan->controllers[1].name, "hinf");
  EXPECT_EQ(plan->controllers[1].knobs.front().setting, "gamma_factor");
  EXPECT_EQ(plan->controllers[3].knobs.size(), 2u);  // pid: tilt weight, tilt filter
  EXPECT_EQ(plan->runs_per_evaluation, 2u);          // one scenario, two seeds
  EXPECT_EQ(plan->evaluations, 20);                  // ⌊41 / 2⌋
  // Three held-out seeds by default, after the scenario's largest.
  ASSERT_EQ(plan->holdout_seeds.size(), 1u);
  EXPECT_EQ(plan->holdout_seeds[0], (std::vector<std::uint64_t>{3, 4, 5}));
  EXPECT_EQ(plan->holdout_runs, 3u);
  EXPECT_EQ(plan->max_runs, 184u);  // 4 × (20 × 2 + 2 × 3): the default and tuned held out
}

TEST(TunePlan, RefusesWhatCannotBeTuned) {
  const std::vector<Scenario> scenarios = {ScenarioFromText(ShoveText(kAllFour))};
  TuneOptions options;
  options.budget_runs = 2;
  EXPECT_TRUE(Contains(FailureOf(PlanTune(scenarios, options, TuneSpec{})),
                       "--budget 2 runs is too small"));
  options.budget_runs = 30;
  options.controllers = {"mpc"};
  EXPECT_TRUE(Contains(FailureOf(PlanTune(scenarios, options, TuneSpec{})),
                       "no controller named mpc (its controllers: lqr, hinf, lqg, pid)"));
  options.controllers = {"lqr", "lqr"};
  EXPECT_TRUE(Contains(FailureOf(PlanTune(scenarios, options, TuneSpec{})), "lqr is given twice"));
  // A tune file naming a controller that is not tuned.
  options.controllers = {"lqr"};
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="pid"><knob setting="max_tilt_deg" lo="1" hi="5"/></controller>
</tune>)",
                                              "t.xml");
  ASSERT_TRUE(Succeeded(spec));
  EXPECT_TRUE(Contains(FailureOf(PlanTune(scenarios, options, *spec)),
                       "t.xml:2: controller pid is not among the controllers tuned (lqr)"));
}

TEST(TunePlan, RefusesKnobEndsTheModuleRefuses) {
  const std::vector<Scenario> scenarios = {
      ScenarioFromText(ShoveText(R"(<controller name="lqr" builtin="lqr"/>)"))};
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="lqr">
    <knob setting="max_input_fraction" lo="0.5" hi="2" scale="linear"/>
  </controller>
</tune>)",
                                              "t.xml");
  ASSERT_TRUE(Succeeded(spec));
  TuneOptions options;
  options.budget_runs = 10;
  const Result<TunePlan> plan = PlanTune(scenarios, options, *spec);
  ASSERT_TRUE(Succeeded(plan));
  const TuneStartFailure failure = FailureOf(CheckTuneStart(scenarios, *plan, options));
  EXPECT_FALSE(failure.module_missing);
  const std::string& why = failure.message;
  // The controller's line in the scenario, the end refused and the module's own reason.
  EXPECT_TRUE(Contains(why,
                       "test.xml:7: controller lqr: refuses the knobs' upper ends "
                       "(max_input_fraction = 2)"))
      << why;
  EXPECT_TRUE(Contains(why, "max_input_fraction")) << why;
}

TEST(TunePlan, TellsAModuleThatWillNotLoadFromRefusedSettings) {
  const auto dir = ScratchDir("tune-module");
  const std::string module = (dir / "not_a_module.so").string();
  std::ofstream(module) << "not a shared object";
  const std::vector<Scenario> scenarios = {
      ScenarioFromText(ShoveText(R"(<controller name="mine" file=")" + module + R"("/>)"))};
  // A module file has no default knobs.
  TuneOptions options;
  options.budget_runs = 10;
  EXPECT_TRUE(Contains(FailureOf(PlanTune(scenarios, options, TuneSpec{})),
                       "test.xml:7: controller mine is a module file: it has no default knobs"));
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="mine"><knob setting="gain" lo="1" hi="2"/></controller>
</tune>)",
                                              "t.xml");
  ASSERT_TRUE(Succeeded(spec));
  const Result<TunePlan> plan = PlanTune(scenarios, options, *spec);
  ASSERT_TRUE(Succeeded(plan));
  const TuneStartFailure failure = FailureOf(CheckTuneStart(scenarios, *plan, options));
  EXPECT_TRUE(failure.module_missing);
  EXPECT_TRUE(Contains(failure.message, "test.xml:7: controller mine: ")) << failure.message;
}

// Two controllers tuned side by side on one knob each (on two jobs, one job each).
TuneResult SmallTune(int jobs) {
  const std::vector<Scenario> scenarios = {ScenarioFromText(ShoveText(
      R"(<controller name="lqr" builtin="lqr"/><controller name="pid" builtin="pid"/>)"))};
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="lqr"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
  <controller name="pid"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
</tune>)",
                                              "t.xml");
  EXPECT_TRUE(Succeeded(spec));
  TuneOptions options;
  options.budget_runs = 8;    // the default and 7 settings of one seed
  options.holdout_seeds = 2;  // seeds 2 and 3
  options.jobs = jobs;
  const Result<TunePlan> plan = PlanTune(scenarios, options, *spec);
  EXPECT_TRUE(Succeeded(plan));
  return RunTune(scenarios, options, *plan, "test", {});
}

TEST(TuneRun, GivesTheSameTablesOnOneJobAndOnTwo) {
  const TuneResult one = SmallTune(1);
  const TuneResult two = SmallTune(2);
  EXPECT_EQ(one.jobs, 1);
  EXPECT_EQ(two.jobs, 2);
  EXPECT_EQ(TuneCsv(one), TuneCsv(two));
  EXPECT_EQ(TuneMarkdown(one), TuneMarkdown(two));
  ASSERT_EQ(one.controllers.size(), 2u);
  EXPECT_EQ(one.controllers[1].controller, "pid");
  const ControllerTune& lqr = one.controllers[0];
  EXPECT_TRUE(lqr.setup_error.empty()) << lqr.setup_error;
  EXPECT_LE(lqr.evaluations.size(), 8u);
  // One run per evaluation, and two held-out runs each for the default and the tuned setting.
  EXPECT_EQ(one.runs, lqr.evaluations.size() + one.controllers[1].evaluations.size() + 8);
  EXPECT_EQ(one.plan.holdout_seeds[0], (std::vector<std::uint64_t>{2, 3}));
  ASSERT_EQ(lqr.held_out.size(), 2u);
  EXPECT_EQ(lqr.held_out[0].score.runs, 2);
  EXPECT_TRUE(lqr.held_out[0].values.empty());  // the default setting
  EXPECT_EQ(lqr.held_out[1].values, lqr.evaluations[lqr.best].values);
  EXPECT_EQ(lqr.evaluations[0].stage, EvaluationStage::kDefault);
  EXPECT_EQ(lqr.evaluations[1].stage, EvaluationStage::kGlobal);
  // The tuned setting is the best evaluated, the default among them.
  for (const TuneEvaluation& e : lqr.evaluations) {
    EXPECT_LE(lqr.evaluations[lqr.best].score.objective, e.score.objective);
  }
  // The default objective scored by hand from its run's figures: 1 × tilt + 10 × drift.
  const EvaluationScore& base = lqr.evaluations[0].score;
  ASSERT_EQ(base.survived, 1) << base.failure;
  EXPECT_NEAR(base.objective, base.mean_metrics[1] + 10 * base.mean_metrics[2], 1e-9);

  // The element pastes back: a scenario with it holds the tuned value.
  const Scenario pasted = ScenarioFromText(ShoveText(lqr.element));
  ASSERT_EQ(pasted.controllers.size(), 1u);
  if (lqr.best > 0) {
    ASSERT_EQ(pasted.controllers[0].config.size(), 1u);
    EXPECT_EQ(pasted.controllers[0].config[0].first, "max_tilt_deg");
    EXPECT_EQ(std::stod(pasted.controllers[0].config[0].second),
              lqr.evaluations[lqr.best].values[0]);
  }
  // Both files written.
  const auto dir = ScratchDir("tune");
  ASSERT_TRUE(Succeeded(WriteTuneResults(dir.string(), one)));
  EXPECT_EQ(ReadFile(dir / "tune.csv"), TuneCsv(one));
  EXPECT_TRUE(Contains(ReadFile(dir / "tune.md"), lqr.element));
}

}  // namespace
}  // namespace upright::runner
