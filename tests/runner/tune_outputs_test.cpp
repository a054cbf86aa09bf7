// What a tune leaves besides tune.csv: the held-out replays as results folders of their own (the
// default and the tuned settings on seeds the search never saw, with the scenario's baseline kept
// or, when it was not tuned, the first tuned controller), the ranking at their best in tune.md
// drawn from them, the manifest, and no stale replay folders once a tune runs without them.
#include <gtest/gtest.h>

#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "tables_test_support.hpp"
#include "tune_test_scenarios.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_writer.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using testing::Contains;
using testing::CsvRecords;
using testing::ReadFile;
using testing::ReadRecords;
using testing::ScenarioFromText;
using testing::ScratchDir;
using testing::ShoveText;

// pid, hinf and lqr in that order with hinf the baseline; lqr and pid tuned on one knob each
// (in that order), one search seed, held out on seeds 2 and 3.
TuneResult TuneWithUntunedBaseline() {
  const std::vector<Scenario> scenarios = {ScenarioFromText(ShoveText(
      R"(<controller name="pid" builtin="pid"/><controller name="hinf" builtin="hinf"/><controller name="lqr" builtin="lqr"/>)",
      "1", "hinf"))};
  const Result<TuneSpec> spec = ParseTuneText(R"(<tune schema="1">
  <controller name="lqr"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
  <controller name="pid"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
</tune>)",
                                              "t.xml");
  EXPECT_TRUE(Succeeded(spec));
  TuneOptions options;
  options.controllers = {"lqr", "pid"};
  options.budget_runs = 5;
  options.holdout_seeds = 2;
  const Result<TunePlan> plan = PlanTune(scenarios, options, *spec);
  EXPECT_TRUE(Succeeded(plan));
  return RunTune(scenarios, options, *plan, "test", {});
}

// The mean of `column` over the rows of `csv` for `controller`.
double MeanOf(const CsvRecords& csv, const std::string& controller, const std::string& column) {
  double sum = 0;
  int n = 0;
  for (const auto& row : csv.rows) {
    if (row.at("controller") != controller) continue;
    sum += std::stod(row.at(column));
    ++n;
  }
  EXPECT_GT(n, 0) << controller;
  return sum / n;
}

std::size_t ColumnIndex(const std::string& name) {
  const auto& columns = MetricColumns();
  for (std::size_t i = 0; i < columns.size(); ++i) {
    if (columns[i].name == name) return i;
  }
  ADD_FAILURE() << "no metric column " << name;
  return 0;
}

TEST(TuneOutputs, HeldOutReplaysAreResultsFoldersRankedAtTheirBest) {
  const TuneResult result = TuneWithUntunedBaseline();
  ASSERT_EQ(result.controllers.size(), 2u);
  const auto dir = ScratchDir("tune-outputs");
  ASSERT_TRUE(Succeeded(WriteTuneResults(dir.string(), result)));

  for (const char* folder : {kTunedFolder, kDefaultsFolder}) {
    const fs::path replay = dir / folder;
    // The scenario's order (pid before lqr), each on the held-out seeds, each traced.
    const CsvRecords summary = ReadRecords(replay / "summary.csv");
    ASSERT_EQ(summary.rows.size(), 4u) << folder;
    EXPECT_EQ(summary.rows[0].at("controller"), "pid");
    EXPECT_EQ(summary.rows[0].at("seed"), "2");
    EXPECT_EQ(summary.rows[1].at("seed"), "3");
    EXPECT_EQ(summary.rows[2].at("controller"), "lqr");
    // hinf, the scenario's baseline, was not tuned: the first tuned controller there stands in.
    EXPECT_EQ(summary.rows[0].at("baseline"), "true");
    EXPECT_EQ(summary.rows[2].at("baseline"), "false");
    EXPECT_TRUE(fs::is_regular_file(replay / "traces" / "shove__lqr__seed3.csv")) << folder;
    const nlohmann::json manifest = nlohmann::json::parse(ReadFile(replay / "manifest.json"));
    EXPECT_EQ(manifest["scenarios"][0]["baseline"], "pid");
    EXPECT_EQ(manifest["scenarios"][0]["seeds"], nlohmann::json({2, 3}));
    // The tables' figures are the held-out scores' runs: their means agree.
    const bool tuned = std::string(folder) == kTunedFolder;
    for (const ControllerTune& tune : result.controllers) {
      const EvaluationScore& score = tune.held_out.at(tuned ? 1 : 0).score;
      for (const char* metric : {"max_tilt_deg", "max_drift_m"}) {
        EXPECT_NEAR(MeanOf(summary, tune.controller, metric),
                    score.mean_metrics[ColumnIndex(metric)], 1e-5)
            << folder << " " << tune.controller << " " << metric;  // 6 digits in summary.csv
      }
    }
  }

  // tune.md ranks the tuned settings as tuned/ranking.csv does, with the defaults' rank beside.
  const std::string md = ReadFile(dir / "tune.md");
  // The tune file by its name alone: the table does not depend on where the file lies.
  EXPECT_TRUE(Contains(md, ", knobs and objective from t.xml.\n")) << md;
  const CsvRecords at_best = ReadRecords(dir / kTunedFolder / "ranking.csv");
  const CsvRecords as_designed = ReadRecords(dir / kDefaultsFolder / "ranking.csv");
  ASSERT_EQ(at_best.rows.size(), 2u);
  for (const auto& row : at_best.rows) {
    const std::string name = row.at("controller");
    const auto designed = as_designed.Find({{"controller", name}});
    const std::string cells = "| " + row.at("rank") + " | " + name + " | " + row.at("survived") +
                              "/" + row.at("runs") + " | ";
    ASSERT_TRUE(Contains(md, cells)) << cells << "\n" << md;
    const std::string rest = md.substr(md.find(cells));
    EXPECT_TRUE(Contains(rest.substr(0, rest.find('\n')), "| " + designed.at("rank") + " | " +
                                                              designed.at("survived") + "/" +
                                                              designed.at("runs") + " |"))
        << rest.substr(0, rest.find('\n'));
  }

  // The manifest says what was searched and which evaluation is each controller's tuned one.
  const nlohmann::json manifest = nlohmann::json::parse(ReadFile(dir / "manifest.json"));
  EXPECT_EQ(manifest["command"], "tune");
  EXPECT_EQ(manifest["scenarios"][0]["held_out_seeds"], nlohmann::json({2, 3}));
  EXPECT_EQ(manifest["tune_file"]["path"], "t.xml");
  EXPECT_EQ(manifest["objective"], "1 × max_tilt_deg + 10 × max_drift_m");
  for (std::size_t c = 0; c < 2; ++c) {
    EXPECT_EQ(manifest["controllers"][c]["name"], result.controllers[c].controller);
    EXPECT_EQ(manifest["controllers"][c]["best_evaluation"], result.controllers[c].best);
  }
}

TEST(TuneOutputs, WithoutHeldOutSeedsNoRankingAndNoStaleReplays) {
  TuneResult result = TuneWithUntunedBaseline();
  const auto dir = ScratchDir("tune-no-holdout");
  ASSERT_TRUE(Succeeded(WriteTuneResults(dir.string(), result)));
  ASSERT_TRUE(fs::is_directory(dir / kTunedFolder));
  // The same tune as if run with --holdout 0, written over it.
  result.plan.holdout_runs = 0;
  for (auto& seeds : result.plan.holdout_seeds) seeds.clear();
  for (ControllerTune& tune : result.controllers) tune.held_out.clear();
  ASSERT_TRUE(Succeeded(WriteTuneResults(dir.string(), result)));
  EXPECT_FALSE(fs::exists(dir / kTunedFolder));
  EXPECT_FALSE(fs::exists(dir / kDefaultsFolder));
  EXPECT_TRUE(
      Contains(ReadFile(dir / "tune.md"), "No held-out seeds (--holdout 0), so no ranking"));
}

}  // namespace
}  // namespace upright::runner
