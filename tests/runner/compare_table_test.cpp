// compare.csv and compare.md: the difference against a baseline near zero (the floors, at their
// edges), the paired verdict over seeds (the t-test against values from SciPy, too few pairs, no
// spread, a pair with a NaN, a run not played), survival by the exact McNemar test, and the legend.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tables_test_support.hpp"
#include "upright/runner/tables/metric_floors.hpp"

namespace upright::runner {
namespace {

using testing::CsvRecords;
using testing::MakeTableRun;
using testing::ReadRecords;
using testing::ReadText;
using testing::WriteTables;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Scenario `scenario`: "base" (the baseline) and "ctl" on seeds 1..n, both surviving, with
// `metric` set per seed from `base` and `ctl`.
void AddPairedRuns(BatchResult* batch, const std::string& scenario, const char* metric,
                   const std::vector<double>& base, const std::vector<double>& ctl) {
  for (std::size_t i = 0; i < base.size(); ++i) {
    batch->runs.push_back(
        MakeTableRun(scenario, "base", i + 1, true, RunStatus::kOk, {{metric, base[i]}}));
  }
  for (std::size_t i = 0; i < ctl.size(); ++i) {
    batch->runs.push_back(
        MakeTableRun(scenario, "ctl", i + 1, false, RunStatus::kOk, {{metric, ctl[i]}}));
  }
}

std::map<std::string, std::string> Row(const CsvRecords& csv, const std::string& scenario,
                                       const std::string& metric) {
  return csv.Find({{"scenario", scenario}, {"controller", "ctl"}, {"metric", metric}});
}

// Every figure compare judges has a floor in the column catalogue (a figure without one would get
// percentages of near-zero baselines again), in the figure's own unit.
TEST(MetricFloors, EveryJudgedFigureHasOneInItsUnit) {
  for (const MetricColumn& column : MetricColumns()) {
    if (column.compared) {
      EXPECT_GT(FloorOf(column.name).value, 0) << column.name;
    }
  }
  EXPECT_EQ(FloorOf("iae_tilt_deg_s").value, 0.1);  // deg·s, not the 0.05 s of a settling time
  EXPECT_STREQ(FloorOf("iae_tilt_deg_s").unit, "deg·s");
  EXPECT_EQ(FloorOf("tilt_settle_s").value, 0.05);
  EXPECT_EQ(FloorOf("slip_time_s").value, 0.01);
  EXPECT_EQ(FloorOf("effort_Nm2s").value, 1e-4);
  EXPECT_EQ(FloorOf("peak_torque_Nm").value, 0.01);
  EXPECT_EQ(FloorOf("max_drift_m").value, 0.01);
  EXPECT_EQ(FloorOf("saturation_pct").value, 0.1);
  EXPECT_STREQ(FloorOf("saturation_pct").unit, "%");
  EXPECT_EQ(FloorOf("tilt_rebound_pct").value, 5);  // a rebound within 5 % of its peak
  EXPECT_EQ(FloorOf("max_slip_ratio").value, 0.01);
  EXPECT_EQ(FloorOf("end_time_s").value, 0);  // not compared
  EXPECT_EQ(FloorOf("no_such_figure").value, 0);
}

// The floor of peak current is 0.1 A (common practice, metric_columns.cpp). Below it the
// difference is absolute, in A, with no percentage; at it and above, a percentage. One seed each,
// so each mean is its value exactly.
TEST(CompareTable, BelowTheFloorTheDifferenceIsAbsolute) {
  ASSERT_EQ(FloorOf("peak_current_A").value, 0.1);
  BatchResult batch;
  AddPairedRuns(&batch, "zero", "peak_current_A", {0}, {0.42});
  AddPairedRuns(&batch, "below", "peak_current_A", {0.0999}, {0.2});
  AddPairedRuns(&batch, "at", "peak_current_A", {0.1}, {0.2});
  AddPairedRuns(&batch, "above", "peak_current_A", {0.1001}, {0.2});
  const auto dir = WriteTables(batch, "floors");
  const CsvRecords csv = ReadRecords(dir / "compare.csv");

  auto zero = Row(csv, "zero", "peak_current_A");
  EXPECT_EQ(zero["floor"], "0.1");
  EXPECT_EQ(zero["diff_abs"], "0.42");
  EXPECT_EQ(zero["diff_pct"], "");  // was +inf or "n/a": no percentage of nothing
  auto below = Row(csv, "below", "peak_current_A");
  EXPECT_EQ(below["diff_abs"], "0.1001");
  EXPECT_EQ(below["diff_pct"], "");
  // Exactly at the floor: a percentage, (0.2 − 0.1) / 0.1 = 100 %.
  auto at = Row(csv, "at", "peak_current_A");
  EXPECT_EQ(at["diff_abs"], "0.1");
  EXPECT_EQ(at["diff_pct"], "100");
  // Just above: (0.2 − 0.1001) / 0.1001 = 99.8002 %.
  EXPECT_EQ(Row(csv, "above", "peak_current_A")["diff_pct"], "99.8002");

  const std::string md = ReadText(dir / "compare.md");
  EXPECT_NE(md.find("| peak current (A) | 0 | 0.420 | +0.420 A (abs.) |"), std::string::npos) << md;
  EXPECT_NE(md.find("| peak current (A) | 0.100 | 0.200 | +100 % |"), std::string::npos) << md;
  // The legend states every judged figure's floor.
  EXPECT_NE(md.find("Floors: "), std::string::npos) << md;
  EXPECT_NE(md.find("max tilt (deg) 0.1 deg"), std::string::npos) << md;
  EXPECT_NE(md.find("max drift (m) 0.01 m"), std::string::npos) << md;
  EXPECT_NE(md.find("peak current (A) 0.1 A"), std::string::npos) << md;
  EXPECT_NE(md.find("energy (J) 0.1 J"), std::string::npos) << md;
}

// Below the floor a difference counts only when it reaches the floor itself: 0.05 A more on every
// seed is certain (no spread) but too small to call worse; 0.42 A more is worse.
TEST(CompareTable, BelowTheFloorADifferenceCountsFromTheFloorOn) {
  BatchResult batch;
  AddPairedRuns(&batch, "tiny", "peak_current_A", {0, 0, 0}, {0.05, 0.05, 0.05});
  AddPairedRuns(&batch, "real", "peak_current_A", {0, 0, 0}, {0.42, 0.42, 0.42});
  const CsvRecords csv = ReadRecords(WriteTables(batch, "floor-verdict") / "compare.csv");
  auto tiny = Row(csv, "tiny", "peak_current_A");
  EXPECT_EQ(tiny["p_value"], "0");
  EXPECT_EQ(tiny["verdict"], "same");
  EXPECT_EQ(tiny["direction"], "same");
  auto real = Row(csv, "real", "peak_current_A");
  EXPECT_EQ(real["verdict"], "worse");
}

// The paired t-test over seeds, checked against SciPy 1.10.1's ttest_rel(controller, baseline):
//   /usr/bin/python3 -c "from scipy.stats import ttest_rel
//   print(ttest_rel([1.5,3.0,3.2],[2.0,4.0,3.5]))
//   print(ttest_rel([10.4,12.1,11.9,9.8,13.9,11.6,12.2],[10.0,12.5,11.0,9.0,13.5,10.5,12.0]))"
// gives t = -2.8823067684915675, p = 0.10224159750313042 and t = 2.54602493912652,
// p = 0.04372425242371249.
TEST(CompareTable, VerdictFollowsThePairedTestOverSeeds) {
  BatchResult batch;
  // 17 % lower tilt on average, but scattered: not shown at 5 %, so the same.
  AddPairedRuns(&batch, "scattered", "max_tilt_deg", {2.0, 4.0, 3.5}, {1.5, 3.0, 3.2});
  // Higher on 6 seeds of 7: worse at 5 %.
  AddPairedRuns(&batch, "shown", "max_tilt_deg", {10.0, 12.5, 11.0, 9.0, 13.5, 10.5, 12.0},
                {10.4, 12.1, 11.9, 9.8, 13.9, 11.6, 12.2});
  const CsvRecords csv = ReadRecords(WriteTables(batch, "paired") / "compare.csv");

  auto scattered = Row(csv, "scattered", "max_tilt_deg");
  EXPECT_EQ(scattered["test"], "paired t");
  EXPECT_EQ(scattered["pairs"], "3");
  EXPECT_NEAR(std::stod(scattered["mean_diff"]), -0.6, 1e-5);
  EXPECT_NEAR(std::stod(scattered["t"]), -2.8823067684915675, 1e-5);
  EXPECT_NEAR(std::stod(scattered["p_value"]), 0.10224159750313042, 1e-6);
  EXPECT_EQ(scattered["direction"], "better");
  EXPECT_EQ(scattered["verdict"], "same");

  auto shown = Row(csv, "shown", "max_tilt_deg");
  EXPECT_EQ(shown["pairs"], "7");
  EXPECT_NEAR(std::stod(shown["t"]), 2.54602493912652, 1e-5);
  EXPECT_NEAR(std::stod(shown["p_value"]), 0.04372425242371249, 1e-6);
  EXPECT_EQ(shown["verdict"], "worse");
  // Seven seeds: the spread is the standard deviation; the means and ranges are in the CSV.
  EXPECT_EQ(shown["baseline_n"], "7");
  EXPECT_EQ(shown["baseline_min"], "9");
  EXPECT_EQ(shown["baseline_max"], "13.5");
}

// With fewer than 3 pairs there is no test: the verdict is indicative and the direction a hint.
// A pair with a NaN, or with a run not played, is no pair.
TEST(CompareTable, TooFewPairsAreIndicative) {
  BatchResult batch;
  AddPairedRuns(&batch, "one", "max_tilt_deg", {2.0}, {1.0});
  AddPairedRuns(&batch, "two", "max_tilt_deg", {2.0, 3.0}, {1.0, 2.5});
  AddPairedRuns(&batch, "nan", "tilt_settle_s", {1.0, 1.5, 2.0}, {0.5, kNaN, 1.0});
  AddPairedRuns(&batch, "unplayed", "max_tilt_deg", {2.0, 3.0, 4.0}, {1.0, 99, 3.0});
  for (RunResult& run : batch.runs) {
    if (run.scenario == "unplayed" && run.controller == "ctl" && run.seed == 2) {
      run.metrics.status = RunStatus::kSetupFailed;  // its 99 is only what the struct holds
      run.steps = 0;
    }
  }
  const auto dir = WriteTables(batch, "few");
  const CsvRecords csv = ReadRecords(dir / "compare.csv");
  for (const char* scenario : {"one", "two", "unplayed"}) {
    auto row = Row(csv, scenario, "max_tilt_deg");
    EXPECT_EQ(row["verdict"], "indicative") << scenario;
    EXPECT_EQ(row["direction"], "better") << scenario;
    EXPECT_EQ(row["t"], "") << scenario;
    EXPECT_EQ(row["p_value"], "") << scenario;
  }
  EXPECT_EQ(Row(csv, "one", "max_tilt_deg")["pairs"], "1");
  EXPECT_EQ(Row(csv, "one", "max_tilt_deg")["mean_diff"], "-1");
  auto nan = Row(csv, "nan", "tilt_settle_s");
  EXPECT_EQ(nan["pairs"], "2");
  EXPECT_EQ(nan["verdict"], "indicative");
  EXPECT_EQ(nan["controller_n"], "2");
  EXPECT_EQ(nan["controller_skipped"], "1");
  EXPECT_EQ(nan["controller_mean"], "0.75");
  auto unplayed = Row(csv, "unplayed", "max_tilt_deg");
  EXPECT_EQ(unplayed["pairs"], "2");
  EXPECT_EQ(unplayed["controller_mean"], "2");  // (1 + 3) / 2: the 99 stays out
  EXPECT_EQ(unplayed["baseline_mean"], "3");    // (2 + 4) / 2: over the seeds both survived

  const std::string md = ReadText(dir / "compare.md");
  EXPECT_NE(md.find("? better (hint)"), std::string::npos) << md;
  EXPECT_NE(md.find("2 pairs, too few"), std::string::npos) << md;
  EXPECT_NE(md.find("| max tilt (deg) | 3.00 (2.00–4.00) | 2.00 (1.00–3.00) | -33.3 % |"),
            std::string::npos)
      << md;
}

// A settling time a run did not reach within the window is no value, so the paired test sees only
// the seeds both settled on. A controller that settles faster where it settles but never on two
// seeds the baseline settled on is not "better": the verdict is indicative, the test's direction a
// hint; the same the other way for "worse".
TEST(CompareTable, SeedsSettledOnOneSideOnlyWithholdTheVerdictTheyContradict) {
  BatchResult batch;
  AddPairedRuns(&batch, "unsettled_ctl", "tilt_settle_s", {1.0, 1.5, 2.0, 1.0, 1.5},
                {0.5, 1.0, 1.5, kNaN, kNaN});
  AddPairedRuns(&batch, "unsettled_base", "tilt_settle_s", {1.0, 1.5, 2.0, kNaN, kNaN},
                {2.0, 2.5, 3.0, 2.0, 2.5});
  AddPairedRuns(&batch, "agrees", "tilt_settle_s", {1.0, 1.5, 2.0, kNaN, kNaN},
                {0.5, 1.0, 1.5, 0.5, 1.0});
  const auto dir = WriteTables(batch, "one-sided");
  const CsvRecords csv = ReadRecords(dir / "compare.csv");
  auto ctl = Row(csv, "unsettled_ctl", "tilt_settle_s");
  EXPECT_EQ(ctl["pairs"], "3");
  EXPECT_EQ(ctl["p_value"], "0");  // -0.5 on each of the three: certain where both settled
  EXPECT_EQ(ctl["controller_skipped"], "2");
  EXPECT_EQ(ctl["direction"], "better");
  EXPECT_EQ(ctl["verdict"], "indicative");
  auto base = Row(csv, "unsettled_base", "tilt_settle_s");
  EXPECT_EQ(base["direction"], "worse");
  EXPECT_EQ(base["verdict"], "indicative");
  // Seeds settled by the controller alone agree with "better": it stands.
  EXPECT_EQ(Row(csv, "agrees", "tilt_settle_s")["verdict"], "better");
  const std::string md = ReadText(dir / "compare.md");
  EXPECT_NE(md.find("t = -inf, p = 0 (3 pairs); 2 seeds with a value on one side only | "
                    "? better (hint) |"),
            std::string::npos)
      << md;
}

// The same difference on every seed leaves no spread: a non-zero one is sure (t infinite, p 0),
// a zero one is none (p 1).
TEST(CompareTable, IdenticalDifferencesAreSureOrNone) {
  BatchResult batch;
  AddPairedRuns(&batch, "shift", "max_tilt_deg", {2.0, 3.0, 4.0}, {2.5, 3.5, 4.5});
  AddPairedRuns(&batch, "even", "max_tilt_deg", {2.0, 3.0, 4.0}, {2.0, 3.0, 4.0});
  const CsvRecords csv = ReadRecords(WriteTables(batch, "no-spread") / "compare.csv");
  auto shift = Row(csv, "shift", "max_tilt_deg");
  EXPECT_EQ(shift["t"], "inf");
  EXPECT_EQ(shift["p_value"], "0");
  EXPECT_EQ(shift["verdict"], "worse");
  auto even = Row(csv, "even", "max_tilt_deg");
  EXPECT_EQ(even["t"], "");
  EXPECT_EQ(even["p_value"], "1");
  EXPECT_EQ(even["verdict"], "same");
}

// A side without any value leaves nothing to compare: n/a, with no difference.
TEST(CompareTable, ASideWithoutValuesIsNotApplicable) {
  BatchResult batch;
  AddPairedRuns(&batch, "s", "tilt_settle_s", {1.0, 2.0, 3.0}, {kNaN, kNaN, kNaN});
  const auto dir = WriteTables(batch, "n-a");
  auto row = Row(ReadRecords(dir / "compare.csv"), "s", "tilt_settle_s");
  EXPECT_EQ(row["controller_n"], "0");
  EXPECT_EQ(row["controller_skipped"], "3");
  EXPECT_EQ(row["diff_abs"], "");
  EXPECT_EQ(row["pairs"], "0");
  EXPECT_EQ(row["direction"], "n/a");
  EXPECT_EQ(row["verdict"], "n/a");
  EXPECT_NE(ReadText(dir / "compare.md")
                .find("| tilt settle (s) | 2.00 (1.00–3.00) | — | — | — | — n/a |"),
            std::string::npos);
}

// Survival pairs the seeds both played and applies the exact McNemar test: with every pair
// discordant one way p = 2 · 2^−n (SciPy's binomtest gives 0.03125 for 0 of 6 and 0.25 for 0 of
// 3; see paired_tests_test.cpp), so 3 seeds can only hint.
TEST(CompareTable, SurvivalIsComparedByTheExactMcNemarTest) {
  BatchResult batch;
  for (const auto& [scenario, seeds] : {std::pair{"six", 6}, std::pair{"three", 3}}) {
    for (int seed = 1; seed <= seeds; ++seed) {
      batch.runs.push_back(MakeTableRun(scenario, "base", seed, true, RunStatus::kOk));
    }
    for (int seed = 1; seed <= seeds; ++seed) {
      batch.runs.push_back(MakeTableRun(scenario, "ctl", seed, false, RunStatus::kFell, {}, 400));
    }
  }
  const auto dir = WriteTables(batch, "survival");
  const CsvRecords csv = ReadRecords(dir / "compare.csv");
  auto six = Row(csv, "six", "survival_rate");
  EXPECT_EQ(six["test"], "McNemar exact");
  EXPECT_EQ(six["pairs"], "6");
  EXPECT_EQ(six["p_value"], "0.03125");
  EXPECT_EQ(six["diff_abs"], "-1");
  EXPECT_EQ(six["diff_pct"], "");  // a difference of rates, never a percentage of one
  EXPECT_EQ(six["verdict"], "worse");
  auto three = Row(csv, "three", "survival_rate");
  EXPECT_EQ(three["p_value"], "");  // too few pairs to test
  EXPECT_EQ(three["verdict"], "indicative");
  EXPECT_EQ(three["direction"], "worse");
  const std::string md = ReadText(dir / "compare.md");
  EXPECT_NE(
      md.find("| survival (%) | 100 | 0 | -100 pp | McNemar p = 0.0313 (6 pairs) | ✘ worse |"),
      std::string::npos)
      << md;
  EXPECT_NE(md.find("| survival (%) | 100 | 0 | -100 pp | 3 pairs, too few | ? worse (hint) |"),
            std::string::npos)
      << md;
}

// The legend states the test, its level, the minimum pairs, the practical threshold and the marks.
TEST(CompareTable, LegendStatesTheTestAndItsLimits) {
  BatchResult batch;
  AddPairedRuns(&batch, "s", "max_tilt_deg", {2.0, 3.0, 4.0}, {1.0, 2.0, 2.5});
  const std::string md = ReadText(WriteTables(batch, "legend") / "compare.md");
  for (const char* phrase :
       {"paired t-test, two-sided at 5 %", "fewer than 3 pairs", "0.5 % of the baseline mean",
        "exact McNemar test", "fewer than 6 pairs", "min–max up to 5 seeds", "✔ better and ✘ worse",
        "≈ same", "(hint)", "only one side has a value", "the verdict is withheld"}) {
    EXPECT_NE(md.find(phrase), std::string::npos) << phrase << "\n" << md;
  }
  // Three seeds: the spread is min–max, beside each mean.
  EXPECT_NE(md.find("| max tilt (deg) | 3.00 (2.00–4.00) | 1.83 (1.00–2.50) |"), std::string::npos)
      << md;
}

// A fall ends a run early, so its totals are not those of the same task: a controller falling on
// every seed at 1 s has a tenth of the IAE of one balancing for 8 s, and must not be called better
// for it. Figures are compared over the seeds both survived; survival weighs the falls.
TEST(CompareTable, FiguresAreComparedOverTheSeedsBothSurvived) {
  BatchResult batch;
  AddPairedRuns(&batch, "all_fell", "iae_tilt_deg_s", {8.0, 8.1, 8.2}, {0.8, 0.81, 0.82});
  AddPairedRuns(&batch, "one_fell", "iae_tilt_deg_s", {8.0, 8.1, 8.2, 8.3}, {0.5, 9.0, 9.1, 9.3});
  for (RunResult& run : batch.runs) {
    const bool falls = run.scenario == "all_fell" || run.seed == 1;
    if (run.controller == "ctl" && falls) run.metrics.status = RunStatus::kFell;
  }
  const auto dir = WriteTables(batch, "falls");
  const CsvRecords csv = ReadRecords(dir / "compare.csv");
  auto all = Row(csv, "all_fell", "iae_tilt_deg_s");
  EXPECT_EQ(all["verdict"], "n/a");
  EXPECT_EQ(all["pairs"], "0");
  EXPECT_EQ(all["controller_mean"], "");
  EXPECT_EQ(Row(csv, "all_fell", "survival_rate")["direction"], "worse");
  // Seeds 2–4: differences 0.9, 1.0, 1.0, all worse; the fall's 0.5 on seed 1 stays out.
  auto one = Row(csv, "one_fell", "iae_tilt_deg_s");
  EXPECT_EQ(one["pairs"], "3");
  EXPECT_EQ(one["baseline_mean"], "8.2");
  EXPECT_EQ(one["direction"], "worse");
  const std::string md = ReadText(dir / "compare.md");
  EXPECT_NE(md.find("| IAE tilt (deg·s) | — | — | — | no seed both survived | — n/a |"),
            std::string::npos)
      << md;
}

}  // namespace
}  // namespace upright::runner
