// Sweeps end to end: the same files whatever the number of jobs and on a second run, sample i the
// same whatever N, survival counts that agree with the rows, and a module that will not load.
#include <gtest/gtest.h>

#include <limits>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

#include "run_test_support.hpp"
#include "upright/runner/sweep/sweep.hpp"
#include "upright/runner/sweep/sweep_writer.hpp"
#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {
namespace {

using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;

// Short runs: a knock whose size spreads from harmless to more than the courier takes, on a
// robot whose mass and tyre grip spread too.
const char* kShortSweep = R"(<scenario name="short-sweep" schema="1" duration_s="1.5">
  <description>Test: a knock of uncertain size on a parked courier.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.2" shape="impulse" peak_N="250" duration_s="0.06" height_m="0.55"/>
  </timeline>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>
  </controllers>
  <dispersions>
    <spread param="timeline/push[1].peak_N" kind="uniform" lo="50" hi="700"/>
    <spread param="robot/chassis.mass_kg" kind="normal" sd="2"/>
    <spread param="robot/wheels.friction" kind="uniform" lo="0.5" hi="0.9"/>
  </dispersions>
</scenario>)";

Result<SweepResult> TrySweep(const Scenario& scenario, int samples, int jobs) {
  SweepOptions options;
  options.samples = samples;
  options.seed = 20;
  options.jobs = jobs;
  return RunSweepSamples(scenario, options, "test", nullptr);
}

// The sweep of `scenario`; a test failure (and an exception ending the test) when it cannot run.
SweepResult Sweep(const Scenario& scenario, int samples, int jobs) {
  Result<SweepResult> swept = TrySweep(scenario, samples, jobs);
  EXPECT_TRUE(swept) << (swept ? "" : swept.error());
  return std::move(swept).value();
}

std::vector<std::string> Lines(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

std::vector<std::string> Fields(const std::string& line) {
  std::vector<std::string> fields;
  std::istringstream in(line);
  for (std::string field; std::getline(in, field, ',');) fields.push_back(field);
  return fields;
}

class SweepRun : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    scenario_ = new Scenario(ScenarioFromText(kShortSweep, "short-sweep.xml"));
    five_jobs1_ = new SweepResult(Sweep(*scenario_, 5, 1));
  }
  static void TearDownTestSuite() {
    delete five_jobs1_;
    delete scenario_;
  }
  static Scenario* scenario_;
  static SweepResult* five_jobs1_;
};
Scenario* SweepRun::scenario_ = nullptr;
SweepResult* SweepRun::five_jobs1_ = nullptr;

TEST_F(SweepRun, FilesAreByteIdenticalOnASecondRunWithTwoJobs) {
  const SweepResult again = Sweep(*scenario_, 5, 2);
  EXPECT_EQ(again.jobs, 2);
  const auto dir_a = ScratchDir("sweep-a"), dir_b = ScratchDir("sweep-b");
  const Status written_a = WriteSweepResults(dir_a.string(), *five_jobs1_);
  ASSERT_TRUE(written_a) << written_a.error();
  const Status written_b = WriteSweepResults(dir_b.string(), again);
  ASSERT_TRUE(written_b) << written_b.error();
  ASSERT_EQ(SweepFileNames().size(), 3u);  // sweep.csv, sweep.md, manifest.json
  for (const std::string& name : SweepFileNames()) {
    const std::string text = ReadFile(dir_a / name);
    EXPECT_FALSE(text.empty()) << name;
    if (name == "manifest.json") continue;  // wall time and the job count differ by design
    EXPECT_EQ(text, ReadFile(dir_b / name)) << name;
  }
  EXPECT_NE(ReadFile(dir_a / "manifest.json").find("\"samples\": 5"), std::string::npos);
}

// Sample i does not depend on how many samples were asked for.
TEST_F(SweepRun, SampleIIsTheSameWhateverTheNumberOfSamples) {
  const SweepResult three = Sweep(*scenario_, 3, 2);
  const std::vector<std::string> rows5 = Lines(SweepCsv(*five_jobs1_));
  const std::vector<std::string> rows3 = Lines(SweepCsv(three));
  ASSERT_EQ(rows5.size(), 1 + 5 * 2u);
  ASSERT_EQ(rows3.size(), 1 + 3 * 2u);
  for (std::size_t i = 0; i < rows3.size(); ++i) EXPECT_EQ(rows3[i], rows5[i]) << "row " << i;
}

// Survival counts, the paired table and the rows agree; every row carries its sample's draws.
TEST_F(SweepRun, CountsAgreeWithTheRows) {
  const SweepResult four = Sweep(*scenario_, 4, 0);
  const std::vector<std::string> rows = Lines(SweepCsv(four));
  ASSERT_EQ(rows.size(), 1 + 4 * 2u);
  const std::vector<std::string> header = Fields(rows[0]);
  ASSERT_GE(header.size(), 9u);
  EXPECT_EQ(header[0], "sample");
  EXPECT_EQ(header[3], "timeline/push[1].peak_N");
  EXPECT_EQ(header[4], "robot/chassis.mass_kg");
  EXPECT_EQ(header[5], "robot/wheels.friction");
  EXPECT_EQ(header[6], "status");
  EXPECT_EQ(header[7], "survived");
  EXPECT_EQ(header[8], "fall_time_s");
  std::size_t survived[2] = {0, 0};
  std::vector<bool> lqr_ok, pid_ok;
  for (std::size_t r = 1; r < rows.size(); ++r) {
    const std::vector<std::string> f = Fields(rows[r]);
    const std::size_t sample = (r - 1) / 2, c = (r - 1) % 2;
    EXPECT_EQ(f[0], std::to_string(sample));
    EXPECT_EQ(f[1], c == 0 ? "lqr" : "pid");
    EXPECT_EQ(f[2], std::to_string(sample + 1));                 // noise seed
    EXPECT_EQ(std::stod(f[3]), four.samples[sample].values[0]);  // exact: shortest round trip
    EXPECT_EQ(std::stod(f[4]), four.samples[sample].values[1]);
    EXPECT_EQ(f[7], f[6] == "ok" ? "true" : "false");
    survived[c] += f[7] == "true";
    (c == 0 ? lqr_ok : pid_ok).push_back(f[7] == "true");
  }
  EXPECT_EQ(CountSurvived(four, 0), survived[0]);
  EXPECT_EQ(CountSurvived(four, 1), survived[1]);
  const PairedCounts paired = PairWithBaseline(four, 1);
  std::size_t both = 0, only_lqr = 0, only_pid = 0, neither = 0;
  for (std::size_t i = 0; i < 4; ++i) {
    both += lqr_ok[i] && pid_ok[i];
    only_lqr += lqr_ok[i] && !pid_ok[i];
    only_pid += !lqr_ok[i] && pid_ok[i];
    neither += !lqr_ok[i] && !pid_ok[i];
  }
  EXPECT_EQ(paired.both, both);
  EXPECT_EQ(paired.only_baseline, only_lqr);
  EXPECT_EQ(paired.only_other, only_pid);
  EXPECT_EQ(paired.neither, neither);

  const std::string md = SweepMarkdown(four);
  EXPECT_NE(md.find("| lqr (baseline) | " + std::to_string(survived[0]) + "/4 |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| pid | " + std::to_string(survived[1]) + "/4 |"), std::string::npos) << md;
  EXPECT_NE(md.find("| pid | " + std::to_string(both) + " | " + std::to_string(only_lqr) + " | " +
                    std::to_string(only_pid) + " | " + std::to_string(neither) + " |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("tether or spotter"), std::string::npos);
}

// The draws reach the plant: a 50–700 N knock over 4 samples is not the same run four times.
TEST_F(SweepRun, SamplesDiffer) {
  const RunResult& a = five_jobs1_->run(0, 0);
  const RunResult& b = five_jobs1_->run(1, 0);
  EXPECT_NE(a.metrics.max_tilt_deg, b.metrics.max_tilt_deg);
}

TEST_F(SweepRun, AModuleThatWillNotLoadStopsTheSweep) {
  Scenario broken = *scenario_;
  broken.controllers[1].builtin = false;
  broken.controllers[1].module = "/nonexistent/upright_nothing.so";
  const Result<SweepResult> result = TrySweep(broken, 3, 1);
  ASSERT_FALSE(result);
  EXPECT_NE(result.error().find("controller 'pid': "), std::string::npos) << result.error();
}

// A sample that could not be drawn leaves runs that were never played: sweep.csv prints their
// status and message, survived false, and every figure empty whatever the metrics hold.
TEST(SweepCsv, RunsNotPlayedHaveEmptyFigures) {
  SweepResult result;
  result.scenario.name = "s";
  result.scenario.controllers = {"lqr"};
  result.scenario.baseline = "lqr";
  Dispersion spread;
  spread.param = "robot/chassis.mass_kg";
  result.dispersions = {spread};
  SweepSample sample;
  sample.noise_seed = 1;
  sample.values = {std::numeric_limits<double>::quiet_NaN()};
  sample.redraws = {100};
  sample.error = "no draw accepted";
  result.samples = {sample};
  RunResult run;
  run.scenario = "s";
  run.controller = "lqr";
  run.seed = 1;
  run.metrics.status = RunStatus::kSetupFailed;
  run.metrics.message = "no draw accepted";
  run.metrics.max_tilt_deg = 5;  // not a figure of a run that never ran
  run.metrics.energy_J = 2;
  result.runs = {run};
  const std::vector<std::string> rows = Lines(SweepCsv(result));
  ASSERT_EQ(rows.size(), 2u);
  EXPECT_EQ(rows[1], "0,lqr,1,,setup_failed,false," + std::string(MetricColumns().size(), ',') +
                         "no draw accepted");
}

}  // namespace
}  // namespace upright::runner
