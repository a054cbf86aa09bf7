// A batch: the same tables whatever the number of jobs, runs in a fixed order, a missing module
// turned into failed rows rather than a crashed batch.
#include "upright/runner/run/batch.hpp"

#include <gtest/gtest.h>

#include "run_test_support.hpp"
#include "upright/runner/tables/results_writer.hpp"

namespace upright::runner {
namespace {

using testing::ReadFile;
using testing::RunWithOneJobAndTwo;
using testing::ScenarioFromText;
using testing::TwoControllersText;

TEST(Batch, TablesAreByteIdenticalWithOneJobOrTwo) {
  BatchOptions options;
  options.run.trace_rate_hz = 20;
  const testing::OneJobAndTwo both =
      RunWithOneJobAndTwo({ScenarioFromText(TwoControllersText(), "two.xml")}, options, "batch");
  ASSERT_EQ(both.one.runs.size(), 4u);
  ASSERT_EQ(both.two.runs.size(), 4u);
  EXPECT_EQ(both.two.jobs, 2);
  // Scenario order, then controller order, then seed order.
  EXPECT_EQ(both.one.runs[0].controller, "lqr");
  EXPECT_EQ(both.one.runs[1].seed, 2u);
  EXPECT_EQ(both.one.runs[2].controller, "pid");
  EXPECT_TRUE(both.one.runs[2].baseline);

  for (const auto& name : ResultFileNames()) {
    if (name == "manifest.json") continue;  // wall times and the job count differ by design
    const std::string text = ReadFile(both.dir_one / name);
    EXPECT_FALSE(text.empty()) << name;
    EXPECT_EQ(text, ReadFile(both.dir_two / name)) << name;
  }
  for (const auto& run : both.one.runs) {
    const auto trace = std::filesystem::path("traces") / TraceFileName(run);
    EXPECT_EQ(ReadFile(both.dir_one / trace), ReadFile(both.dir_two / trace)) << trace;
  }
}

TEST(Batch, SeedCountOverridesTheFilesSeeds) {
  const std::vector<Scenario> scenarios{ScenarioFromText(TwoControllersText(), "two.xml")};
  BatchOptions options;
  options.seed_count = 3;
  EXPECT_EQ(CountRuns(scenarios, options), 6u);
}

TEST(Batch, AMissingModuleFileGivesFailedRowsAndTheRestRun) {
  Scenario s = ScenarioFromText(TwoControllersText(), "two.xml");
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
