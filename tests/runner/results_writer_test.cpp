#include "upright/runner/tables/results_writer.hpp"

#include <gtest/gtest.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "tables_test_support.hpp"
#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The figures a test run sets; the rest take fixed values (see MakeRun). Values are invented demo
// data, chosen as binary fractions so means come out exact.
struct Figures {
  double tilt_deg, drift_m, tilt_settle_s, drift_settle_s, rms_tilt_deg, effort, current_A,
      saturation, energy_J;
};

RunResult MakeRun(const std::string& scenario, const std::string& controller, std::uint64_t seed,
                  bool baseline, RunStatus status, const Figures& f) {
  RunResult run;
  run.scenario = scenario;
  run.controller = controller;
  run.seed = seed;
  run.baseline = baseline;
  RunMetrics& m = run.metrics;
  m.status = status;
  m.message = status == RunStatus::kOk ? "survived" : "fell";
  m.end_time_s = 5;
  m.max_tilt_deg = f.tilt_deg;
  m.max_drift_m = f.drift_m;
  m.tilt_settle_s = f.tilt_settle_s;
  m.drift_settle_s = f.drift_settle_s;
  m.tilt_rebound_deg = 1;
  m.tilt_rebound_pct = 10;
  m.rms_tilt_deg = f.rms_tilt_deg;
  m.iae_tilt_deg_s = 1;
  m.effort_Nm2s = f.effort;
  m.peak_torque_Nm = 2;
  m.peak_current_A = f.current_A;
  m.saturation_pct = 100 * f.saturation;
  m.command_limit_pct = 0;
  m.max_slip_ratio = 0;
  m.slip_time_s = 0;
  m.energy_J = f.energy_J;
  run.steps = 5000;
  run.wall_s = 0.25;
  return run;
}

ScenarioInfo MakeInfo(const std::string& name, std::vector<std::string> controllers) {
  ScenarioInfo info;
  info.name = name;
  info.path = "scenarios/" + name + ".xml";
  info.sha256 = std::string(64, 'a');
  info.model_name = "demo_bot";
  info.model_path = "models/demo_bot.xml";
  info.model_sha256 = std::string(64, 'b');
  info.dt_s = 0.001;
  info.duration_s = 5;
  info.controllers = std::move(controllers);
  info.baseline = "lqr";
  info.seeds = {1, 2};
  return info;
}

// Two scenarios; "ramp" runs lqr (baseline), hinf and pid, "shove" runs lqr and hinf; seeds 1, 2.
// pid falls on ramp seed 1; hinf's drift does not settle on ramp seed 1; ramp/lqr/seed 1 has a
// trace with marks.
BatchResult MakeBatch() {
  BatchResult batch;
  batch.tool_version = "0.1.0-test";
  batch.jobs = 2;
  batch.trace_rate_hz = 100;
  batch.wall_s = 1.5;
  batch.scenarios = {MakeInfo("ramp", {"lqr", "hinf", "pid"}), MakeInfo("shove", {"lqr", "hinf"})};

  const RunStatus ok = RunStatus::kOk;
  //                         tilt  drift  t_set d_set  rms    effort cur   sat     energy
  batch.runs.push_back(MakeRun("ramp", "lqr", 1, true, ok, {2, 0.125, 1, 2, 0.5, 10, 4, 0, 20}));
  batch.runs.push_back(
      MakeRun("ramp", "lqr", 2, true, ok, {4, 0.375, 2, 3, 0.75, 14, 6, 0.125, 24}));
  batch.runs.push_back(
      MakeRun("ramp", "hinf", 1, false, ok, {1.5, 0.25, 1, kNaN, 0.5, 15, 5, 0.0625, 25}));
  batch.runs.push_back(
      MakeRun("ramp", "hinf", 2, false, ok, {1.5, 0.25, 1, 4, 0.5, 15, 5.02, 0.0625, 25}));
  batch.runs.push_back(MakeRun("ramp", "pid", 1, false, RunStatus::kFell,
                               {45, 0.75, kNaN, kNaN, 10, 30, 12, 0.375, 30}));
  batch.runs.push_back(MakeRun("ramp", "pid", 2, false, ok, {6, 0.5, 3, 3, 1, 20, 8, 0.125, 26}));
  for (std::uint64_t seed : {1, 2}) {
    batch.runs.push_back(MakeRun("shove", "lqr", seed, true, ok, {2, 0.5, 1, 2, 0.5, 8, 4, 0, 16}));
  }
  for (std::uint64_t seed : {1, 2}) {
    batch.runs.push_back(
        MakeRun("shove", "hinf", seed, false, ok, {3, 0.5, 1, 2, 0.5, 8, 4, 0, 16}));
  }
  for (RunResult& run : batch.runs) {
    if (run.controller == "hinf") {  // never applies
      run.metrics.tilt_rebound_deg = kNaN;
      run.metrics.tilt_rebound_pct = kNaN;
    }
  }

  RunResult& fell = batch.runs[4];
  fell.metrics.fall_time_s = 3.25;
  fell.metrics.end_time_s = 3.25;
  fell.metrics.message = "tilt 45.2 deg, \"hard\" fall\nat 3.25 s";
  for (std::uint64_t i : {4, 5}) {
    batch.runs[i].metrics.max_slip_ratio = 0.5;
    batch.runs[i].metrics.slip_time_s = 0.25;
  }

  Trace& trace = batch.runs[0].trace;
  trace.rate_hz = 100;
  for (int i = 0; i < 4; ++i) {
    TraceRow row;
    row.time_s = 0.01 * i;
    row.pitch_deg = 1.23456789 * i;
    row.payload_x_m = -0.5;
    trace.rows.push_back(row);
  }
  trace.rows[2].speed_m_s = kNaN;
  trace.marks = {
      {0.0, "start"}, {0.015, "push 120 N, \"half-sine\""}, {0.015, "second"}, {0.5, "fall"}};
  return batch;
}

std::string Read(const fs::path& path) {
  std::ifstream file(path, std::ios::binary);
  std::stringstream text;
  text << file.rdbuf();
  return text.str();
}

std::vector<std::string> Lines(const std::string& text) {
  std::vector<std::string> lines;
  std::stringstream stream(text);
  std::string line;
  while (std::getline(stream, line)) lines.push_back(line);
  return lines;
}

// The compare.csv record for (scenario, controller, metric), or "" when missing.
std::string CompareRecord(const std::string& csv, const std::string& scenario,
                          const std::string& controller, const std::string& metric) {
  for (const std::string& line : Lines(csv)) {
    const std::vector<std::string> cells = testing::SplitRecord(line);
    if (cells.size() >= 4 && cells[0] == scenario && cells[2] == controller && cells[3] == metric) {
      return line;
    }
  }
  return "";
}

class ResultsWriter : public ::testing::Test {
 protected:
  void SetUp() override {
    root_ =
        fs::temp_directory_path() / ("upright_results_writer_test_" + std::to_string(::getpid()));
    fs::remove_all(root_);
  }
  void TearDown() override { fs::remove_all(root_); }

  // Writes `batch` into root_/name and returns the folder.
  fs::path WriteInto(const std::string& name, const BatchResult& batch) {
    const fs::path dir = root_ / name / "nested";
    const Status written = WriteResults(dir.string(), batch);
    EXPECT_TRUE(written) << written.error();
    return dir;
  }

  fs::path root_;
};

TEST_F(ResultsWriter, WritesEveryFileAndNoTemporary) {
  const fs::path dir = WriteInto("a", MakeBatch());
  for (const std::string& name : ResultFileNames()) {
    EXPECT_TRUE(fs::is_regular_file(dir / name)) << name;
  }
  EXPECT_EQ(ResultFileNames().size(), 7u);
  EXPECT_TRUE(fs::is_regular_file(dir / "traces" / "ramp__lqr__seed1.csv"));
  int traces = 0;
  for (const auto& entry : fs::recursive_directory_iterator(dir)) {
    EXPECT_EQ(entry.path().filename().string().find(".tmp."), std::string::npos) << entry.path();
    if (entry.path().parent_path().filename() == "traces") ++traces;
  }
  EXPECT_EQ(traces, 1);  // only the run with a trace rate
}

TEST_F(ResultsWriter, SummaryCsvHasOneRowPerRunWithExactCells) {
  const std::string csv = Read(WriteInto("a", MakeBatch()) / "summary.csv");
  const std::vector<std::string> lines = Lines(csv);
  EXPECT_EQ(lines[0],
            "scenario,controller,seed,baseline,status,survived,fall_time_s,max_tilt_deg,"
            "max_drift_m,tilt_settle_s,drift_settle_s,tilt_rebound_deg,tilt_rebound_pct,"
            "rms_tilt_deg,iae_tilt_deg_s,effort_Nm2s,peak_torque_Nm,peak_current_A,"
            "saturation_pct,command_limit_pct,max_slip_ratio,slip_time_s,energy_J,end_time_s,"
            "message");
  EXPECT_EQ(lines[1],
            "ramp,lqr,1,true,ok,true,,2,0.125,1,2,1,10,0.5,1,10,2,4,0,0,0,0,20,5,survived");
  // hinf seed 1: the unsettled drift and the inapplicable rebound are empty fields.
  EXPECT_EQ(lines[3],
            "ramp,hinf,1,false,ok,true,,1.5,0.25,1,,,,0.5,1,15,2,5,6.25,0,0,0,25,5,survived");
  // The fall: status, survived false, fall time; the message quoted per RFC 4180 (comma, doubled
  // quotes, a line break inside the quotes), so this record spans two lines.
  EXPECT_EQ(lines[5] + "\n" + lines[6],
            "ramp,pid,1,false,fell,false,3.25,45,0.75,,,1,10,10,1,30,2,12,37.5,0,0.5,0.25,30,3.25,"
            "\"tilt 45.2 deg, \"\"hard\"\" fall\nat 3.25 s\"");
  EXPECT_EQ(lines[11], "shove,hinf,2,false,ok,true,,3,0.5,1,2,,,0.5,1,8,2,4,0,0,0,0,16,5,survived");
  EXPECT_EQ(lines.size(), 12u);  // header + 10 runs, one of them on two lines
}

TEST_F(ResultsWriter, NumbersUseSixSignificantDigitsWithoutLocale) {
  BatchResult batch = MakeBatch();
  batch.runs[1].metrics.max_tilt_deg = 3.14159265358979;
  batch.runs[1].metrics.energy_J = 1234567.89;
  batch.runs[1].metrics.effort_Nm2s = 0.000012345678;
  batch.runs[1].metrics.peak_torque_Nm = -0.0;
  const std::vector<std::string> cells =
      testing::SplitRecord(Lines(Read(WriteInto("a", batch) / "summary.csv"))[2]);
  // printf("%.6g") of each value (C standard §7.21.6.1, the g conversion).
  EXPECT_EQ(cells[7], "3.14159");
  EXPECT_EQ(cells[22], "1.23457e+06");
  EXPECT_EQ(cells[15], "1.23457e-05");
  EXPECT_EQ(cells[16], "0");
}

TEST_F(ResultsWriter, SummaryMarkdownShowsMeansOverSeeds) {
  const std::string md = Read(WriteInto("a", MakeBatch()) / "summary.md");
  EXPECT_NE(md.find("## ramp\n\nRobot: demo_bot · baseline: lqr · seeds: 1, 2 · spread: min–max\n"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| figure | lqr (baseline) | hinf | pid |"), std::string::npos) << md;
  // pid fell in seed 1: 1/2 survived.
  EXPECT_NE(md.find("| survived | 2/2 | 2/2 | 1/2 |"), std::string::npos) << md;
  // Means of the two seeds, 3 significant digits, with their min–max: tilt (2+4)/2, ...; hinf's
  // two equal values have no spread to show.
  EXPECT_NE(md.find("| max tilt (deg) | 3.00 (2.00–4.00) | 1.50 | 25.5 (6.00–45.0) |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| max drift (m) | 0.250 (0.125–0.375) | 0.250 | 0.625 (0.500–0.750) |"),
            std::string::npos)
      << md;
  // hinf's drift settled in one seed of two, pid's in the seed it did not fall: that seed's time,
  // marked as the mean of 1 of 2 runs.
  EXPECT_NE(md.find("| drift settle (s) | 2.50 (2.00–3.00) | 4.00 [1 of 2] | 3.00 [1 of 2] |"),
            std::string::npos)
      << md;
  EXPECT_NE(
      md.find("| peak current (A) | 5.00 (4.00–6.00) | 5.01 (5.00–5.02) | 10.0 (8.00–12.0) |"),
      std::string::npos)
      << md;
  EXPECT_NE(md.find("| energy (J) | 22.0 (20.0–24.0) | 25.0 | 28.0 (26.0–30.0) |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("— : no run gave a value"), std::string::npos);
  EXPECT_NE(md.find("[k of n]: the mean of the k runs with a value"), std::string::npos);
}

// The compare.csv cell of `column` for (scenario, controller, metric); "?" when there is no such
// record or column.
std::string CompareCell(const std::string& csv, const std::string& scenario,
                        const std::string& controller, const std::string& metric,
                        const std::string& column) {
  const std::vector<std::string> header = testing::SplitRecord(Lines(csv)[0]);
  const auto at = std::find(header.begin(), header.end(), column);
  const std::string record = CompareRecord(csv, scenario, controller, metric);
  if (at == header.end() || record.empty()) return "?";
  const std::vector<std::string> cells = testing::SplitRecord(record);
  const auto index = static_cast<std::size_t>(at - header.begin());
  return index < cells.size() ? cells[index] : "?";
}

TEST_F(ResultsWriter, ComparePercentagesAndVerdictsAgainstBaseline) {
  const std::string csv = Read(WriteInto("a", MakeBatch()) / "compare.csv");
  EXPECT_EQ(Lines(csv)[0],
            "scenario,baseline,controller,metric,better_when,floor,baseline_n,baseline_skipped,"
            "baseline_mean,baseline_min,baseline_max,baseline_sd,controller_n,controller_skipped,"
            "controller_mean,controller_min,controller_max,controller_sd,diff_abs,diff_pct,test,"
            "pairs,mean_diff,t,p_value,direction,verdict");
  const auto cells = [&](const std::string& scenario, const std::string& controller,
                         const std::string& metric) {
    std::string text;
    for (const char* column : {"baseline_mean", "controller_mean", "diff_abs", "diff_pct", "pairs",
                               "direction", "verdict"}) {
      if (!text.empty()) text += ',';
      text += CompareCell(csv, scenario, controller, metric, column);
    }
    return text;
  };
  // Worked by hand from the means: (c − b) / |b| · 100. Two seeds give two pairs, too few for
  // the paired test: every verdict is indicative, the direction a hint.
  // (1.5 − 3) / 3 = −50 %: lower tilt is better.
  EXPECT_EQ(cells("ramp", "hinf", "max_tilt_deg"), "3,1.5,-1.5,-50,2,better,indicative");
  // (1 − 1.5) / 1.5 = −33.333 %.
  EXPECT_EQ(cells("ramp", "hinf", "tilt_settle_s"), "1.5,1,-0.5,-33.3333,2,better,indicative");
  // Mean over the settled seed only: (4 − 2.5) / 2.5 = +60 %, one pair.
  EXPECT_EQ(cells("ramp", "hinf", "drift_settle_s"), "2.5,4,1.5,60,1,worse,indicative");
  EXPECT_EQ(CompareCell(csv, "ramp", "hinf", "drift_settle_s", "controller_skipped"), "1");
  // (25 − 22) / 22 = +13.636 %.
  EXPECT_EQ(cells("ramp", "hinf", "energy_J"), "22,25,3,13.6364,2,worse,indicative");
  // (5.01 − 5) / 5 = +0.2 %: inside the 0.5 % band, so the same way.
  EXPECT_EQ(cells("ramp", "hinf", "peak_current_A"), "5,5.01,0.01,0.2,2,same,indicative");
  // Exactly equal means.
  EXPECT_EQ(cells("ramp", "hinf", "max_drift_m"), "0.25,0.25,0,0,2,same,indicative");
  // A zero baseline is below the slip ratio's floor (0.01): the difference is absolute. pid fell
  // on seed 1, so its figures are compared on seed 2 alone.
  EXPECT_EQ(cells("ramp", "pid", "max_slip_ratio"), "0,0.5,0.5,,1,worse,indicative");
  // Survival is better when higher, compared as a difference of rates: 0.5 − 1.
  EXPECT_EQ(cells("ramp", "pid", "survival_rate"), "1,0.5,-0.5,,2,worse,indicative");
  // (3 − 2) / 2 = +50 % in the other scenario.
  EXPECT_EQ(cells("shove", "hinf", "max_tilt_deg"), "2,3,1,50,2,worse,indicative");
  // The baseline is not compared with itself, and pid did not run in shove.
  EXPECT_EQ(CompareRecord(csv, "ramp", "lqr", "max_tilt_deg"), "");
  EXPECT_EQ(CompareRecord(csv, "shove", "pid", "max_tilt_deg"), "");
  // 2 comparisons in ramp + 1 in shove, each survival + every judged figure, + header.
  std::size_t judged = 0;
  for (const MetricColumn& column : MetricColumns()) judged += column.compared ? 1 : 0;
  EXPECT_EQ(Lines(csv).size(), 3u * (1 + judged) + 1u);

  const std::string md = Read(WriteInto("b", MakeBatch()) / "compare.md");
  EXPECT_NE(md.find("### hinf against lqr\n\n| figure | lqr (baseline) | hinf | difference | "
                    "paired test | verdict |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| max tilt (deg) | 3.00 (2.00–4.00) | 1.50 | -50.0 % | 2 pairs, too few | "
                    "? better (hint) |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| survival (%) | 100 | 50.0 | -50.0 pp | 2 pairs, too few | ? worse (hint) |"),
            std::string::npos)
      << md;
  EXPECT_NE(md.find("| max slip ratio | 0 | 0.500 | +0.500 (abs.) | 1 pair, too few | "
                    "? worse (hint) |"),
            std::string::npos)
      << md;
}

// Per-scenario score by the rule in ranking.md: Σ w · mean / best mean over Σ w, weights max tilt
// 2, max drift 1, tilt settle 1, RMS tilt 1, drift settle 0.5, effort 0.5, peak current 0.5,
// saturation 0.5, energy 0.5. Each term below is mean / best, worked by hand from MakeBatch.
double Score(const std::vector<std::pair<double, double>>& weighted_ratios) {
  double sum = 0, weights = 0;
  for (const auto& [weight, ratio] : weighted_ratios) {
    sum += weight * ratio;
    weights += weight;
  }
  return sum / weights;
}

TEST_F(ResultsWriter, RankingOrderAndScoresWorkedByHand) {
  // ramp: unsettled tilt counts 2 × 3 s (pid seed 2, the longest) = 6 s; unsettled drift
  // 2 × 4 s = 8 s (hinf seed 2).
  // Means:      tilt   drift  t_set        rms    d_set        effort cur   sat     energy
  //   lqr       3      0.25   1.5          0.625  2.5          12     5     0.0625  22
  //   hinf      1.5    0.25   1            0.5    (8+4)/2=6    15     5.01  0.0625  25
  //   pid       25.5   0.625  (6+3)/2=4.5  5.5    (8+3)/2=5.5  25     10    0.25    28
  const double lqr_ramp = Score({{2, 3 / 1.5},
                                 {1, 1},
                                 {1, 1.5 / 1},
                                 {1, 0.625 / 0.5},
                                 {0.5, 1},
                                 {0.5, 1},
                                 {0.5, 1},
                                 {0.5, 1},
                                 {0.5, 1}});
  const double hinf_ramp = Score({{2, 1},
                                  {1, 1},
                                  {1, 1},
                                  {1, 1},
                                  {0.5, 6 / 2.5},
                                  {0.5, 15.0 / 12},
                                  {0.5, 5.01 / 5},
                                  {0.5, 1},
                                  {0.5, 25.0 / 22}});
  const double pid_ramp = Score({{2, 25.5 / 1.5},
                                 {1, 0.625 / 0.25},
                                 {1, 4.5 / 1},
                                 {1, 5.5 / 0.5},
                                 {0.5, 5.5 / 2.5},
                                 {0.5, 25.0 / 12},
                                 {0.5, 10.0 / 5},
                                 {0.5, 0.25 / 0.0625},
                                 {0.5, 28.0 / 22}});
  // shove: every saturation is 0, so no smallest positive mean: the figure is left out.
  const double lqr_shove =
      Score({{2, 1}, {1, 1}, {1, 1}, {1, 1}, {0.5, 1}, {0.5, 1}, {0.5, 1}, {0.5, 1}});
  const double hinf_shove =
      Score({{2, 3.0 / 2}, {1, 1}, {1, 1}, {1, 1}, {0.5, 1}, {0.5, 1}, {0.5, 1}, {0.5, 1}});
  const double lqr = (lqr_ramp + lqr_shove) / 2;     // 1.18333
  const double hinf = (hinf_ramp + hinf_shove) / 2;  // 1.13104
  ASSERT_LT(hinf, lqr);
  ASSERT_LT(hinf_ramp, lqr_ramp);
  ASSERT_LT(lqr_shove, hinf_shove);

  const std::vector<std::string> lines = Lines(Read(WriteInto("a", MakeBatch()) / "ranking.csv"));
  ASSERT_EQ(lines.size(), 4u);
  EXPECT_EQ(lines[0],
            "rank,controller,survival_rate,survived,runs,score,scenarios_scored,partial,"
            "values_skipped,rank_ramp,rank_shove");
  // Both survive everything: hinf's lower score first. pid fell once: last, whatever its score;
  // it did not run in shove, so has no rank there, is scored on ramp alone and is partial.
  const std::vector<std::string> hinf_row = testing::SplitRecord(lines[1]);
  const std::vector<std::string> lqr_row = testing::SplitRecord(lines[2]);
  const std::vector<std::string> pid_row = testing::SplitRecord(lines[3]);
  ASSERT_EQ(hinf_row.size(), 11u);
  ASSERT_EQ(pid_row.size(), 11u);
  EXPECT_EQ(hinf_row[1], "hinf");
  EXPECT_EQ(lqr_row[1], "lqr");
  EXPECT_EQ(pid_row[1], "pid");
  EXPECT_EQ(lines[1].substr(0, 13), "1,hinf,1,4,4,");
  EXPECT_EQ(lines[3].substr(0, 14), "3,pid,0.5,1,2,");
  // Scores print with 6 significant digits: relative tolerance 1e-5.
  EXPECT_NEAR(std::stod(hinf_row[5]), hinf, 1e-5 * hinf);
  EXPECT_NEAR(std::stod(lqr_row[5]), lqr, 1e-5 * lqr);
  EXPECT_NEAR(std::stod(pid_row[5]), pid_ramp, 1e-5 * pid_ramp);
  // Per-scenario ranks: ramp hinf, lqr, pid; shove lqr, hinf.
  EXPECT_EQ(hinf_row[6] + " " + hinf_row[7] + " " + hinf_row[9] + " " + hinf_row[10],
            "2 false 1 2");
  EXPECT_EQ(lqr_row[6] + " " + lqr_row[7] + " " + lqr_row[9] + " " + lqr_row[10], "2 false 2 1");
  EXPECT_EQ(pid_row[6] + " " + pid_row[7] + " " + pid_row[9] + " [" + pid_row[10] + "]",
            "1 true 3 []");

  const std::string md = Read(WriteInto("b", MakeBatch()) / "ranking.md");
  EXPECT_NE(md.find("| rank | controller | survived | score | scenarios scored | values skipped | "
                    "ramp | shove |"),
            std::string::npos);
  EXPECT_NE(md.find("| 3 | pid | 1/2 |"), std::string::npos) << md;
  EXPECT_NE(md.find(" | 3 | — |\n"), std::string::npos) << md;
  EXPECT_NE(md.find("max tilt 2, max drift 1, tilt settle 1, RMS tilt 1, drift settle 0.5"),
            std::string::npos)
      << md;
}

TEST_F(ResultsWriter, RankingPutsSurvivalFirstThenScoreThenName) {
  // "risky" has the better figures but falls once; "zeta" and "alpha" have identical figures.
  BatchResult batch;
  const Figures good{1, 0.25, 1, 1, 0.5, 5, 2, 0, 10};
  const Figures plain{2, 0.5, 2, 2, 1, 10, 4, 0, 20};
  for (std::uint64_t seed : {1, 2}) {
    batch.runs.push_back(MakeRun("s", "zeta", seed, true, RunStatus::kOk, plain));
  }
  batch.runs.push_back(MakeRun("s", "risky", 1, false, RunStatus::kFell, good));
  batch.runs.push_back(MakeRun("s", "risky", 2, false, RunStatus::kOk, good));
  for (std::uint64_t seed : {1, 2}) {
    batch.runs.push_back(MakeRun("s", "alpha", seed, false, RunStatus::kOk, plain));
  }
  const std::vector<std::string> lines = Lines(Read(WriteInto("a", batch) / "ranking.csv"));
  ASSERT_EQ(lines.size(), 4u);
  EXPECT_EQ(testing::SplitRecord(lines[1])[1], "alpha");
  EXPECT_EQ(testing::SplitRecord(lines[2])[1], "zeta");
  EXPECT_EQ(testing::SplitRecord(lines[3])[1], "risky");
  // risky's mean is the smallest of every figure, the others' twice as large (all saturations
  // are 0, so that figure is left out): scores 1 and 2. Only the fall puts risky last.
  EXPECT_EQ(testing::SplitRecord(lines[3])[5], "1");
  EXPECT_EQ(testing::SplitRecord(lines[1])[5], "2");
  EXPECT_EQ(testing::SplitRecord(lines[2])[5], "2");
}

TEST_F(ResultsWriter, RunsThatWereNotPlayedCountAsLostButNotInMeans) {
  // Seed 2's set-up failed: it has no figures (empty cells) and stays out of the means, but the
  // run counts among the runs that did not survive.
  BatchResult batch;
  batch.runs.push_back(
      MakeRun("s", "a", 1, true, RunStatus::kOk, {2, 0.25, 1, 1, 0.5, 10, 4, 0, 20}));
  RunResult failed;
  failed.scenario = "s";
  failed.controller = "a";
  failed.seed = 2;
  failed.baseline = true;
  failed.metrics.status = RunStatus::kSetupFailed;
  failed.metrics.message = "module not found";
  batch.runs.push_back(failed);
  const fs::path dir = WriteInto("a", batch);
  const std::string md = Read(dir / "summary.md");
  EXPECT_NE(md.find("| survived | 1/2 (1 not played) |"), std::string::npos) << md;
  EXPECT_NE(md.find("| max tilt (deg) | 2.00 [1 of 2] |"), std::string::npos) << md;
  // Every figure of the run that was not played is empty.
  EXPECT_EQ(Lines(Read(dir / "summary.csv"))[2], "s,a,2,true,setup_failed,false," +
                                                     std::string(MetricColumns().size(), ',') +
                                                     "module not found");
  EXPECT_EQ(Lines(Read(dir / "ranking.csv"))[1].substr(0, 14), "1,a,0.5,1,2,1,");
}

TEST_F(ResultsWriter, TraceHasFieldColumnsAndEventLabels) {
  const std::string csv = Read(WriteInto("a", MakeBatch()) / "traces" / "ramp__lqr__seed1.csv");
  const std::vector<std::string> lines = Lines(csv);
  ASSERT_EQ(lines.size(), 5u);
  EXPECT_EQ(lines[0],
            "time_s,x_m,y_m,pitch_deg,pitch_rate_deg_s,yaw_deg,speed_m_s,ref_speed_m_s,"
            "ref_yaw_rate_deg_s,drift_m,gyro_y_rad_s,accel_x_m_s2,encoder_left_rad,"
            "encoder_right_rad,command_left,command_right,voltage_left_V,voltage_right_V,"
            "current_left_A,current_right_A,torque_left_Nm,torque_right_Nm,load_left_N,"
            "load_right_N,slip_left,slip_right,payload_x_m,event");
  EXPECT_EQ(lines[1], "0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,-0.5,start");
  // Both marks at 0.015 s happened after the row at 0.01 s: none there.
  EXPECT_EQ(lines[2], "0.01,0,0,1.23457,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,-0.5,");
  // They show on the first row at or after them, 0.02 s: joined with "; ", quoted for the comma
  // and quotes. NaN speed: an empty field.
  EXPECT_EQ(lines[3],
            "0.02,0,0,2.46914,0,0,,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,-0.5,"
            "\"push 120 N, \"\"half-sine\"\"; second\"");
  // The mark at 0.5 s came after the trace's end (0.03 s): it appears nowhere.
  EXPECT_EQ(lines[4], "0.03,0,0,3.7037,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,-0.5,");
  EXPECT_EQ(csv.find("fall"), std::string::npos);
}

TEST_F(ResultsWriter, TraceFileNameReplacesUnsafeCharacters) {
  RunResult run;
  run.scenario = "wet ramp";
  run.controller = "pd/v2:fast";
  run.seed = 42;
  EXPECT_EQ(TraceFileName(run), "wet_ramp__pd_v2_fast__seed42.csv");
}

TEST_F(ResultsWriter, ClashingTraceNamesAreRefused) {
  BatchResult batch = MakeBatch();
  batch.runs[1].trace.rate_hz = 100;
  batch.runs[1].seed = 1;
  batch.runs[1].controller = "lqr";  // same scenario, controller and seed as run 0
  const Status written = WriteResults((root_ / "a").string(), batch);
  ASSERT_FALSE(written);
  EXPECT_NE(written.error().find("ramp__lqr__seed1.csv"), std::string::npos) << written.error();
}

TEST_F(ResultsWriter, WritingTwiceGivesIdenticalTablesAndTraces) {
  const BatchResult first = MakeBatch();
  BatchResult second = MakeBatch();
  // Timing and job count reach the manifest only.
  second.jobs = 1;
  second.wall_s = 9.75;
  for (RunResult& run : second.runs) run.wall_s = 3.5;
  const fs::path a = WriteInto("a", first);
  const fs::path b = WriteInto("b", second);
  int compared = 0;
  for (const auto& entry : fs::recursive_directory_iterator(a)) {
    if (!entry.is_regular_file()) continue;
    const fs::path relative = fs::relative(entry.path(), a);
    if (relative == "manifest.json") {
      EXPECT_NE(Read(entry.path()), Read(b / relative));
      continue;
    }
    EXPECT_EQ(Read(entry.path()), Read(b / relative)) << relative;
    ++compared;
  }
  EXPECT_EQ(compared, 7);  // six tables and one trace
  // Writing again over an existing folder gives the same bytes.
  const Status written = WriteResults(a.string(), first);
  ASSERT_TRUE(written) << written.error();
  EXPECT_EQ(Read(a / "summary.csv"), Read(b / "summary.csv"));
}

TEST_F(ResultsWriter, AFolderWrittenBeforeKeepsNothingOfThatBatchButOtherFiles) {
  // First a batch with the linear twin and two traces, then one without the twin and one trace:
  // the old gap tables and the other trace go, the user's own files stay.
  BatchResult first = MakeBatch();
  first.linear_twin = true;
  first.runs[1].trace = first.runs[0].trace;  // ramp / lqr / seed 2
  const fs::path dir = WriteInto("a", first);
  ASSERT_TRUE(fs::is_regular_file(dir / "gap.csv"));
  ASSERT_TRUE(fs::is_regular_file(dir / "traces" / "ramp__lqr__seed2.csv"));
  EXPECT_NE(Read(dir / "manifest.json").find("\"linear_twin\": true"), std::string::npos);
  std::ofstream(dir / "notes.txt") << "mine";
  std::ofstream(dir / "traces" / "README.txt") << "mine too";

  const Status written = WriteResults(dir.string(), MakeBatch());
  ASSERT_TRUE(written) << written.error();
  EXPECT_FALSE(fs::exists(dir / "gap.csv"));
  EXPECT_FALSE(fs::exists(dir / "gap.md"));
  EXPECT_FALSE(fs::exists(dir / "traces" / "ramp__lqr__seed2.csv"));
  EXPECT_TRUE(fs::is_regular_file(dir / "traces" / "ramp__lqr__seed1.csv"));
  EXPECT_TRUE(fs::is_regular_file(dir / "notes.txt"));
  EXPECT_TRUE(fs::is_regular_file(dir / "traces" / "README.txt"));
  EXPECT_NE(Read(dir / "manifest.json").find("\"linear_twin\": false"), std::string::npos);
}

TEST_F(ResultsWriter, ManifestRecordsInputsAndRunsWithEscapedStrings) {
  BatchResult batch = MakeBatch();
  batch.scenarios[0].path = "C:\\robots\\\"ramp\"\tv1\x01\n";
  const std::string json = Read(WriteInto("a", batch) / "manifest.json");
  // RFC 8259 §7: '"' and '\' escaped, tab and line feed as \t and \n, U+0001 as \u0001.
  EXPECT_NE(json.find("\"path\": \"C:\\\\robots\\\\\\\"ramp\\\"\\tv1\\u0001\\n\""),
            std::string::npos)
      << json;
  EXPECT_NE(json.find("\"tool_version\": \"0.1.0-test\""), std::string::npos);
  EXPECT_NE(json.find("\"jobs\": 2"), std::string::npos);
  EXPECT_NE(json.find("\"trace_rate_hz\": 100"), std::string::npos);
  EXPECT_NE(json.find("\"dt_s\": 0.001"), std::string::npos);
  EXPECT_NE(json.find("\"sha256\": \"" + std::string(64, 'a') + "\""), std::string::npos);
  EXPECT_NE(json.find("\"model_sha256\": \"" + std::string(64, 'b') + "\""), std::string::npos);
  EXPECT_NE(json.find("\"baseline\": \"lqr\""), std::string::npos);
  EXPECT_NE(json.find("\"trace\": \"traces/ramp__lqr__seed1.csv\""), std::string::npos);
  EXPECT_NE(json.find("\"status\": \"fell\""), std::string::npos);
  EXPECT_NE(json.find("\"steps\": 5000"), std::string::npos);
  // Nine of the ten runs have no trace.
  std::size_t nulls = 0;
  for (std::size_t at = json.find("\"trace\": null"); at != std::string::npos;
       at = json.find("\"trace\": null", at + 1)) {
    ++nulls;
  }
  EXPECT_EQ(nulls, 9u);
  // No raw control character but the line breaks between values (RFC 8259 §7).
  int control = 0;
  for (char c : json) {
    if (c != '\n' && static_cast<unsigned char>(c) < 0x20) ++control;
  }
  EXPECT_EQ(control, 0);
}

TEST_F(ResultsWriter, UnwritableFolderFailsNamingThePath) {
  // A regular file where a parent folder should be: no user, root included, can create it.
  fs::create_directories(root_);
  { std::ofstream(root_ / "plain_file") << "x"; }
  const std::string dir = (root_ / "plain_file" / "results").string();
  const Status written = WriteResults(dir, MakeBatch());
  ASSERT_FALSE(written);
  EXPECT_NE(written.error().find(dir), std::string::npos) << written.error();
}

TEST_F(ResultsWriter, UnwritableFileFailsNamingIt) {
  // A non-empty folder in the place of summary.csv: the rename over it fails.
  const fs::path dir = root_ / "a";
  fs::create_directories(dir / "summary.csv" / "inside");
  const Status written = WriteResults(dir.string(), MakeBatch());
  ASSERT_FALSE(written);
  EXPECT_NE(written.error().find((dir / "summary.csv").string()), std::string::npos)
      << written.error();
  for (const auto& entry : fs::directory_iterator(dir)) {
    EXPECT_EQ(entry.path().filename().string().find(".tmp."), std::string::npos) << entry.path();
  }
}

}  // namespace
}  // namespace upright::runner
