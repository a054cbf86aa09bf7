// ranking.csv and ranking.md: a controller scored on fewer scenarios than another is partial and
// ranked apart, after the others, whatever its survival and score; empty values left out of the
// scores are counted.
#include <gtest/gtest.h>

#include <string>

#include "tables_test_support.hpp"
#include "upright/runner/tables/ranking.hpp"

namespace upright::runner {
namespace {

using testing::CsvRecords;
using testing::MakeTableRun;
using testing::ReadRecords;
using testing::ReadText;
using testing::WriteTables;

// "easy": lqr (baseline) and pid, both surviving, pid with half the tilt; "hard": lqr alone,
// falling on one seed of two. pid survives everything it ran and scores best, but only on "easy".
BatchResult PartialBatch() {
  BatchResult batch;
  for (std::uint64_t seed : {1, 2}) {
    batch.runs.push_back(
        MakeTableRun("easy", "lqr", seed, true, RunStatus::kOk, {{"max_tilt_deg", 4}}));
  }
  for (std::uint64_t seed : {1, 2}) {
    batch.runs.push_back(
        MakeTableRun("easy", "pid", seed, false, RunStatus::kOk, {{"max_tilt_deg", 2}}));
  }
  batch.runs.push_back(MakeTableRun("hard", "lqr", 1, true, RunStatus::kOk, {{"max_tilt_deg", 6}}));
  batch.runs.push_back(
      MakeTableRun("hard", "lqr", 2, true, RunStatus::kFell, {{"max_tilt_deg", 40}}, 300));
  return batch;
}

TEST(RankingTable, AControllerScoredOnFewerScenariosIsRankedApart) {
  const auto dir = WriteTables(PartialBatch(), "partial");
  const CsvRecords csv = ReadRecords(dir / "ranking.csv");
  ASSERT_EQ(csv.rows.size(), 2u);
  // lqr survived 3 of 4, pid 2 of 2 with the better score: pid would lead, but it was scored on
  // one scenario of two, so it comes after.
  EXPECT_EQ(csv.rows[0].at("controller"), "lqr");
  EXPECT_EQ(csv.rows[0].at("rank"), "1");
  EXPECT_EQ(csv.rows[0].at("scenarios_scored"), "2");
  EXPECT_EQ(csv.rows[0].at("partial"), "false");
  EXPECT_EQ(csv.rows[1].at("controller"), "pid");
  EXPECT_EQ(csv.rows[1].at("rank"), "2");
  EXPECT_EQ(csv.rows[1].at("survival_rate"), "1");
  EXPECT_EQ(csv.rows[1].at("scenarios_scored"), "1");
  EXPECT_EQ(csv.rows[1].at("partial"), "true");

  const std::string md = ReadText(dir / "ranking.md");
  EXPECT_NE(md.find("is partial: it is ranked apart, after every controller scored on that many"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| 2 | pid | 2/2 |"), std::string::npos) << md;
  EXPECT_NE(md.find("| 1 of 2 (partial, ranked apart) |"), std::string::npos) << md;
  EXPECT_NE(md.find("| 2 of 2 |"), std::string::npos) << md;
}

// The standings other tables quote (a tune's ranking at their best) are ranking.csv's rows.
TEST(RankingTable, StandingsAreTheRankingRows) {
  const BatchResult batch = PartialBatch();
  const std::vector<ControllerStanding> standings = RankBatch(batch);
  const CsvRecords csv = ReadRecords(WriteTables(batch, "standings") / "ranking.csv");
  ASSERT_EQ(standings.size(), csv.rows.size());
  for (std::size_t i = 0; i < standings.size(); ++i) {
    EXPECT_EQ(standings[i].name, csv.rows[i].at("controller"));
    EXPECT_EQ(std::to_string(standings[i].rank), csv.rows[i].at("rank"));
    EXPECT_EQ(std::to_string(standings[i].survived), csv.rows[i].at("survived"));
    EXPECT_EQ(std::to_string(standings[i].runs), csv.rows[i].at("runs"));
    EXPECT_EQ(standings[i].partial ? "true" : "false", csv.rows[i].at("partial"));
  }
  EXPECT_EQ(standings[0].survived, 3);  // lqr: 3 of 4
  EXPECT_TRUE(standings[1].partial);    // pid: one scenario of two
}

// A run not played counts as not survived and its figures stay out of the score; the values left
// out are counted: here that run's max tilt, the only ranked figure any run has a positive mean
// for (a figure without one is left out for every controller, and not counted).
TEST(RankingTable, CountsTheValuesItsScoresLeftOut) {
  BatchResult batch = PartialBatch();
  batch.runs.push_back(
      MakeTableRun("easy", "pid", 3, false, RunStatus::kSetupFailed, {{"max_tilt_deg", 1}}, 0));
  const CsvRecords csv = ReadRecords(WriteTables(batch, "skipped") / "ranking.csv");
  const auto pid = csv.Find({{"controller", "pid"}});
  EXPECT_EQ(pid.at("survived"), "2");
  EXPECT_EQ(pid.at("runs"), "3");
  const auto lqr = csv.Find({{"controller", "lqr"}});
  EXPECT_EQ(pid.at("values_skipped"), "1");
  EXPECT_EQ(lqr.at("values_skipped"), "0");
}

}  // namespace
}  // namespace upright::runner
