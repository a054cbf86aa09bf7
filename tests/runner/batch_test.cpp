// A batch: the same tables whatever the number of jobs, runs in a fixed order, a missing module
// turned into failed rows rather than a crashed batch.
#include "upright/runner/batch.hpp"

#include <gtest/gtest.h>

#include "run_test_support.hpp"
#include "upright/runner/results_writer.hpp"

namespace upright::runner {
namespace {

using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;

const char* kTwoControllers = R"(<scenario name="two" schema="1" duration_s="1.5">
  <description>Test: two controllers, two seeds, a step push.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.3" shape="step" peak_N="40" duration_s="0.4"/>
  </timeline>
  <controllers baseline="pid">
    <controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>
  </controllers>
  <seeds list="1 2"/>
</scenario>)";

TEST(Batch, TablesAreByteIdenticalWithOneJobOrTwo) {
  const std::vector<Scenario> scenarios{ScenarioFromText(kTwoControllers, "two.xml")};
  BatchOptions one, two;
  one.jobs = 1;
  two.jobs = 2;
  one.run.trace_rate_hz = two.run.trace_rate_hz = 20;
  const BatchResult a = RunBatch(scenarios, one, "test", nullptr);
  const BatchResult b = RunBatch(scenarios, two, "test", nullptr);
  ASSERT_EQ(a.runs.size(), 4u);
  ASSERT_EQ(b.runs.size(), 4u);
  EXPECT_EQ(b.jobs, 2);
  // Scenario order, then controller order, then seed order.
  EXPECT_EQ(a.runs[0].controller, "lqr");
  EXPECT_EQ(a.runs[1].seed, 2u);
  EXPECT_EQ(a.runs[2].controller, "pid");
  EXPECT_TRUE(a.runs[2].baseline);

  const auto dir_a = ScratchDir("jobs1"), dir_b = ScratchDir("jobs2");
  std::string error;
  ASSERT_TRUE(WriteResults(dir_a.string(), a, &error)) << error;
  ASSERT_TRUE(WriteResults(dir_b.string(), b, &error)) << error;
  for (const auto& name : ResultFileNames()) {
    if (name == "manifest.json") continue;  // wall times and the job count differ by design
    const std::string text = ReadFile(dir_a / name);
    EXPECT_FALSE(text.empty()) << name;
    EXPECT_EQ(text, ReadFile(dir_b / name)) << name;
  }
  for (const auto& run : a.runs) {
    const auto trace = std::filesystem::path("traces") / TraceFileName(run);
    EXPECT_EQ(ReadFile(dir_a / trace), ReadFile(dir_b / trace)) << trace;
  }
}

TEST(Batch, SeedCountOverridesTheFilesSeeds) {
  const std::vector<Scenario> scenarios{ScenarioFromText(kTwoControllers, "two.xml")};
  BatchOptions options;
  options.seed_count = 3;
  EXPECT_EQ(CountRuns(scenarios, options), 6u);
}

TEST(Batch, AMissingModuleFileGivesFailedRowsAndTheRestRun) {
  Scenario s = ScenarioFromText(kTwoControllers, "two.xml");
  s.controllers[1].builtin = false;
  s.controllers[1].module = "/nonexistent/upright_nothing.so";
  BatchOptions options;
  options.run.trace_rate_hz = 0;
  std::size_t calls = 0;
  const BatchResult batch = RunBatch({s}, options, "test", [&](std::size_t done, std::size_t all) {
    ++calls;
    EXPECT_LE(done, all);
  });
  EXPECT_EQ(calls, 4u);
  ASSERT_EQ(batch.runs.size(), 4u);
  EXPECT_EQ(batch.runs[0].metrics.status, RunStatus::kOk);
  EXPECT_EQ(batch.runs[3].metrics.status, RunStatus::kSetupFailed);
  EXPECT_NE(batch.runs[3].metrics.message.find("/nonexistent/upright_nothing.so"),
            std::string::npos)
      << batch.runs[3].metrics.message;
  EXPECT_TRUE(batch.runs[0].trace.rows.empty());  // trace rate 0: no trace
}

}  // namespace
}  // namespace upright::runner
