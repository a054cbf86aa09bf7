// The evaluation log of a tune: its lines read back bit for bit (NaN, -0 and infinities among the
// doubles), a log of another tune or with a broken line refused with its line, and a tune cut
// short (after whole lines, and inside one) resumed into the very tables of an uninterrupted tune
// while playing only the runs the log did not hold.
#include <gtest/gtest.h>

#include <algorithm>
#include <bit>
#include <cmath>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <limits>
#include <string>
#include <vector>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "tune_test_scenarios.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tune/evaluation_log.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_writer.hpp"

namespace upright::runner {
namespace {

using testing::Contains;
using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;

std::uint64_t Bits(double value) { return std::bit_cast<std::uint64_t>(value); }

void WriteText(const std::filesystem::path& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

// The first `n` lines of `text`, their newlines included.
std::string FirstLines(const std::string& text, int n) {
  std::size_t end = 0;
  for (int i = 0; i < n; ++i) end = text.find('\n', end) + 1;
  return text.substr(0, end);
}

// A parked courier shoved once, for 2.5 s on seed 1, under lqr and pid.
std::string ShoveText(const std::string& peak_n = "160") {
  return R"(<scenario name="shove" schema="1" duration_s="2.5">
  <description>Test: a parked courier shoved once.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N=")" +
         peak_n + R"(" duration_s="0.3" height_m="0.45"/>
  </timeline>
  <controllers><controller name="lqr" builtin="lqr"/><controller name="pid" builtin="pid"/>
  </controllers>
  <seeds list="1"/>
</scenario>)";
}

const char* kTuneText = R"(<tune schema="1">
  <controller name="lqr"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
  <controller name="pid"><knob setting="max_tilt_deg" lo="0.5" hi="8"/></controller>
</tune>)";

// The small tune of both controllers: 8 evaluations of one run each, two held-out seeds.
struct SmallTune {
  std::vector<Scenario> scenarios = {ScenarioFromText(ShoveText())};
  TuneOptions options;
  TunePlan plan;
  SmallTune() {
    options.budget_runs = 8;
    options.holdout_seeds = 2;
    options.jobs = 1;  // one controller after the other: the log's lines in a fixed order
    const Result<TuneSpec> spec = ParseTuneText(kTuneText, "t.xml");
    EXPECT_TRUE(Succeeded(spec));
    const Result<TunePlan> planned = PlanTune(scenarios, options, *spec);
    EXPECT_TRUE(Succeeded(planned));
    plan = *planned;
  }
  TuneLogHeader Header() const { return MakeTuneLogHeader(scenarios, options, plan, "test"); }
  TuneResult Run(EvaluationLog* log, std::size_t* last_done = nullptr,
                 std::size_t* last_total = nullptr) const {
    return RunTune(
        scenarios, options, plan, "test",
        [&](std::size_t done, std::size_t total, const std::vector<double>&) {
          if (last_done != nullptr) *last_done = done;
          if (last_total != nullptr) *last_total = total;
        },
        log);
  }
};

LoggedEvaluation Sample() {
  LoggedEvaluation e;
  e.controller = "lqr";
  e.stage = EvaluationStage::kLocal;
  e.index = 7;
  e.values = {0.1, 1.5, 5e-324};
  e.score.objective = 16.523;
  e.score.runs = 3;
  e.score.survived = 2;
  e.score.worst = {18.25};
  e.score.violation = {0.25};
  e.score.mean_metrics.assign(MetricColumns().size(), 0.5);
  e.score.failure = "shove seed 2: fell: tilt\t90\\ deg\nat 1.2 s";
  return e;
}

TEST(EvaluationLog, ReadsEveryDoubleBackBitForBit) {
  LoggedEvaluation e = Sample();
  const double quiet = std::numeric_limits<double>::quiet_NaN();
  const double negative_nan = std::bit_cast<double>(0xfff8000000000000ULL);  // x86's 0.0 / 0.0
  const double payload_nan = std::bit_cast<double>(0x7ff0000000000abcULL);   // a signalling NaN
  const double edges[] = {quiet,
                          negative_nan,
                          payload_nan,
                          -0.0,
                          0.0,
                          std::numeric_limits<double>::infinity(),
                          -std::numeric_limits<double>::infinity(),
                          std::numeric_limits<double>::max(),
                          std::numeric_limits<double>::denorm_min(),
                          -std::numeric_limits<double>::min(),
                          0.1 + 0.2,
                          1.0 / 3.0};
  std::copy(std::begin(edges), std::end(edges), e.score.mean_metrics.begin());
  e.score.objective = negative_nan;
  e.score.worst = {-0.0, payload_nan};
  e.score.violation = {quiet, std::numeric_limits<double>::infinity()};
  const std::string line = EvaluationLogLine(e);
  ASSERT_EQ(line.back(), '\n');
  EXPECT_EQ(line.find('\n'), line.size() - 1);  // one line, the failure's newline escaped
  const Result<LoggedEvaluation> read = ParseEvaluationLogLine(line.substr(0, line.size() - 1));
  ASSERT_TRUE(Succeeded(read));
  EXPECT_EQ(read->controller, "lqr");
  EXPECT_EQ(read->stage, EvaluationStage::kLocal);
  EXPECT_EQ(read->index, 7u);
  ASSERT_EQ(read->values.size(), 3u);
  for (std::size_t i = 0; i < 3; ++i) EXPECT_EQ(Bits(read->values[i]), Bits(e.values[i])) << i;
  EXPECT_EQ(Bits(read->score.objective), 0xfff8000000000000ULL);
  ASSERT_EQ(read->score.mean_metrics.size(), e.score.mean_metrics.size());
  for (std::size_t i = 0; i < e.score.mean_metrics.size(); ++i) {
    EXPECT_EQ(Bits(read->score.mean_metrics[i]), Bits(e.score.mean_metrics[i])) << i;
  }
  ASSERT_EQ(read->score.worst.size(), 2u);
  EXPECT_EQ(Bits(read->score.worst[0]), Bits(-0.0));
  EXPECT_EQ(Bits(read->score.worst[1]), 0x7ff0000000000abcULL);
  EXPECT_EQ(Bits(read->score.violation[0]), Bits(quiet));
  EXPECT_EQ(read->score.violation[1], std::numeric_limits<double>::infinity());
  EXPECT_EQ(read->score.runs, 3);
  EXPECT_EQ(read->score.survived, 2);
  EXPECT_EQ(read->score.failure, e.score.failure);
  // The forms written: the quiet NaN as a word, any other NaN with its bits, zero's sign kept.
  EXPECT_TRUE(Contains(line, "\tnan:fff8000000000000\t")) << line;
  EXPECT_TRUE(Contains(line, "\t-0 nan:7ff0000000000abc\tnan inf\t")) << line;
  EXPECT_TRUE(Contains(line, "\t0.1 1.5 5e-324\t")) << line;
  EXPECT_TRUE(Contains(line, "tilt\\t90\\\\ deg\\nat 1.2 s\n")) << line;
}

TEST(EvaluationLog, RefusesALineThatDoesNotRead) {
  std::string line = EvaluationLogLine(Sample());
  line.pop_back();
  const auto with_field = [&](int field, const std::string& text) {
    std::size_t start = 0;
    for (int i = 0; i < field; ++i) start = line.find('\t', start) + 1;
    const std::size_t end = line.find('\t', start);
    return std::string(line).replace(start, end - start, text);
  };
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine("lqr\tlocal\t7")),
            "an evaluation has 11 tab-separated fields, this line 3");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(1, "polish"))),
            "stage \"polish\" is none of default, global, local, held_out");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(2, "-1"))), "index \"-1\" is not a count");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(3, "0.1 1,5"))),
            "values: \"1,5\" is not a number");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(4, "NaN"))),
            "objective: \"NaN\" is not a number");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(4, "nan:0000000000000001"))),
            "objective: \"nan:0000000000000001\" is not a NaN's 16 hex digits");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(6, "4"))),
            "survived 4 is more than runs 3");
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(8, ""))),
            "worst has 1 values, violation 0");
  EXPECT_TRUE(Contains(FailureOf(ParseEvaluationLogLine(with_field(9, "1 2"))),
                       "mean_metrics has 2 values, not one per metric column"));
  EXPECT_EQ(FailureOf(ParseEvaluationLogLine(with_field(10, "a\\b"))),
            "failure: a backslash not followed by \\, t, n or r");
}

TEST(EvaluationLog, FindsAnEvaluationOnlyWithTheSameValuesBitForBit) {
  const auto dir = ScratchDir("tune-log-find");
  const std::string path = (dir / kEvaluationLogName).string();
  TuneLogHeader header;
  header.fields = {{"format", "1"}, {"seed", "1"}};
  {
    auto log = EvaluationLog::Start(path, header);
    ASSERT_TRUE(Succeeded(log));
    (*log)->Append(Sample());
    EXPECT_EQ((*log)->write_error(), "");
  }
  EXPECT_EQ(ReadFile(path), header.Line() + EvaluationLogLine(Sample()));
  auto log = EvaluationLog::Resume(path, header);
  ASSERT_TRUE(Succeeded(log));
  EXPECT_EQ((*log)->logged(), 1u);
  const LoggedEvaluation e = Sample();
  const EvaluationScore* found = (*log)->Find("lqr", EvaluationStage::kLocal, 7, e.values);
  ASSERT_NE(found, nullptr);
  EXPECT_EQ(found->objective, 16.523);
  EXPECT_EQ(found->failure, e.score.failure);
  std::vector<double> next = e.values;
  next[1] = std::nextafter(1.5, 2.0);  // one ulp away
  EXPECT_EQ((*log)->Find("lqr", EvaluationStage::kLocal, 7, next), nullptr);
  EXPECT_EQ((*log)->Find("lqr", EvaluationStage::kLocal, 6, e.values), nullptr);
  EXPECT_EQ((*log)->Find("lqr", EvaluationStage::kGlobal, 7, e.values), nullptr);
  EXPECT_EQ((*log)->Find("pid", EvaluationStage::kLocal, 7, e.values), nullptr);
  // A tune started anew replaces the log.
  log->reset();
  ASSERT_TRUE(Succeeded(EvaluationLog::Start(path, header)));
  EXPECT_EQ(ReadFile(path), header.Line());
}

TEST(EvaluationLog, RefusesAMissingLogAndABrokenLineWithItsLine) {
  const auto dir = ScratchDir("tune-log-broken");
  const std::string path = (dir / kEvaluationLogName).string();
  TuneLogHeader header;
  header.fields = {{"format", "1"}, {"seed", "1"}};
  EXPECT_EQ(FailureOf(EvaluationLog::Resume(path, header)),
            path + ": no evaluation log to resume from (run without --resume to start the tune)");
  const std::string good = EvaluationLogLine(Sample());
  // Line 3 of 4 broken (a number cut in two by hand): refused, nothing replayed.
  WriteText(path, header.Line() + good + "lqr\tlocal\t8\t0.1 1.5 5e-324\t16.5x" +
                      good.substr(good.find("\t3\t")) + good);
  EXPECT_EQ(FailureOf(EvaluationLog::Resume(path, header)),
            path + ":3: objective: \"16.5x\" is not a number");
  // Not a log at all.
  WriteText(path, "controller,evaluation\n");
  EXPECT_TRUE(Contains(FailureOf(EvaluationLog::Resume(path, header)),
                       path + ":1: not a tune evaluation log"));
}

TEST(EvaluationLog, DropsALastLineCutShortAndStartsOverWithoutAWholeHeader) {
  const auto dir = ScratchDir("tune-log-cut");
  const std::string path = (dir / kEvaluationLogName).string();
  TuneLogHeader header;
  header.fields = {{"format", "1"}, {"seed", "1"}};
  const std::string good = EvaluationLogLine(Sample());
  WriteText(path, header.Line() + good + good.substr(0, 20));
  {
    auto log = EvaluationLog::Resume(path, header);
    ASSERT_TRUE(Succeeded(log));
    EXPECT_EQ((*log)->logged(), 1u);
    // The cut tail is gone before anything is appended after it.
    EXPECT_EQ(ReadFile(path), header.Line() + good);
    LoggedEvaluation next = Sample();
    next.index = 8;
    (*log)->Append(next);
    EXPECT_EQ(ReadFile(path), header.Line() + good + EvaluationLogLine(next));
  }
  WriteText(path, header.Line().substr(0, 10));
  auto log = EvaluationLog::Resume(path, header);
  ASSERT_TRUE(Succeeded(log));
  EXPECT_EQ((*log)->logged(), 0u);
  EXPECT_EQ(ReadFile(path), header.Line());
}

TEST(EvaluationLog, RefusesTheLogOfAnotherSeedBudgetOrScenario) {
  const auto dir = ScratchDir("tune-log-other");
  const std::string scenario_dir = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";
  const auto scenario_at = [&](const std::string& name, const std::string& text) {
    WriteText(dir / name, text);
    ScenarioLoadResult loaded = ParseScenarioText(text, (dir / name).string(), scenario_dir);
    EXPECT_TRUE(loaded.has_value());
    return std::move(loaded).value();
  };
  const std::vector<Scenario> scenarios = {scenario_at("shove.xml", ShoveText())};
  const std::string was = Sha256OfFile((dir / "shove.xml").string()).value_or("");
  ASSERT_EQ(was.size(), 64u);
  TuneOptions options;
  options.budget_runs = 8;
  const Result<TunePlan> plan = PlanTune(scenarios, options, TuneSpec{});
  ASSERT_TRUE(Succeeded(plan));
  const TuneLogHeader header = MakeTuneLogHeader(scenarios, options, *plan, "0.9.0");
  const std::string path = (dir / kEvaluationLogName).string();
  ASSERT_TRUE(Succeeded(EvaluationLog::Start(path, header)));
  EXPECT_TRUE(Succeeded(EvaluationLog::Resume(path, header)));

  const auto refusal = [&](const TuneLogHeader& other) {
    return FailureOf(EvaluationLog::Resume(path, other));
  };
  TuneOptions other = options;
  other.seed = 2;
  EXPECT_EQ(refusal(MakeTuneLogHeader(scenarios, other, *plan, "0.9.0")),
            path +
                ":1: the log is of another tune: seed is 2 here, 1 in the log (run without "
                "--resume to start over)");
  other = options;
  other.budget_runs = 9;
  EXPECT_TRUE(Contains(refusal(MakeTuneLogHeader(scenarios, other, *plan, "0.9.0")),
                       "budget is 9 here, 8 in the log"));
  EXPECT_TRUE(Contains(refusal(MakeTuneLogHeader(scenarios, options, *plan, "0.9.1")),
                       "version is 0.9.1 here, 0.9.0 in the log"));
  // The scenario played on other seeds (--seeds).
  std::vector<Scenario> reseeded = scenarios;
  reseeded[0].seeds = {1, 2};
  EXPECT_TRUE(Contains(refusal(MakeTuneLogHeader(reseeded, options, *plan, "0.9.0")),
                       "seeds 1 is 1 2 here, 1 in the log"));
  // The same scenario shoved harder: its file's SHA-256 differs.
  const std::vector<Scenario> harder = {scenario_at("shove.xml", ShoveText("170"))};
  const auto scenario_field = std::find_if(header.fields.begin(), header.fields.end(),
                                           [](const auto& f) { return f.first == "scenario"; });
  ASSERT_NE(scenario_field, header.fields.end());
  EXPECT_EQ(scenario_field->second, was);
  EXPECT_EQ(refusal(MakeTuneLogHeader(harder, options, *plan, "0.9.0")),
            path + ":1: the log is of another tune: scenario 1 is " +
                Sha256OfFile((dir / "shove.xml").string()).value_or("?") + " here, " + was +
                " in the log (run without --resume to start over)");
  // Fewer controllers tuned.
  TunePlan fewer = *plan;
  fewer.controllers.pop_back();
  EXPECT_TRUE(Contains(refusal(MakeTuneLogHeader(scenarios, options, fewer, "0.9.0")),
                       "the log has controller where this tune has budget"));
}

TEST(TuneResume, GivesTheTablesOfAnUninterruptedTuneAndPlaysOnlyWhatWasNotLogged) {
  const SmallTune tune;
  const auto dir = ScratchDir("tune-resume");
  const std::string path = (dir / kEvaluationLogName).string();
  std::size_t done = 0, total = 0;
  TuneResult full;
  {
    auto log = EvaluationLog::Start(path, tune.Header());
    ASSERT_TRUE(Succeeded(log));
    full = tune.Run(log->get(), &done, &total);
  }
  EXPECT_EQ(full.played_runs, full.runs);
  EXPECT_EQ(done, full.runs);
  const std::string full_log = ReadFile(path);
  // The header, and a line per evaluation of both controllers, held-out ones included: one run
  // each on the search's seed, two on the held-out seeds.
  const std::size_t evaluations =
      full.controllers[0].evaluations.size() + full.controllers[1].evaluations.size() + 2 * 2;
  ASSERT_EQ(static_cast<std::size_t>(std::count(full_log.begin(), full_log.end(), '\n')),
            1 + evaluations);
  EXPECT_EQ(full.runs, evaluations - 4 + 4 * 2);
  EXPECT_EQ(full_log.substr(0, full_log.find('\n') + 1), tune.Header().Line());
  // lqr's global start is evaluations 1 to 3 (40 % of the 7 searched).
  ASSERT_GE(full.controllers[0].evaluations.size(), 5u);
  EXPECT_EQ(full.controllers[0].evaluations[3].stage, EvaluationStage::kGlobal);
  EXPECT_EQ(full.controllers[0].evaluations[4].stage, EvaluationStage::kLocal);

  // Cut after the header and 3 evaluations (lqr's default and two of its global start's three),
  // and 7 evaluations with a part of the eighth line.
  struct Cut {
    int lines;
    std::size_t extra_bytes;
  };
  for (const Cut cut : {Cut{1 + 3, 0}, Cut{1 + 7, 25}}) {
    const std::string kept = FirstLines(full_log, cut.lines);
    // The runs of the whole lines kept, as they logged them.
    std::size_t logged_runs = 0;
    for (int i = 1; i < cut.lines; ++i) {
      const std::string line = FirstLines(full_log, i + 1).substr(FirstLines(full_log, i).size());
      const Result<LoggedEvaluation> e = ParseEvaluationLogLine(line.substr(0, line.size() - 1));
      ASSERT_TRUE(Succeeded(e));
      logged_runs += static_cast<std::size_t>(e->score.runs);
    }
    EXPECT_EQ(logged_runs, cut.lines == 4 ? 3u : 7u);  // all of lqr's search, one run each
    WriteText(path, kept + full_log.substr(kept.size(), cut.extra_bytes));
    auto log = EvaluationLog::Resume(path, tune.Header());
    ASSERT_TRUE(Succeeded(log));
    EXPECT_EQ((*log)->logged(), static_cast<std::size_t>(cut.lines - 1));
    done = total = 0;
    const TuneResult resumed = tune.Run(log->get(), &done, &total);
    EXPECT_EQ(TuneCsv(resumed), TuneCsv(full)) << cut.lines;
    EXPECT_EQ(TuneMarkdown(resumed), TuneMarkdown(full)) << cut.lines;
    EXPECT_EQ(resumed.runs, full.runs);
    // Only the runs the log did not hold were played; the progress counts the replayed as done.
    EXPECT_EQ(resumed.played_runs, full.runs - logged_runs) << cut.lines;
    EXPECT_EQ(done, full.runs);
    EXPECT_EQ(total, full.runs);
    // The log is whole again, line for line as the uninterrupted tune wrote it.
    log->reset();
    EXPECT_EQ(ReadFile(path), full_log) << cut.lines;
  }

  // A whole log replays the search: only the held-out evaluations are played, for their runs
  // (two settings of two runs per controller), and they are not logged twice.
  auto log = EvaluationLog::Resume(path, tune.Header());
  ASSERT_TRUE(Succeeded(log));
  const TuneResult replayed = tune.Run(log->get());
  EXPECT_EQ(replayed.played_runs, 2u * 2 * 2);
  EXPECT_EQ(TuneCsv(replayed), TuneCsv(full));
  EXPECT_EQ(TuneMarkdown(replayed), TuneMarkdown(full));
  log->reset();
  EXPECT_EQ(ReadFile(path), full_log);
}

}  // namespace
}  // namespace upright::runner
