// One run end to end on the courier demo robot: a survived run with its trace and marks, a fall
// that ends the run at once, a controller that cannot be built, a module file that is missing.
#include "upright/runner/run_one.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "run_test_support.hpp"

namespace upright::runner {
namespace {

using testing::BuiltinModule;
using testing::ScenarioFromText;

// A parked courier shoved by a half-sine push of `peak_N` at 0.5 s, for 3 s.
std::string ShoveText(double peak_N, const std::string& lqr_settings = "") {
  return R"(<scenario name="shove" schema="1" duration_s="3" dt_s="0.001">
  <description>Test: a parked courier shoved once.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N=")" +
         std::to_string(peak_N) + R"(" duration_s="0.2"/>
  </timeline>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr">)" +
         lqr_settings + R"(</controller>
  </controllers>
  <seeds list="7"/>
</scenario>)";
}

TEST(RunOne, SurvivesAModestPushWithATraceAtTheAskedRate) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  RunOptions options;
  options.trace_rate_hz = 50;
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), "", options);
  EXPECT_EQ(r.metrics.status, RunStatus::kOk) << r.metrics.message;
  EXPECT_EQ(r.scenario, "shove");
  EXPECT_EQ(r.controller, "lqr");
  EXPECT_EQ(r.seed, 7u);
  EXPECT_TRUE(r.baseline);
  EXPECT_EQ(r.steps, 3000);
  EXPECT_NEAR(r.metrics.end_time_s, 3.0, 1e-9);
  EXPECT_TRUE(std::isnan(r.metrics.fall_time_s));
  // A 60 N push moves the 32 kg courier: it tilts and drifts, then comes back within the
  // window (the scenario's default bands), using its motors.
  EXPECT_GT(r.metrics.max_tilt_deg, 0.2);
  EXPECT_LT(r.metrics.max_tilt_deg, 20);
  EXPECT_GT(r.metrics.max_drift_m, 0.01);
  EXPECT_GT(r.metrics.effort_Nm2s, 0);
  EXPECT_GT(r.metrics.energy_J, 0);
  EXPECT_TRUE(std::isfinite(r.metrics.tilt_settle_s));
  // Rows at 0, 20 ms, ..., 3 s: 151, 20 ms apart.
  ASSERT_EQ(r.trace.rows.size(), 151u);
  EXPECT_DOUBLE_EQ(r.trace.rate_hz, 50);
  EXPECT_NEAR(r.trace.rows[1].time_s, 0.02, 1e-12);
  EXPECT_NEAR(r.trace.rows.back().time_s, 3.0, 1e-9);
  ASSERT_EQ(r.trace.marks.size(), 1u);
  EXPECT_DOUBLE_EQ(r.trace.marks[0].time_s, 0.5);
  EXPECT_NE(r.trace.marks[0].label.find("push"), std::string::npos);
}

TEST(RunOne, AFallEndsTheRunAtOnceWithItsTime) {
  const Scenario s = ScenarioFromText(ShoveText(2500));
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), "", RunOptions{});
  ASSERT_EQ(r.metrics.status, RunStatus::kFell) << r.metrics.message;
  EXPECT_GT(r.metrics.fall_time_s, 0.5);
  EXPECT_LT(r.metrics.fall_time_s, 3.0);
  EXPECT_EQ(r.steps, std::lround(r.metrics.fall_time_s / 0.001));
  EXPECT_NEAR(r.trace.rows.back().time_s, r.metrics.fall_time_s, 0.01 + 1e-9);
  EXPECT_EQ(r.trace.marks.back().label, "fell");
  EXPECT_TRUE(std::isnan(r.metrics.tilt_settle_s));  // a fallen run is not judged for settling
  EXPECT_NE(r.metrics.message.find("fell at t = "), std::string::npos);
}

TEST(RunOne, AControllerThatRefusesItsSettingsIsASetupFailure) {
  const Scenario s = ScenarioFromText(ShoveText(60, R"(<setting key="no_such_key" value="1"/>)"));
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), "", RunOptions{});
  EXPECT_EQ(r.metrics.status, RunStatus::kSetupFailed);
  EXPECT_NE(r.metrics.message.find("no_such_key"), std::string::npos) << r.metrics.message;
  EXPECT_EQ(r.steps, 0);
}

TEST(RunOne, AModuleThatDidNotLoadIsASetupFailureCarryingWhy) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  const RunResult r = RunOne(s, 0, 7, nullptr, "/nowhere/x.so: cannot open", RunOptions{});
  EXPECT_EQ(r.metrics.status, RunStatus::kSetupFailed);
  EXPECT_EQ(r.metrics.message, "/nowhere/x.so: cannot open");
}

TEST(RunOne, AProbeStopsOnceTheRobotHasSettledAndNotBefore) {
  const std::string text = ShoveText(60);
  Scenario s = ScenarioFromText(text);
  s.duration_s = 10;
  RunOptions probe;
  probe.trace_rate_hz = 0;
  probe.stop_when_settled = true;
  const RunResult settled = RunOne(s, 0, 7, BuiltinModule("lqr"), "", probe);
  EXPECT_EQ(settled.metrics.status, RunStatus::kOk);
  EXPECT_NE(settled.metrics.message.find("stopped early"), std::string::npos)
      << settled.metrics.message;
  // Not before the push has ended (0.7 s) and the robot has been quiet for the hold (1 s).
  EXPECT_GT(settled.metrics.end_time_s, 1.7);
  EXPECT_LT(settled.metrics.end_time_s, 10.0);

  // A reference still asking for motion at the end: nothing is decided early.
  s.drives.push_back({/*start_s=*/0.2, /*ramp_s=*/1.0, /*speed_m_s=*/0.3, 0.0});
  const RunResult driving = RunOne(s, 0, 7, BuiltinModule("lqr"), "", probe);
  EXPECT_EQ(driving.metrics.status, RunStatus::kOk) << driving.metrics.message;
  EXPECT_NEAR(driving.metrics.end_time_s, 10.0, 1e-9);
}

TEST(RunOne, TheSameSeedGivesTheSameRunAndAnotherSeedDoesNot) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  const auto module = BuiltinModule("lqr");
  const RunResult a = RunOne(s, 0, 7, module, "", RunOptions{});
  const RunResult b = RunOne(s, 0, 7, module, "", RunOptions{});
  const RunResult c = RunOne(s, 0, 8, module, "", RunOptions{});
  EXPECT_EQ(a.metrics.max_tilt_deg, b.metrics.max_tilt_deg);
  EXPECT_EQ(a.metrics.effort_Nm2s, b.metrics.effort_Nm2s);
  EXPECT_NE(a.metrics.effort_Nm2s, c.metrics.effort_Nm2s);  // the sensor noise differs
}

}  // namespace
}  // namespace upright::runner
