// One run end to end on the courier demo robot: a survived run with its trace and marks, a fall
// that ends the run at once, a controller that cannot be built, a module file that is missing.
#include "upright/runner/run/run_one.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <vector>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/results_writer.hpp"

namespace upright::runner {
namespace {

using testing::BuiltinModule;
using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;

// The lines of `text`, without their line breaks.
std::vector<std::string> Lines(const std::string& text) {
  std::vector<std::string> lines;
  std::size_t start = 0;
  while (start < text.size()) {
    const std::size_t end = text.find('\n', start);
    lines.push_back(text.substr(start, end - start));
    if (end == std::string::npos) break;
    start = end + 1;
  }
  return lines;
}

// `runs` written as a results folder into the scratch folder `name`; the folder.
std::filesystem::path Written(const std::vector<RunResult>& runs, const std::string& name) {
  BatchResult batch;
  batch.tool_version = "test";
  batch.trace_rate_hz = 100;
  batch.runs = runs;
  const std::filesystem::path dir = ScratchDir(name);
  const Status written = WriteResults(dir.string(), batch);
  EXPECT_TRUE(written) << written.error();
  return dir;
}

// The module of the host tests that faults on its first tick (it leaves a command unwritten).
std::shared_ptr<host::Module> FirstTickFaultModule() {
  auto module = host::Module::Load(std::string(UPRIGHT_TEST_MODULE_DIR) + "/faulty_1.so");
  EXPECT_TRUE(Succeeded(module));
  return module.value_or(nullptr);
}

// A parked courier shoved by a half-sine push of `peak_N` at 0.5 s, for 3 s, then the timeline
// elements in `more_events` (whole lines).
std::string ShoveText(double peak_N, const std::string& lqr_settings = "",
                      const std::string& more_events = "") {
  return R"(<scenario name="shove" schema="1" duration_s="3" dt_s="0.001">
  <description>Test: a parked courier shoved once.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N=")" +
         std::to_string(peak_N) + R"(" duration_s="0.2"/>
)" + more_events +
         R"(  </timeline>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr">)" +
         lqr_settings + R"(</controller>
  </controllers>
  <seeds list="7"/>
</scenario>)";
}

// A trace rate so slow its period outlasts the run (1e-300 Hz: 1e303 steps, beyond any integer)
// is bounded before it becomes a step count: the first row and the last (every trace ends on
// the run's last step), the run itself unchanged.
TEST(RunOne, ATraceSlowerThanTheRunKeepsItsFirstAndLastRows) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  RunOptions slow;
  slow.trace_rate_hz = 1e-300;
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), slow);
  EXPECT_EQ(r.metrics.status, RunStatus::kOk) << r.metrics.message;
  ASSERT_EQ(r.trace.rows.size(), 2u);
  EXPECT_EQ(r.trace.rows[0].time_s, 0);
  EXPECT_NEAR(r.trace.rows[1].time_s, 3.0, 1e-9);
  EXPECT_NEAR(r.trace.rate_hz, 1 / 3.001, 1e-12);  // one row per 3001 steps of 1 ms
  RunOptions none;
  none.trace_rate_hz = 0;
  EXPECT_EQ(RunOne(s, 0, 7, BuiltinModule("lqr"), none).metrics.max_tilt_deg,
            r.metrics.max_tilt_deg);
}

TEST(RunOne, SurvivesAModestPushWithATraceAtTheAskedRate) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  RunOptions options;
  options.trace_rate_hz = 50;
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), options);
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
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), RunOptions{});
  ASSERT_EQ(r.metrics.status, RunStatus::kFell) << r.metrics.message;
  EXPECT_GT(r.metrics.fall_time_s, 0.5);
  EXPECT_LT(r.metrics.fall_time_s, 3.0);
  EXPECT_EQ(r.steps, std::lround(r.metrics.fall_time_s / 0.001));
  EXPECT_NEAR(r.trace.rows.back().time_s, r.metrics.fall_time_s, 0.01 + 1e-9);
  EXPECT_EQ(r.trace.marks.back().label, "fell");
  EXPECT_TRUE(std::isnan(r.metrics.tilt_settle_s));  // a fallen run is not judged for settling
  EXPECT_NE(r.metrics.message.find("fell at t = "), std::string::npos);
}

TEST(RunOne, AClampedCommandCountsAtTheLimitAndSaturatesTheMotor) {
  // H-infinity's high gain (at 1.1 γ_opt, near the optimum) under a sharp knock: its kit clamps
  // the torque command at exactly the stall torque, where the drive holds the 20 A current limit.
  const Scenario s = ScenarioFromText(R"(<scenario name="knock" schema="1" duration_s="2">
  <description>Test: a parked courier knocked hard at handle height.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="impulse" peak_N="250" duration_s="0.06" height_m="0.55"/>
  </timeline>
  <controllers baseline="hinf">
    <controller name="hinf" builtin="hinf"><setting key="gamma_factor" value="1.1"/></controller>
  </controllers>
  <seeds list="1"/>
</scenario>)");
  const RunResult r = RunOne(s, 0, 1, BuiltinModule("hinf"), RunOptions{});
  ASSERT_GT(r.steps, 0) << r.metrics.message;
  EXPECT_NEAR(r.metrics.peak_current_A, s.model.motor.current_limit_A, 1e-9);
  EXPECT_GT(r.metrics.command_limit_pct, 0);
  EXPECT_GT(r.metrics.saturation_pct, 0);
  // A torque command at the stall torque asks for the limit current: every such step is also a
  // saturated one.
  EXPECT_GE(r.metrics.saturation_pct, r.metrics.command_limit_pct);
  EXPECT_LE(r.metrics.saturation_pct, 100);
}

TEST(RunOne, ACommandInsideTheLimitIsNotCounted) {
  // A modest push: the current stays well inside the 20 A limit and the command inside its own.
  const Scenario s = ScenarioFromText(ShoveText(60));
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), RunOptions{});
  ASSERT_EQ(r.metrics.status, RunStatus::kOk) << r.metrics.message;
  EXPECT_LT(r.metrics.peak_current_A, 0.9 * s.model.motor.current_limit_A);
  EXPECT_EQ(r.metrics.command_limit_pct, 0);
  EXPECT_EQ(r.metrics.saturation_pct, 0);
}

TEST(RunOne, RunsThatNeverSteppedHaveNoFiguresAndEmptyCells) {
  const Scenario s = ScenarioFromText(ShoveText(60, R"(<setting key="no_such_key" value="1"/>)"));
  const RunResult setup_failed = RunOne(s, 0, 7, BuiltinModule("lqr"), RunOptions{});
  ASSERT_EQ(setup_failed.metrics.status, RunStatus::kSetupFailed);
  const RunResult faulted = RunOne(s, 0, 8, FirstTickFaultModule(), RunOptions{});
  ASSERT_EQ(faulted.metrics.status, RunStatus::kControllerFault) << faulted.metrics.message;
  EXPECT_EQ(faulted.steps, 0);
  for (const RunResult* run : {&setup_failed, &faulted}) {
    for (const MetricColumn& column : MetricColumns()) {
      EXPECT_TRUE(std::isnan(run->metrics.*column.field))
          << ToString(run->metrics.status) << " " << column.name << " = "
          << run->metrics.*column.field;
    }
  }
  // In summary.csv every figure cell of both rows is empty, between status/survived and message.
  const auto dir = Written({setup_failed, faulted}, "never-stepped");
  const std::vector<std::string> lines = Lines(ReadFile(dir / "summary.csv"));
  ASSERT_EQ(lines.size(), 3u);
  const std::string empty_figures(MetricColumns().size(), ',');
  EXPECT_EQ(lines[1].rfind("shove,lqr,7,true,setup_failed,false" + empty_figures + ",", 0), 0u)
      << lines[1];
  EXPECT_EQ(lines[2].rfind("shove,lqr,8,true,controller_fault,false" + empty_figures + ",", 0), 0u)
      << lines[2];
}

TEST(RunOne, TraceEventsAppearWhereTheyHappenAndNotAfterTheEnd) {
  // A shove the robot does not survive, a push at 0.505 s between two 10 ms trace rows, and a
  // drive change at 2.5 s, long after the fall.
  const Scenario s = ScenarioFromText(
      ShoveText(2500, "",
                R"(    <push at_s="0.505" shape="step" peak_N="1" duration_s="0.1"/>
    <drive at_s="2.5" speed_m_s="0.3" ramp_s="0.2"/>
)"));
  RunOptions options;
  options.trace_rate_hz = 100;
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), options);
  ASSERT_EQ(r.metrics.status, RunStatus::kFell) << r.metrics.message;
  ASSERT_LT(r.metrics.fall_time_s, 2.5);
  // The trace ends on the step the robot fell, on the 10 ms grid or not.
  EXPECT_EQ(r.trace.rows.back().time_s, r.metrics.fall_time_s);

  const auto dir = Written({r}, "trace-events");
  const std::vector<std::string> lines = Lines(ReadFile(dir / "traces" / TraceFileName(r)));
  ASSERT_EQ(lines.size(), r.trace.rows.size() + 1);
  // Each row's time and event (the first and the last field; no event label here has a comma).
  std::vector<std::pair<double, std::string>> events;
  for (std::size_t i = 1; i < lines.size(); ++i) {
    const std::string& line = lines[i];
    const std::string event = line.substr(line.rfind(',') + 1);
    if (!event.empty()) events.emplace_back(std::stod(line.substr(0, line.find(','))), event);
  }
  ASSERT_EQ(events.size(), 3u) << lines.back();
  EXPECT_NEAR(events[0].first, 0.5, 1e-12);  // on its own row, the row at 0.5 s
  EXPECT_EQ(events[0].second, "push 2500 N half-sine 0.2 s");
  EXPECT_NEAR(events[1].first, 0.51, 1e-12);  // the first row after 0.505 s, not the one before
  EXPECT_EQ(events[1].second, "push 1 N step 0.1 s");
  // The fall on the last row, at its own time; the drive change never happened.
  EXPECT_NEAR(events[2].first, r.metrics.fall_time_s, 1e-9);
  EXPECT_EQ(events[2].second, "fell");
}

TEST(RunOne, AControllerThatRefusesItsSettingsIsASetupFailure) {
  const Scenario s = ScenarioFromText(ShoveText(60, R"(<setting key="no_such_key" value="1"/>)"));
  const RunResult r = RunOne(s, 0, 7, BuiltinModule("lqr"), RunOptions{});
  EXPECT_EQ(r.metrics.status, RunStatus::kSetupFailed);
  EXPECT_NE(r.metrics.message.find("no_such_key"), std::string::npos) << r.metrics.message;
  EXPECT_EQ(r.steps, 0);
}

TEST(RunOne, AModuleThatDidNotLoadIsASetupFailureCarryingWhy) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  const RunResult r = RunOne(s, 0, 7, Failure("/nowhere/x.so: cannot open"), RunOptions{});
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
  const RunResult settled = RunOne(s, 0, 7, BuiltinModule("lqr"), probe);
  EXPECT_EQ(settled.metrics.status, RunStatus::kOk);
  EXPECT_NE(settled.metrics.message.find("stopped early"), std::string::npos)
      << settled.metrics.message;
  // Not before the push has ended (0.7 s) and the robot has been quiet for the hold (1 s).
  EXPECT_GT(settled.metrics.end_time_s, 1.7);
  EXPECT_LT(settled.metrics.end_time_s, 10.0);

  // A reference still asking for motion at the end: nothing is decided early.
  s.drives.push_back({/*start_s=*/0.2, /*ramp_s=*/1.0, /*speed_m_s=*/0.3, 0.0});
  const RunResult driving = RunOne(s, 0, 7, BuiltinModule("lqr"), probe);
  EXPECT_EQ(driving.metrics.status, RunStatus::kOk) << driving.metrics.message;
  EXPECT_NEAR(driving.metrics.end_time_s, 10.0, 1e-9);
}

TEST(RunOne, TheSameSeedGivesTheSameRunAndAnotherSeedDoesNot) {
  const Scenario s = ScenarioFromText(ShoveText(60));
  const auto module = BuiltinModule("lqr");
  const RunResult a = RunOne(s, 0, 7, module, RunOptions{});
  const RunResult b = RunOne(s, 0, 7, module, RunOptions{});
  const RunResult c = RunOne(s, 0, 8, module, RunOptions{});
  EXPECT_EQ(a.metrics.max_tilt_deg, b.metrics.max_tilt_deg);
  EXPECT_EQ(a.metrics.effort_Nm2s, b.metrics.effort_Nm2s);
  EXPECT_NE(a.metrics.effort_Nm2s, c.metrics.effort_Nm2s);  // the sensor noise differs
}

}  // namespace
}  // namespace upright::runner
