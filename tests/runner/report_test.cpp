// The report of a small real run: well-formed (parsed as XML), one plot per scenario and signal
// with the parts each must show, nothing external, a bounded size and the same bytes twice; the
// refusals; and `upright report` over a folder of envelope and sweep folders.
#include "upright/runner/report/report.hpp"

#include <gtest/gtest.h>
#include <sys/wait.h>
#include <tinyxml2.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <regex>
#include <sstream>

#include "html_text.hpp"
#include "palette.hpp"
#include "report_page.hpp"
#include "report_test_support.hpp"
#include "report_xml.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/report/csv_reader.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/results_writer.hpp"
#include "upright/runner/tables/verdict.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using testing::Attribute;
using testing::Count;
using testing::Elements;
using testing::MakeAndParse;
using testing::PathPoints;
using testing::PlotOf;
using testing::ReadFile;
using testing::Report;
using testing::ScratchDir;
using testing::SmallRunFolder;
using testing::TextOf;
using testing::Walk;
using tinyxml2::XMLElement;

TEST(Report, IsWellFormedWithOnePlotPerScenarioAndSignal) {
  const auto& run = SmallRunFolder();
  Report report;
  MakeAndParse(run.dir, {}, &report);
  const XMLElement* html = report.doc.RootElement();
  ASSERT_NE(html, nullptr);
  EXPECT_STREQ(html->Name(), "html");
  ASSERT_NE(html->FirstChildElement("head"), nullptr);
  ASSERT_NE(html->FirstChildElement("body"), nullptr);

  std::map<std::string, int> plots;
  std::map<std::string, int> charts;
  for (const XMLElement* svg : Elements(html, "svg")) {
    if (!Attribute(svg, "data-plot").empty()) {
      ++plots[Attribute(svg, "data-scenario") + "/" + Attribute(svg, "data-plot")];
    }
    if (!Attribute(svg, "data-chart").empty()) ++charts[Attribute(svg, "data-chart")];
  }
  const std::map<std::string, int> expected = {{"shove/drift", 1},
                                               {"shove/position", 1},
                                               {"shove/slip", 1},
                                               {"shove/tilt", 1},
                                               {"shove/torque", 1}};
  EXPECT_EQ(plots, expected);
  // The run had the linear twin: one gap chart for its one scenario, and nothing else.
  EXPECT_EQ(charts, (std::map<std::string, int>{{"gap", 1}}));
}

TEST(Report, TiltPlotShowsLinesTwinsEventsTheFallAxesAndLegend) {
  const auto& run = SmallRunFolder();
  ASSERT_EQ(run.batch.runs.size(), 4u);
  // lqr seed 1, the plotted seed, falls under this shove; pid survives it.
  const RunResult& lqr = run.batch.runs[0];
  ASSERT_EQ(lqr.controller, "lqr");
  ASSERT_EQ(lqr.seed, 1u);
  ASSERT_EQ(lqr.metrics.status, RunStatus::kFell) << lqr.metrics.message;
  ASSERT_EQ(run.batch.runs[2].metrics.status, RunStatus::kOk) << run.batch.runs[2].metrics.message;

  Report report;
  MakeAndParse(run.dir, {}, &report);
  const XMLElement* tilt = PlotOf(report.doc.RootElement(), "tilt");
  ASSERT_NE(tilt, nullptr);

  // Two controllers, each with its linear twin drawn dotted.
  int lines = 0, twins = 0;
  for (const XMLElement* path : Elements(tilt, "path")) {
    if (Attribute(path, "stroke-width") == "1.6") ++lines;
    if (Attribute(path, "stroke-dasharray") == internal::kTwinDash) ++twins;
  }
  EXPECT_EQ(lines, 2);
  EXPECT_EQ(twins, 2);
  // The drift plot has no twin.
  for (const XMLElement* path : Elements(PlotOf(report.doc.RootElement(), "drift"), "path")) {
    EXPECT_NE(Attribute(path, "stroke-dasharray"), internal::kTwinDash);
  }

  // The events, once each, from the run that went on: the push and the drive (whose label holds
  // a comma, quoted in the trace CSV). The drive is not taken from lqr's last row.
  std::vector<std::string> events;
  for (const XMLElement* g : Elements(tilt, "g")) {
    if (Attribute(g, "class") == "event") events.push_back(TextOf(g->FirstChildElement("title")));
  }
  ASSERT_EQ(events.size(), 2u);
  EXPECT_EQ(events[0], "push 250 N half-sine 0.3 s");
  EXPECT_EQ(events[1].rfind("drive 0.2 m/s, 0 deg/s", 0), 0u) << events[1];
  EXPECT_NE(report.html.find("<strong>E2</strong> 2.00 s drive"), std::string::npos);

  // The fall: one mark, at lqr's fall time as the summary gives it.
  std::vector<std::string> marks;
  for (const XMLElement* g : Elements(tilt, "g")) {
    if (Attribute(g, "class") == "mark") marks.push_back(TextOf(g));
  }
  ASSERT_EQ(marks.size(), 1u);
  EXPECT_EQ(marks[0], "lqr fell at " + FixedText(lqr.metrics.fall_time_s, 3) + " s");

  // Axes with units and ticks, and the legend naming both controllers and the twin.
  std::vector<std::string> texts;
  for (const XMLElement* t : Elements(tilt, "text")) texts.push_back(TextOf(t));
  const auto has = [&](const std::string& s) {
    return std::find(texts.begin(), texts.end(), s) != texts.end();
  };
  EXPECT_TRUE(has("time (s)"));
  EXPECT_TRUE(has("tilt, pitch (deg)"));
  EXPECT_TRUE(has("0"));
  EXPECT_TRUE(has("lqr"));
  EXPECT_TRUE(has("pid"));
  EXPECT_TRUE(has("linear twin (dotted, the controller's colour)"));
  EXPECT_NE(report.html.find("Traces of seed 1 "), std::string::npos);
}

TEST(Report, CarriesTheTablesTheInputsTheVersionAndTheCaution) {
  const auto& run = SmallRunFolder();
  Report report;
  MakeAndParse(run.dir, {}, &report);
  const std::string& html = report.html;
  EXPECT_NE(html.find(internal::kCaution), std::string::npos);
  EXPECT_NE(html.find("upright test"), std::string::npos);  // the batch's tool version
  // The robot file's digest as the manifest recorded it, and as the file has it.
  const Result<std::string> model_sha =
      Sha256OfFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  ASSERT_TRUE(model_sha) << model_sha.error();
  ASSERT_EQ(run.batch.scenarios[0].model_sha256, *model_sha);
  EXPECT_NE(html.find(*model_sha), std::string::npos);

  // Every verdict of compare.csv shows with the mark compare.md gives it (one convention,
  // upright/runner/tables/verdict.hpp): a symbol and a word, not colour alone, and not the old
  // arrows.
  const Result<CsvTable> read = ReadCsvFile((run.dir / "compare.csv").string());
  ASSERT_TRUE(read) << read.error();
  const CsvTable& compare = *read;
  const int verdict_column = compare.Column("verdict");
  const int direction_column = compare.Column("direction");
  ASSERT_GE(verdict_column, 0);
  ASSERT_GE(direction_column, 0);
  std::map<std::string, std::size_t> marks;
  for (const auto& row : compare.rows) {
    Verdict verdict = Verdict::kNotApplicable, direction = Verdict::kNotApplicable;
    ASSERT_TRUE(FromString(row[verdict_column], &verdict)) << row[verdict_column];
    ASSERT_TRUE(FromString(row[direction_column], &direction)) << row[direction_column];
    ++marks[VerdictMark(verdict, direction)];
  }
  ASSERT_FALSE(marks.empty());
  const auto count = [&](const std::string& needle) { return Count(html, needle); };
  const std::string md = ReadFile(run.dir / "compare.md");
  for (const auto& [mark, n] : marks) {
    // The table's caption carries the legend once.
    EXPECT_EQ(count(mark), n + Count(VerdictLegend(), mark)) << mark;
    EXPECT_GE(Count(md, mark), n) << mark;
  }
  // Each controller is compared over the seeds both it and the baseline survived, so every
  // cell carries both means ("7.95 vs 6.18"), under a heading "<controller> vs <baseline>".
  const int controller_column = compare.Column("controller");
  const int baseline_column = compare.Column("baseline");
  for (const auto& row : compare.rows) {
    EXPECT_NE(html.find(">" + row[controller_column] + " vs " + row[baseline_column] + "</th>"),
              std::string::npos)
        << row[controller_column];
  }
  EXPECT_GE(count(" vs "), compare.rows.size());
  EXPECT_EQ(count("(baseline)</th>"), 0u);
  EXPECT_EQ(count("▲"), 0u);
  EXPECT_EQ(count("▼"), 0u);
  // Headings read as words with their units, never as raw column names.
  for (const MetricColumn& column : MetricColumns()) {
    EXPECT_EQ(html.find(std::string(">") + column.name + "<"), std::string::npos) << column.name;
  }
  EXPECT_NE(html.find("<th class=\"num\">max tilt (deg)</th>"), std::string::npos);
  EXPECT_NE(html.find("<td>max tilt (deg)</td>"), std::string::npos);
  // The summary: one row per run, the fall shown with a symbol and a word.
  EXPECT_EQ(count("✘ fell"),
            static_cast<std::size_t>(std::count_if(
                run.batch.runs.begin(), run.batch.runs.end(),
                [](const RunResult& r) { return r.metrics.status == RunStatus::kFell; })));
}

TEST(Report, ReferencesNothingOutsideAndStaysSmall) {
  const auto& run = SmallRunFolder();
  Report report;
  MakeAndParse(run.dir, {}, &report);
  const std::string& html = report.html;
  for (const char* needle : {"http://", "https://", "<script", "<link", "<img", "<iframe",
                             "<object", "<embed", "url(", "@import"}) {
    EXPECT_EQ(html.find(needle), std::string::npos) << needle;
  }
  Walk(report.doc.RootElement(), [](const XMLElement* e) {
    EXPECT_EQ(e->Attribute("src"), nullptr) << e->Name();
    const char* href = e->Attribute("href");
    if (href != nullptr) {
      EXPECT_EQ(href[0], '#') << href;
    }
  });
  std::printf("report of the small run: %zu bytes\n", report.written.bytes);
  EXPECT_EQ(report.written.bytes, html.size());
  EXPECT_LT(report.written.bytes, 2u * 1000 * 1000);
}

TEST(Report, SameResultsGiveTheSameBytes) {
  const auto& run = SmallRunFolder();
  Report first, second;
  MakeAndParse(run.dir, {}, &first);
  MakeAndParse(run.dir, {}, &second);
  EXPECT_EQ(first.html, second.html);
  // Nor does the place of the folder matter: a copy elsewhere under the same name.
  const fs::path copy = ScratchDir("report-copy") / run.dir.filename();
  fs::copy(run.dir, copy, fs::copy_options::recursive);
  Report moved;
  MakeAndParse(copy, {}, &moved);
  EXPECT_EQ(moved.html, first.html);
}

// Each plotted seed is named whole: lqr's only run is seed 12 and pid plots seed 1, which a match
// of text inside "seed 12" would drop.
TEST(Report, NamesEachPlottedSeedWhole) {
  const auto& run = SmallRunFolder();
  const fs::path copy = ScratchDir("report-seed12") / run.dir.filename();
  fs::copy(run.dir, copy, fs::copy_options::recursive);
  std::istringstream in(ReadFile(copy / "summary.csv"));
  std::string summary, line;
  while (std::getline(in, line)) {
    if (line.rfind("shove,lqr,2,", 0) == 0) continue;  // lqr keeps one run, renamed seed 12
    if (line.rfind("shove,lqr,1,", 0) == 0) line.replace(0, 12, "shove,lqr,12,");
    summary += line + "\n";
  }
  std::ofstream(copy / "summary.csv", std::ios::binary) << summary;
  fs::rename(copy / "traces" / "shove__lqr__seed1.csv", copy / "traces" / "shove__lqr__seed12.csv");
  Report report;
  MakeAndParse(copy, {}, &report);
  EXPECT_NE(report.html.find("Traces of seed 12, seed 1 ("), std::string::npos);
}

TEST(Report, PlotsAreThinnedToTheirBound) {
  const auto& run = SmallRunFolder();
  ReportOptions options;
  options.max_points = 40;
  Report report;
  MakeAndParse(run.dir, options, &report);
  std::size_t series = 0;
  for (const XMLElement* svg : Elements(report.doc.RootElement(), "svg")) {
    if (Attribute(svg, "data-plot").empty()) continue;
    for (const XMLElement* path : Elements(svg, "path")) {
      // Lines are 1.6 wide, the twins 1.2; the fall crosses 2.2.
      const std::string width = Attribute(path, "stroke-width");
      if (width != "1.6" && width != "1.2") continue;
      ++series;
      EXPECT_LE(PathPoints(Attribute(path, "d")), 42u) << Attribute(path, "d");
    }
  }
  // 5 plots × 2 controllers, plus the twins on tilt and position.
  EXPECT_EQ(series, 14u);
  // The trace has 126 rows (2.5 s at 50 Hz); the default bound draws every one of pid's.
  Report full;
  MakeAndParse(run.dir, {}, &full);
  const XMLElement* tilt = PlotOf(full.doc.RootElement(), "tilt");
  std::size_t most = 0;
  for (const XMLElement* path : Elements(tilt, "path")) {
    if (Attribute(path, "stroke-width") == "1.6")
      most = std::max(most, PathPoints(Attribute(path, "d")));
  }
  EXPECT_GT(most, 100u);
  EXPECT_LE(most, 126u);
}

TEST(Report, AFolderWithoutResultsIsRefusedNamingWhatWasLookedFor) {
  const auto dir = ScratchDir("report-empty");
  fs::create_directories(dir / "sub" / "traces");
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().problem, ReportProblem::kNoResults);
  const std::string& message = made.error().message;
  for (const char* name : {"summary.csv", "envelope.csv", "sweep.csv"}) {
    EXPECT_NE(message.find(name), std::string::npos) << message;
  }
  EXPECT_FALSE(fs::exists(dir / kReportFileName));
  const Result<std::string> written = WriteReport(dir.string());
  ASSERT_FALSE(written);
  EXPECT_EQ(written.error(), message);
}

TEST(Report, AMalformedTableIsRefusedWithItsLine) {
  const auto dir = ScratchDir("report-bad");
  std::ofstream(dir / "summary.csv") << "scenario,controller,seed,status\ns,lqr,1,\"ok\n";
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().problem, ReportProblem::kBadInput);
  EXPECT_EQ(made.error().message,
            (dir / "summary.csv").string() +
                ":2: a quoted field is never closed (expected a closing '\"')");
  EXPECT_FALSE(fs::exists(dir / kReportFileName));
}

// A manifest naming a trace outside the results folder (absolute, up and out, or a link inside
// that leads out) is refused rather than read: the report reads only the folder's own files.
TEST(Report, ATraceOutsideTheResultsFolderIsRefused) {
  const testing::SmallRun& run = SmallRunFolder();
  const std::string manifest = ReadFile(run.dir / "manifest.json");
  const std::string first = "\"traces/" + TraceFileName(run.batch.runs.front()) + "\"";
  ASSERT_NE(manifest.find(first), std::string::npos) << manifest;
  const fs::path outside = ScratchDir("report-outside") / "elsewhere.csv";
  fs::copy_file(run.dir / "traces" / TraceFileName(run.batch.runs.front()), outside,
                fs::copy_options::overwrite_existing);
  const std::string seed = std::to_string(run.batch.runs.front().seed);
  for (const std::string& named :
       {outside.string(), "../" + outside.parent_path().filename().string() + "/elsewhere.csv",
        std::string("traces/link.csv")}) {
    const fs::path dir = ScratchDir("report-trace-outside");
    fs::copy(run.dir, dir, fs::copy_options::recursive | fs::copy_options::overwrite_existing);
    fs::create_symlink(outside, dir / "traces" / "link.csv");
    std::string edited = manifest;
    edited.replace(edited.find(first), first.size(), "\"" + named + "\"");
    std::ofstream(dir / "manifest.json") << edited;
    const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
    ASSERT_FALSE(made) << named;
    EXPECT_EQ(made.error().problem, ReportProblem::kBadInput);
    EXPECT_EQ(made.error().message,
              (dir / "manifest.json").string() + ": the trace of " +
                  run.batch.runs.front().scenario + " " + run.batch.runs.front().controller +
                  " seed " + seed + ", '" + named +
                  "', lies outside the results folder; the report reads only files inside it");
  }
}

// A sweep table whose yes/no cells are not true/false (another writer's 1 and 0) is refused at
// the cell's line rather than read as no sample survived.
TEST(Report, ASurvivedCellThatIsNotTrueOrFalseIsRefusedWithItsLine) {
  const auto dir = ScratchDir("report-bad-bool");
  std::ofstream(dir / "sweep.csv") << "sample,controller,status,survived\n0,lqr,ok,true\n"
                                      "1,lqr,ok,1\n";
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().problem, ReportProblem::kBadInput);
  EXPECT_EQ(made.error().message,
            (dir / "sweep.csv").string() + ":3: survived = '1': expected true or false");
  EXPECT_FALSE(fs::exists(dir / kReportFileName));
}

TEST(Report, OptionsAreChecked) {
  ReportOptions options;
  options.max_points = 3;
  const Status valid = options.Validate();
  ASSERT_FALSE(valid);
  EXPECT_EQ(valid.error(), "ReportOptions::max_points = 3, must be >= 4");
  const Result<ReportWritten, ReportFailure> made =
      MakeReport(SmallRunFolder().dir.string(), options);
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().problem, ReportProblem::kBadInput);
  EXPECT_EQ(made.error().message, valid.error());
}

using Outcome = testing::ProgramOutcome;

Outcome RunUpright(const std::string& arguments) {
  return testing::RunProgram(UPRIGHT_EXE, arguments);
}

TEST(ReportCommand, ExitsTwoWhenThereIsNothingToReport) {
  const auto dir = ScratchDir("report-cli-empty");
  const Outcome o = RunUpright("report " + dir.string());
  EXPECT_EQ(o.code, 2) << o.out;
  EXPECT_NE(o.out.find("no results found (looked for summary.csv"), std::string::npos) << o.out;
}

// A folder holding an envelope folder and a sweep folder, as `upright demo` leaves them beside
// its own tables: one report over both, its sweep intervals agreeing with sweep.md's.
TEST(ReportCommand, ReportsEnvelopeAndSweepFoldersInsideAFolder) {
  const auto dir = ScratchDir("report-cli-nested");
  const std::string scenario =
      std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/courier-shove-half-sine.xml";
  const Outcome envelope = RunUpright(
      "envelope " + scenario +
      " --vary 'timeline/push[1].peak_N' --lo 40 --hi 640 --tol 60 --vary2 "
      "'timeline/push[1].height_m' --lo2 0.05 --hi2 0.65 --grid 2 --seeds 1 --jobs 2 --out " +
      (dir / "envelope").string());
  ASSERT_EQ(envelope.code, 0) << envelope.out;
  const Outcome sweep =
      RunUpright("sweep " + scenario + " --samples 4 --jobs 2 --out " + (dir / "sweep").string());
  ASSERT_EQ(sweep.code, 0) << sweep.out;

  const Outcome o = RunUpright("report " + dir.string());
  ASSERT_EQ(o.code, 0) << o.out;
  EXPECT_NE(o.out.find((dir / kReportFileName).string() + " ("), std::string::npos) << o.out;
  EXPECT_NE(o.out.find(" kB, 2 results folder(s))"), std::string::npos) << o.out;

  Report report;
  report.html = ReadFile(dir / kReportFileName);
  ASSERT_EQ(report.doc.Parse(report.html.c_str(), report.html.size()), tinyxml2::XML_SUCCESS)
      << report.doc.ErrorStr();
  std::map<std::string, int> charts;
  for (const XMLElement* svg : Elements(report.doc.RootElement(), "svg")) {
    EXPECT_TRUE(Attribute(svg, "data-plot").empty());
    ++charts[Attribute(svg, "data-chart")];
  }
  // The scenario file's digest, from both manifests, listed once.
  const Result<std::string> scenario_sha = Sha256OfFile(scenario);
  ASSERT_TRUE(scenario_sha) << scenario_sha.error();
  ASSERT_EQ(scenario_sha->size(), 64u);
  EXPECT_EQ(Count(report.html, *scenario_sha), 1u);
  // The demo shove names four controllers; one survival map each.
  EXPECT_EQ(charts, (std::map<std::string, int>{{"envelope", 1}, {"map", 4}, {"sweep", 1}}));

  // sweep.md's survival rows: "| lqr (baseline) | 3/4 | 75.0 % | 30.1 – 95.4 % |".
  const std::string md = ReadFile(dir / "sweep" / "sweep.md");
  const std::regex row(
      R"(\| (\w+)(?: \(baseline\))? \| (\d+)/(\d+) \| [^|]+\| ([0-9.]+) – ([0-9.]+) % \|)");
  int rows = 0;
  for (std::sregex_iterator it(md.begin(), md.end(), row), end; it != end; ++it) {
    const std::smatch& m = *it;
    ++rows;
    const std::string k = m[2], n = m[3];
    const std::size_t at = report.html.find(k + " of " + n + " survived: ");
    ASSERT_NE(at, std::string::npos) << m[0];
    // The report writes the bounds to 0.1 %; sweep.md to 3 significant digits.
    const std::string tail = report.html.substr(at, 80);
    const std::smatch bounds = [&] {
      std::smatch b;
      std::regex_search(tail, b, std::regex(R"(interval ([0-9.]+)–([0-9.]+) %)"));
      return b;
    }();
    ASSERT_EQ(bounds.size(), 3u) << tail;
    EXPECT_NEAR(std::stod(bounds[1]), std::stod(m[4]), 0.051) << m[0];
    EXPECT_NEAR(std::stod(bounds[2]), std::stod(m[5]), 0.051) << m[0];
  }
  EXPECT_EQ(rows, 4);
}

}  // namespace
}  // namespace upright::runner
