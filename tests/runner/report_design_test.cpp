// The design pictures: the plot kinds they need (a log frequency axis, a fixed and clipped window
// with equal scales, reference lines kept out of the legend), and `upright design --report` as a
// user runs it — its files, its report section checked as XML against the files' own figures and
// `design --json`, and its refusals.
#include <gtest/gtest.h>
#include <tinyxml2.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>
#include <regex>
#include <string>

#include "line_plot.hpp"
#include "report_xml.hpp"
#include "run_test_support.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/report/csv_reader.hpp"
#include "upright/runner/report/report.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using internal::LinePlot;
using internal::PlotSeries;
using internal::RenderLinePlot;
using testing::Attribute;
using testing::Elements;
using testing::ReadFile;
using testing::ScratchDir;
using testing::TextOf;
using tinyxml2::XMLElement;

// The numbers of an attribute such as viewBox, in order.
std::vector<double> Numbers(const std::string& text) {
  std::vector<double> numbers;
  std::istringstream in(text);
  for (double v; in >> v;) numbers.push_back(v);
  return numbers;
}

void Parse(const std::string& svg, tinyxml2::XMLDocument* doc) {
  ASSERT_EQ(doc->Parse(svg.c_str(), svg.size()), tinyxml2::XML_SUCCESS) << doc->ErrorStr();
}

TEST(LinePlot, ALogAxisTicksEveryDecadeItsDataSpans) {
  LinePlot plot;
  plot.kind = "bode";
  plot.title = "gain";
  plot.y_label = "|L| (dB)";
  plot.x_label = "frequency (rad/s)";
  plot.x_log10 = true;
  plot.series.push_back({"lqr", 0, false, {0.3, 3, 30, 250}, {40, 20, 0, -20}});
  const std::string svg = RenderLinePlot(plot, 480);
  tinyxml2::XMLDocument doc;
  Parse(svg, &doc);
  std::vector<std::string> labels;
  for (const XMLElement* text : Elements(doc.RootElement(), "text")) labels.push_back(TextOf(text));
  // 0.3 to 250 rad/s: the decades 0.1 to 1000, each labelled with its value.
  for (const char* decade : {"0.1", "1", "10", "100", "1000"}) {
    EXPECT_NE(std::find(labels.begin(), labels.end(), decade), labels.end()) << decade;
  }
  EXPECT_NE(std::find(labels.begin(), labels.end(), "frequency (rad/s)"), labels.end());
  EXPECT_NE(Attribute(doc.RootElement(), "aria-label").find("against frequency (rad/s)"),
            std::string::npos);
}

TEST(LinePlot, AFixedWindowWithEqualScalesClipsAndKeepsGuidesOutOfTheLegend) {
  LinePlot plot;
  plot.kind = "nyquist";
  plot.title = "Nyquist";
  plot.y_label = "imaginary part";
  plot.x_label = "real part";
  plot.x_lo = -3;
  plot.x_hi = 1;
  plot.y_lo = -1;
  plot.y_hi = 1;
  plot.equal_aspect = true;
  plot.height_px = 470;
  plot.series.push_back({"lqr", 0, false, {-50, -1, 0.5}, {-80, 0.2, 30}});
  PlotSeries circle;
  circle.name = "unit circle";
  circle.guide = true;
  circle.time_s = {1, 0, -1, 0, 1};
  circle.value = {0, 1, 0, -1, 0};
  plot.series.push_back(circle);
  const std::string svg = RenderLinePlot(plot, 480);
  tinyxml2::XMLDocument doc;
  Parse(svg, &doc);
  EXPECT_EQ(svg.find("unit circle"), std::string::npos) << "a guide is not in the legend";
  // The lines sit in a nested viewport the size of the plot area: what leaves it is clipped.
  const std::vector<const XMLElement*> svgs = Elements(doc.RootElement(), "svg");
  ASSERT_EQ(svgs.size(), 2u);
  const XMLElement* area = svgs[1];
  EXPECT_EQ(Attribute(area, "overflow"), "hidden");
  const std::vector<double> box = Numbers(Attribute(area, "viewBox"));
  ASSERT_EQ(box.size(), 4u);
  // Equal scales: 4 units of x over the area's width, so the y window spans width/height less.
  const double px_per_unit = box[2] / 4;
  const std::vector<const XMLElement*> paths = Elements(area, "path");
  ASSERT_EQ(paths.size(), 2u);
  // The circle (drawn first, under the data) is as tall as it is wide: from its path's points.
  const std::string d = Attribute(paths[0], "d");
  const std::regex number(R"(-?[0-9]*\.?[0-9]+)");
  std::vector<double> v;
  for (std::sregex_iterator it(d.begin(), d.end(), number), end; it != end; ++it) {
    v.push_back(std::stod(it->str()));  // pixels, to a tenth
  }
  // M x0 y0, then relative steps: (1,0) → (0,1) → (−1,0) → (0,−1) → (1,0).
  ASSERT_EQ(v.size(), 10u);
  const double dx1 = v[2], dy1 = v[3];
  EXPECT_NEAR(std::abs(dx1), px_per_unit, 0.15);
  EXPECT_NEAR(std::abs(dy1), px_per_unit, 0.15);
}

using Outcome = testing::ProgramOutcome;

Outcome RunUpright(const std::string& arguments) {
  return testing::RunProgram(UPRIGHT_EXE, arguments);
}

std::string Courier() { return std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml"; }

// The design folder of the courier, made once.
const fs::path& DesignFolder() {
  static const fs::path dir = [] {
    const fs::path d = ScratchDir("design-report") / "courier";  // made by the command
    const Outcome o = RunUpright("design " + Courier() + " --report " + d.string());
    EXPECT_EQ(o.code, 0) << o.out;
    EXPECT_NE(o.out.find("design report: " + (d / kReportFileName).string()), std::string::npos)
        << o.out;
    return d;
  }();
  return dir;
}

TEST(DesignReport, WritesTheCurvesTheMarginsAndOneSectionOfNinePlots) {
  const fs::path& dir = DesignFolder();
  for (const char* file :
       {"loop_response.csv", "push_response.csv", "margins.csv", "manifest.json", "report.html"}) {
    EXPECT_TRUE(fs::is_regular_file(dir / file)) << file;
  }
  testing::Report report;
  testing::MakeAndParse(dir, {}, &report);
  std::map<std::string, int> plots;
  for (const XMLElement* svg : Elements(report.doc.RootElement(), "svg")) {
    const std::string kind = Attribute(svg, "data-plot");
    if (!kind.empty()) ++plots[kind];
  }
  const std::map<std::string, int> expected = {{"design-bode-magnitude-one_wheel", 1},
                                               {"design-bode-phase-one_wheel", 1},
                                               {"design-nyquist-one_wheel", 1},
                                               {"design-bode-magnitude-both_wheels", 1},
                                               {"design-bode-phase-both_wheels", 1},
                                               {"design-nyquist-both_wheels", 1},
                                               {"design-push-pitch", 1},
                                               {"design-push-position", 1},
                                               {"design-push-current", 1}};
  EXPECT_EQ(plots, expected);
  // The model file is listed with its digest, the section named after the robot.
  EXPECT_NE(report.html.find("Design: courier"), std::string::npos);
  const Result<std::string> sha = Sha256OfFile(Courier());
  ASSERT_TRUE(sha) << sha.error();
  EXPECT_NE(report.html.find(*sha), std::string::npos);
}

TEST(DesignReport, TheFilesCarryTheFiguresDesignPrints) {
  // margins.csv against `design --json` of the same model: the same analysis, the CSV rounded to
  // six significant digits.
  const fs::path& dir = DesignFolder();
  const Outcome json = RunUpright("design " + Courier() + " --json");
  ASSERT_EQ(json.code, 0) << json.out;
  const nlohmann::json design = nlohmann::json::parse(json.out.substr(json.out.find('{')));
  const Result<CsvTable> margins = ReadCsvFile((dir / "margins.csv").string());
  ASSERT_TRUE(margins) << margins.error();
  const int controller = margins->Column("controller"), loop = margins->Column("loop"),
            model = margins->Column("model"), phase = margins->Column("phase_deg"),
            delay = margins->Column("delay_ms");
  int checked = 0;
  for (const auto& row : margins->rows) {
    if (row[loop] != "one_wheel" || row[model] != "continuous") continue;
    const nlohmann::json& m = design.at(row[controller]).at("margins");
    EXPECT_NEAR(CsvNumber(row[phase]), m.at("phase_deg").get<double>(),
                1e-5 * std::abs(m.at("phase_deg").get<double>()))
        << row[controller];
    EXPECT_NEAR(CsvNumber(row[delay]), 1e3 * m.at("delay_s").get<double>(),
                1e-5 * 1e3 * m.at("delay_s").get<double>())
        << row[controller];
    ++checked;
  }
  EXPECT_EQ(checked, 4);
  // Every continuous curve runs over whole decades; every sampled one stops below the Nyquist
  // frequency of the courier's 200 Hz.
  const Result<CsvTable> curves = ReadCsvFile((dir / "loop_response.csv").string());
  ASSERT_TRUE(curves) << curves.error();
  const int omega = curves->Column("omega_rad_s"), curve_model = curves->Column("model");
  double continuous_hi = 0, sampled_hi = 0;
  for (const auto& row : curves->rows) {
    double& hi = row[curve_model] == "sampled" ? sampled_hi : continuous_hi;
    hi = std::max(hi, CsvNumber(row[omega]));
  }
  EXPECT_EQ(continuous_hi, 1000);
  EXPECT_LT(sampled_hi, M_PI * 200);
  EXPECT_GT(sampled_hi, 0.9 * M_PI * 200);
}

TEST(DesignReport, RefusesAFileForItsFolderBeforeDesigning) {
  const fs::path dir = ScratchDir("design-report-refused");
  const fs::path file = dir / "taken";
  std::ofstream(file) << "x";
  const Outcome o = RunUpright("design " + Courier() + " --report " + file.string());
  EXPECT_EQ(o.code, 2) << o.out;
  EXPECT_NE(o.out.find("--report " + file.string() + ": is a file, not a folder"),
            std::string::npos)
      << o.out;
  EXPECT_EQ(o.out.find("LQR"), std::string::npos) << "nothing designed: " << o.out;
}

TEST(DesignReport, AMarginsFileWithoutItsColumnsIsRefusedWithItsLine) {
  const fs::path dir = ScratchDir("design-report-broken");
  for (const char* file : {"loop_response.csv", "push_response.csv", "manifest.json"}) {
    fs::copy_file(DesignFolder() / file, dir / file, fs::copy_options::overwrite_existing);
  }
  std::ofstream(dir / "margins.csv") << "controller,status\nlqr,ok\n";
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().problem, ReportProblem::kBadInput);
  EXPECT_EQ(made.error().message,
            (dir / "margins.csv").string() + ":1: no column 'reason' in the header");
}

}  // namespace
}  // namespace upright::runner
