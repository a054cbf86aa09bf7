// What a run's module logs, end to end: create's messages (a refused create's too) and each
// tick's with its time, the flood capped, the linear twin's instance apart, debug kept only when
// asked, no allocation for a module that logs every step, and batches that keep each run's own.
#include <gtest/gtest.h>

#include <cmath>
#include <memory>
#include <string>
#include <vector>

#include "allocation_count.hpp"
#include "run_test_support.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/run/run_one.hpp"

namespace upright::runner {
namespace {

using testing::ScenarioFromText;

std::string LoggingModulePath() { return std::string(UPRIGHT_TEST_MODULE_DIR) + "/logging.so"; }

std::shared_ptr<host::Module> LoggingModule() {
  auto module = host::Module::Load(LoggingModulePath());
  EXPECT_TRUE(module) << module.error();
  return module.value_or(nullptr);
}

// The parked courier for `duration_s` under the logging test module with `settings` (whole
// <setting/> elements), seeds 1 and 2. Its commands are zero: too short a run to fall.
std::string LoggingText(double duration_s, const std::string& settings) {
  return R"(<scenario name="chatty" schema="1" duration_s=")" + std::to_string(duration_s) +
         R"(" dt_s="0.001">
  <description>Test: a module that logs.</description>
  <robot file="../models/courier.xml"/>
  <controllers>
    <controller name="chatty" file=")" +
         LoggingModulePath() + R"(">)" + settings + R"(</controller>
  </controllers>
  <seeds list="1 2"/>
</scenario>)";
}

RunOptions NoTrace() {
  RunOptions options;
  options.trace_rate_hz = 0;
  return options;
}

TEST(RunModuleLog, KeepsCreatesMessagesAndEachTicksWithItsTime) {
  const Scenario s = ScenarioFromText(LoggingText(0.2, R"(<setting key="per_step" value="2"/>)"));
  const RunResult r = RunOne(s, 0, 1, LoggingModule(), NoTrace());
  ASSERT_EQ(r.metrics.status, RunStatus::kOk) << r.metrics.message;
  ASSERT_EQ(r.steps, 200);
  const ModuleLog& log = r.module_log;
  // At or above info: create's three, "first tick", and two per tick at 200 Hz on 1 ms steps
  // (ticks at steps 0, 5, ..., 195: 40 ticks): 84, of which the first 20 are kept.
  ASSERT_EQ(log.messages.size(), 20u);
  EXPECT_EQ(log.dropped, 84 - 20);
  EXPECT_EQ(log.dropped_level, LogLevel::kInfo);
  EXPECT_EQ(log.messages[0].text, "create: info");
  EXPECT_EQ(log.messages[1].level, LogLevel::kWarning);
  EXPECT_EQ(log.messages[2].text, "create: error");
  for (int i = 0; i < 3; ++i) EXPECT_TRUE(std::isnan(log.messages[i].time_s)) << i;
  EXPECT_EQ(log.messages[3].text, "first tick");
  EXPECT_EQ(log.messages[3].time_s, 0.0);
  EXPECT_EQ(log.messages[4].text, "tick 1 message 1");
  EXPECT_EQ(log.messages[6].text, "tick 2 message 1");
  EXPECT_NEAR(log.messages[6].time_s, 0.005, 1e-12);
  EXPECT_EQ(log.messages[19].text, "tick 8 message 2");
  EXPECT_NEAR(log.messages[19].time_s, 0.035, 1e-12);
  // No twin was asked for.
  EXPECT_TRUE(r.twin_module_log.messages.empty());
}

TEST(RunModuleLog, DebugMessagesAreKeptOnlyWhenAsked) {
  const Scenario s = ScenarioFromText(LoggingText(0.01, ""));
  RunOptions options = NoTrace();
  options.module_log_level = LogLevel::kDebug;
  const RunResult r = RunOne(s, 0, 1, LoggingModule(), options);
  ASSERT_EQ(r.module_log.messages.size(), 5u);  // create's four and "first tick"
  EXPECT_EQ(r.module_log.messages[0].text, "create: debug");
  EXPECT_EQ(r.module_log.messages[0].level, LogLevel::kDebug);
  EXPECT_EQ(RunOne(s, 0, 1, LoggingModule(), NoTrace()).module_log.messages.size(), 4u);
}

TEST(RunModuleLog, ARefusedCreateKeepsWhatTheModuleSaidBeforeRefusing) {
  const Scenario s = ScenarioFromText(LoggingText(0.2, R"(<setting key="refuse" value="true"/>)"));
  const RunResult r = RunOne(s, 0, 1, LoggingModule(), NoTrace());
  EXPECT_EQ(r.metrics.status, RunStatus::kSetupFailed);
  EXPECT_NE(r.metrics.message.find("refused as asked"), std::string::npos) << r.metrics.message;
  ASSERT_EQ(r.module_log.messages.size(), 3u);
  EXPECT_EQ(r.module_log.messages[2].text, "create: error");
  EXPECT_TRUE(std::isnan(r.module_log.messages[2].time_s));
  // `upright check` asks the same set-up, and gets the same messages.
  ModuleLog start_log;
  const Status started = CheckRunStart(s, 0, LoggingModule(), &start_log);
  ASSERT_FALSE(started);
  EXPECT_NE(started.error().find("refused as asked"), std::string::npos) << started.error();
  ASSERT_EQ(start_log.messages.size(), 3u);
  EXPECT_EQ(start_log.messages[0].text, "create: info");
}

TEST(RunModuleLog, TheLinearTwinsInstanceKeepsItsOwn) {
  const Scenario s = ScenarioFromText(LoggingText(0.2, R"(<setting key="per_step" value="1"/>)"));
  RunOptions options = NoTrace();
  options.linear_twin = true;
  const RunResult r = RunOne(s, 0, 1, LoggingModule(), options);
  ASSERT_EQ(r.metrics.status, RunStatus::kOk) << r.metrics.message;
  ASSERT_TRUE(r.gap.twin_message.empty()) << r.gap.twin_message;
  // The twin runs the same 40 ticks: 3 + 1 + 40 messages, as the run's own.
  for (const ModuleLog* log : {&r.module_log, &r.twin_module_log}) {
    ASSERT_EQ(log->messages.size(), 20u);
    EXPECT_EQ(log->dropped, 44 - 20);
    EXPECT_NEAR(log->messages[19].time_s, 0.075, 1e-12);  // "tick 16 message 1"
    EXPECT_EQ(log->messages[19].text, "tick 16 message 1");
  }
}

TEST(RunModuleLog, AModuleThatLogsEveryStepMakesTheRunAllocateNoMore) {
  // The same flood for 0.2 s and for 0.4 s: twice the steps and messages, the same allocations.
  const auto allocations = [](double duration_s) {
    const Scenario s =
        ScenarioFromText(LoggingText(duration_s, R"(<setting key="per_step" value="5"/>)"));
    const auto module = LoggingModule();
    const long before = testing::AllocationCount();
    const RunResult r = RunOne(s, 0, 1, module, NoTrace());
    const long made = testing::AllocationCount() - before;
    EXPECT_EQ(r.metrics.status, RunStatus::kOk) << r.metrics.message;
    EXPECT_EQ(r.steps, std::lround(duration_s / 0.001));
    return made;
  };
  const long short_run = allocations(0.2);
  const long long_run = allocations(0.4);
  EXPECT_GT(short_run, 0);  // the run's set-up allocates, once
  EXPECT_EQ(long_run, short_run);
}

TEST(RunModuleLog, ABatchKeepsEachRunsOwnWhateverTheJobs) {
  const Scenario s = ScenarioFromText(LoggingText(0.05, R"(<setting key="per_step" value="1"/>)"));
  BatchOptions options;
  options.run = NoTrace();
  for (int jobs : {1, 2}) {
    options.jobs = jobs;
    const BatchResult batch = RunBatch({s}, options, "test", nullptr);
    ASSERT_EQ(batch.runs.size(), 2u);  // seeds 1 and 2
    for (const RunResult& run : batch.runs) {
      // 3 + 1 + 10 ticks of 0.05 s: 14 messages, all kept.
      ASSERT_EQ(run.module_log.messages.size(), 14u) << jobs;
      EXPECT_EQ(run.module_log.dropped, 0);
      EXPECT_EQ(run.module_log.messages[13].text, "tick 10 message 1");
    }
  }
}

}  // namespace
}  // namespace upright::runner
