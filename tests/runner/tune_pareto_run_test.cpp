// A Pareto tune end to end on the courier demo robot: the front of a small real tune is the
// non-dominated set of its evaluations, pareto.csv and tune.md hold it, and the tables are the
// same on one job and on two; the plan refuses metrics a front cannot trade.
#include <gtest/gtest.h>

#include <algorithm>
#include <string>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "tune_test_scenarios.hpp"
#include "upright/runner/tune/pareto.hpp"
#include "upright/runner/tune/pareto_writer.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_writer.hpp"

namespace upright::runner {
namespace {

using testing::Contains;
using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;
using testing::ShoveText;

// A parked courier shoved once, for 2.5 s, on seed 1, balanced by the lqr module.
Scenario Shove() {
  return ScenarioFromText(ShoveText(R"(<controller name="lqr" builtin="lqr"/>)"));
}

// The lqr module's tilt weight tuned for the front of peak tilt against peak drift.
TuneResult ParetoTune(int jobs) {
  const std::vector<Scenario> scenarios = {Shove()};
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="lqr"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
</tune>)",
                                              "t.xml");
  EXPECT_TRUE(Succeeded(spec));
  TuneOptions options;
  options.budget_runs = 12;  // the default and 11 settings of one seed
  options.holdout_seeds = 0;
  options.jobs = jobs;
  options.pareto_metrics = {"max_tilt_deg", "max_drift_m"};
  const Result<TunePlan> plan = PlanTune(scenarios, options, *spec);
  EXPECT_TRUE(Succeeded(plan));
  return RunTune(scenarios, options, *plan, "test", {});
}

TEST(TunePareto, TheFrontIsTheNonDominatedEvaluationsWhateverTheJobs) {
  const TuneResult one = ParetoTune(1);
  const TuneResult two = ParetoTune(2);
  EXPECT_EQ(TuneCsv(one), TuneCsv(two));
  EXPECT_EQ(TuneMarkdown(one), TuneMarkdown(two));
  EXPECT_EQ(ParetoCsv(one), ParetoCsv(two));
  EXPECT_EQ(one.plan.pareto_metrics, (std::vector<std::string>{"max_tilt_deg", "max_drift_m"}));
  ASSERT_EQ(one.controllers.size(), 1u);
  const ControllerTune& lqr = one.controllers[0];
  ASSERT_TRUE(lqr.setup_error.empty()) << lqr.setup_error;
  EXPECT_LE(lqr.evaluations.size(), 12u);
  EXPECT_EQ(lqr.pareto, two.controllers[0].pareto);
  // A stiffer tilt weight trades tilt for drift: the front has more than one point.
  ASSERT_GE(lqr.pareto.size(), 2u);
  const std::array<std::size_t, 2> columns = ParetoColumns(one.plan.pareto_metrics);
  const auto tilt = [&](std::size_t i) {
    return lqr.evaluations[i].score.mean_metrics[columns[0]];
  };
  const auto drift = [&](std::size_t i) {
    return lqr.evaluations[i].score.mean_metrics[columns[1]];
  };
  for (std::size_t k = 0; k < lqr.pareto.size(); ++k) {
    const std::size_t i = lqr.pareto[k];
    EXPECT_EQ(lqr.evaluations[i].score.survived, 1);
    EXPECT_TRUE(lqr.evaluations[i].score.feasible());
    // Sorted by tilt ascending, so drift descending.
    if (k > 0) {
      EXPECT_GT(tilt(i), tilt(lqr.pareto[k - 1]));
      EXPECT_LT(drift(i), drift(lqr.pareto[k - 1]));
    }
  }
  // Every surviving evaluation off the front is matched or beaten on both by a front point;
  // none on the front is beaten on both by any evaluation.
  for (std::size_t i = 0; i < lqr.evaluations.size(); ++i) {
    if (lqr.evaluations[i].score.survived != 1) continue;
    const bool on = std::find(lqr.pareto.begin(), lqr.pareto.end(), i) != lqr.pareto.end();
    bool covered = false;
    for (const std::size_t f : lqr.pareto) {
      if (f != i && tilt(f) <= tilt(i) && drift(f) <= drift(i)) covered = true;
      if (on && f != i) {
        EXPECT_FALSE(tilt(i) <= tilt(f) && drift(i) <= drift(f)) << i << " against " << f;
      }
    }
    EXPECT_NE(on, covered) << "evaluation " << i;
  }
  // pareto.csv: a header and a row per front point, evaluation numbers as in tune.csv.
  const std::string csv = ParetoCsv(one);
  EXPECT_EQ(static_cast<std::size_t>(std::count(csv.begin(), csv.end(), '\n')),
            1 + lqr.pareto.size());
  EXPECT_TRUE(Contains(csv, "controller,mean_max_tilt_deg,mean_max_drift_m,evaluation,settings\n"));
  std::string first_row = ",";
  first_row += std::to_string(lqr.pareto.front());
  first_row += ",";
  EXPECT_TRUE(Contains(csv, first_row)) << csv;
  const std::string md = TuneMarkdown(one);
  EXPECT_TRUE(Contains(md, "Pareto front of mean max_tilt_deg against mean max_drift_m"));
  EXPECT_TRUE(Contains(md, "### Pareto front: max_tilt_deg against max_drift_m"));
  const auto dir = ScratchDir("tune-pareto");
  ASSERT_TRUE(Succeeded(WriteTuneResults(dir.string(), one)));
  EXPECT_EQ(ReadFile(dir / "pareto.csv"), csv);
}

TEST(TunePareto, ThePlanRefusesMetricsAFrontCannotTrade) {
  const std::vector<Scenario> scenarios = {Shove()};
  TuneOptions options;
  options.budget_runs = 10;
  options.pareto_metrics = {"max_tilt_deg", "end_time_s"};
  const std::string why = FailureOf(PlanTune(scenarios, options, TuneSpec{}));
  EXPECT_TRUE(Contains(why, "(--pareto) = max_tilt_deg,end_time_s: end_time_s is no metric"))
      << why;
  EXPECT_TRUE(Contains(why, "accepted: max_tilt_deg, max_drift_m")) << why;
  // Without --pareto no front is kept and no pareto.csv written.
  options.pareto_metrics.clear();
  const Result<TunePlan> plan = PlanTune(scenarios, options, TuneSpec{});
  ASSERT_TRUE(Succeeded(plan));
  EXPECT_TRUE(plan->pareto_metrics.empty());
}

}  // namespace
}  // namespace upright::runner
