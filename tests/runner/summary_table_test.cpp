// summary.csv and summary.md with runs that were never played (set-up failed, not run, a fault
// before the first step): empty figures whatever the metrics hold, means that skip them and say
// so, the spread beside each mean, every figure of the catalogue listed, yes/no cells spelled
// true/false.
#include <gtest/gtest.h>

#include <string>

#include "tables_test_support.hpp"

namespace upright::runner {
namespace {

using testing::CsvRecords;
using testing::MakeTableRun;
using testing::ReadRecords;
using testing::ReadText;
using testing::WriteTables;

// Scenario "s": "a" (baseline) survives seeds 1 and 2 while its seed 3 fails to set up; "b" plays
// seed 1, faults before its first step on seed 2 and is not run on seed 3. The unplayed runs hold
// figures (7, 8, 9) a table must not show: only what a fresh RunMetrics might carry.
BatchResult BatchWithUnplayedRuns() {
  BatchResult batch;
  batch.runs.push_back(MakeTableRun("s", "a", 1, true, RunStatus::kOk,
                                    {{"max_tilt_deg", 2}, {"max_drift_m", 0.25}}));
  batch.runs.push_back(MakeTableRun("s", "a", 2, true, RunStatus::kOk,
                                    {{"max_tilt_deg", 4}, {"max_drift_m", 0.75}}));
  batch.runs.push_back(MakeTableRun("s", "a", 3, true, RunStatus::kSetupFailed,
                                    {{"max_tilt_deg", 7}, {"max_drift_m", 7}}, 0));
  batch.runs.push_back(MakeTableRun("s", "b", 1, false, RunStatus::kFell,
                                    {{"max_tilt_deg", 30}, {"fall_time_s", 0.5}}, 500));
  batch.runs.push_back(
      MakeTableRun("s", "b", 2, false, RunStatus::kControllerFault, {{"max_tilt_deg", 8}}, 0));
  batch.runs.push_back(
      MakeTableRun("s", "b", 3, false, RunStatus::kNotRun, {{"max_tilt_deg", 9}}, 0));
  return batch;
}

TEST(SummaryTable, RunsNotPlayedHaveEmptyFiguresInSummaryCsv) {
  const CsvRecords csv =
      ReadRecords(WriteTables(BatchWithUnplayedRuns(), "unplayed") / "summary.csv");
  ASSERT_EQ(csv.rows.size(), 6u);
  for (const auto& [controller, seed] : {std::pair{"a", "3"}, {"b", "2"}, {"b", "3"}}) {
    const auto row = csv.Find({{"controller", controller}, {"seed", seed}});
    for (const MetricColumn& column : MetricColumns()) {
      EXPECT_EQ(row.at(column.name), "") << controller << " seed " << seed << " " << column.name;
    }
    EXPECT_EQ(row.at("survived"), "false");
  }
  const auto failed = csv.Find({{"controller", "a"}, {"seed", "3"}});
  EXPECT_EQ(failed.at("status"), "setup_failed");
  EXPECT_EQ(failed.at("baseline"), "true");
  // Played runs keep their figures, a fall on its first steps included.
  const auto played = csv.Find({{"controller", "a"}, {"seed", "1"}});
  EXPECT_EQ(played.at("max_tilt_deg"), "2");
  EXPECT_EQ(played.at("survived"), "true");
  const auto fell = csv.Find({{"controller", "b"}, {"seed", "1"}});
  EXPECT_EQ(fell.at("max_tilt_deg"), "30");
  EXPECT_EQ(fell.at("fall_time_s"), "0.5");
  EXPECT_EQ(fell.at("baseline"), "false");
}

TEST(SummaryTable, MeansSkipRunsNotPlayedAndSaySo) {
  const std::string md =
      ReadText(WriteTables(BatchWithUnplayedRuns(), "unplayed-md") / "summary.md");
  EXPECT_NE(md.find("| figure | a (baseline) | b |"), std::string::npos) << md;
  EXPECT_NE(md.find("| survived | 2/3 (1 not played) | 0/3 (2 not played) |"), std::string::npos)
      << md;
  // (2 + 4) / 2 with its min–max, 2 of 3 runs; b's one played run alone.
  EXPECT_NE(md.find("| max tilt (deg) | 3.00 (2.00–4.00) [2 of 3] | 30.0 [1 of 3] |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("[k of n]: the mean of the k runs with a value out of the n runs"),
            std::string::npos)
      << md;
}

// Every figure of the catalogue has its row, so nothing is only in summary.csv without a word.
TEST(SummaryTable, ListsEveryFigureOfTheCatalogue) {
  const std::string md = ReadText(WriteTables(BatchWithUnplayedRuns(), "every") / "summary.md");
  for (const MetricColumn& column : MetricColumns()) {
    EXPECT_NE(md.find(std::string("| ") + column.label + " |"), std::string::npos) << column.name;
  }
  EXPECT_NE(md.find("Each run's own figures are in summary.csv"), std::string::npos);
}

// Up to 5 seeds the spread is min–max; above, ± the standard deviation (n − 1): for 2, 4, 4, 4, 5,
// 5, 7, 9 the mean is 5 and the sample standard deviation √(32 / 7) = 2.138 (hand-computed).
TEST(SummaryTable, SpreadIsAStandardDeviationAboveFiveSeeds) {
  BatchResult batch;
  const double tilts[] = {2, 4, 4, 4, 5, 5, 7, 9};
  for (std::uint64_t seed = 1; seed <= 8; ++seed) {
    batch.runs.push_back(
        MakeTableRun("s", "a", seed, true, RunStatus::kOk, {{"max_tilt_deg", tilts[seed - 1]}}));
  }
  const std::string md = ReadText(WriteTables(batch, "sd") / "summary.md");
  EXPECT_NE(md.find("| max tilt (deg) | 5.00 ± 2.14 |"), std::string::npos) << md;
  EXPECT_NE(md.find("spread: ± standard deviation"), std::string::npos) << md;
}

// Values alike at the 3 digits shown have no spread to show, as a range or as a standard
// deviation: "11.2", not "11.2 (11.2–11.2)" nor "11.2 ± 8.94e-05".
TEST(SummaryTable, ValuesAlikeAtThreeDigitsShowNoSpread) {
  BatchResult batch;
  const double tilts[] = {11.2001, 11.2002, 11.2003, 11.2001, 11.2002, 11.2003};
  for (std::uint64_t seed = 1; seed <= 6; ++seed) {
    batch.runs.push_back(
        MakeTableRun("six", "a", seed, true, RunStatus::kOk, {{"max_tilt_deg", tilts[seed - 1]}}));
  }
  for (std::uint64_t seed = 1; seed <= 3; ++seed) {
    batch.runs.push_back(MakeTableRun("three", "a", seed, true, RunStatus::kOk,
                                      {{"max_tilt_deg", tilts[seed - 1]}}));
  }
  const std::string md = ReadText(WriteTables(batch, "alike") / "summary.md");
  EXPECT_NE(md.find("spread: ± standard deviation"), std::string::npos) << md;
  EXPECT_NE(md.find("spread: min–max"), std::string::npos) << md;
  std::size_t rows = 0;
  for (auto at = md.find("| max tilt (deg) | 11.2 |\n"); at != std::string::npos;
       at = md.find("| max tilt (deg) | 11.2 |\n", at + 1)) {
    ++rows;
  }
  EXPECT_EQ(rows, 2u) << md;
}

}  // namespace
}  // namespace upright::runner
