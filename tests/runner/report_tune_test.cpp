// The tune section of the report: the best objective so far counts only settings that survived
// and met the bounds, the default-against-tuned table takes the tuned evaluation the manifest
// names, the ranking at their best pairs each controller's two ranks, and a tune.csv without a
// column it needs is refused with its line. The folder is written by hand, so every cell is known.
#include <gtest/gtest.h>
#include <tinyxml2.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "report_xml.hpp"
#include "run_test_support.hpp"
#include "tune_convergence.hpp"
#include "upright/runner/report/report.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using internal::BestSoFar;
using testing::Attribute;
using testing::Elements;
using testing::PlotOf;
using testing::Report;
using testing::ScratchDir;
using testing::TextOf;
using tinyxml2::XMLElement;

TEST(TuneConvergence, CountsOnlySettingsThatSurvivedAndMetTheBounds) {
  // A fall (10⁶ and more) and a setting that missed a bound never count, however low.
  const std::vector<double> best =
      BestSoFar({20, 1e6 + 0.5, 18, 19, 17, 17.5}, {true, false, true, true, false, true});
  EXPECT_EQ(best, (std::vector<double>{20, 20, 18, 18, 18, 17.5}));
  // Nothing until the first that counts; a NaN objective never counts.
  const std::vector<double> late = BestSoFar({1.5e6, std::nan(""), 25}, {false, true, true});
  ASSERT_EQ(late.size(), 3u);
  EXPECT_TRUE(std::isnan(late[0]));
  EXPECT_TRUE(std::isnan(late[1]));
  EXPECT_EQ(late[2], 25);
  EXPECT_TRUE(BestSoFar({}, {}).empty());
}

// A tune folder: lqr's tuned setting is evaluation 2, pid's default falls and evaluation 1 is
// its tuned one; the held-out replays ranked pid first when tuned, lqr first as designed.
fs::path TuneFolder(const std::string& name, bool with_feasible = true) {
  const fs::path dir = ScratchDir(name);
  std::ofstream(dir / "tune.csv") << "controller,evaluation,stage,settings,objective,"
                                  << (with_feasible ? "feasible," : "") << "survived,runs,failure\n"
                                  << (with_feasible ? R"(lqr,0,default,as the scenario,20,true,3,3,
lqr,1,global,max_tilt_deg=2,1000000.5,false,2,3,shove seed 2: fell
lqr,2,global,max_tilt_deg=3,18,true,3,3,
lqr,3,local,max_tilt_deg=4,19,true,3,3,
lqr,4,local,max_tilt_deg=5,17,false,3,3,
lqr,0,held_out,as the scenario,20.5,true,3,3,
lqr,2,held_out,max_tilt_deg=3,18.5,true,3,3,
pid,0,default,as the scenario,1500000,false,0,3,shove seed 1: fell
pid,1,global,max_tilt_deg=6,25,true,3,3,
)"
                                                    : "lqr,0,default,as the scenario,20,3,3,\n");
  std::ofstream(dir / "manifest.json") << R"({
  "tool_version": "test",
  "command": "tune",
  "scenarios": [{"name": "shove", "path": "shove.xml", "sha256": "00"}],
  "search_seed": 7,
  "evaluations": 5,
  "runs_per_evaluation": 3,
  "objective": "1 × max_tilt_deg + 10 × max_drift_m",
  "bounds": ["peak_current_A <= 18"],
  "controllers": [{"name": "lqr", "best_evaluation": 2}, {"name": "pid", "best_evaluation": 1}]
}
)";
  // The fronts of max_tilt_deg against energy_J: two settings of lqr, one of pid.
  std::ofstream(dir / "pareto.csv")
      << "controller,mean_max_tilt_deg,mean_energy_J,evaluation,settings\n"
      << "lqr,7.5,30,2,max_tilt_deg=3\nlqr,8.5,20,4,max_tilt_deg=5\npid,6,40,1,max_tilt_deg=6\n";
  for (const auto& [folder, rows] : {std::pair{"tuned", "1,pid,3,3\n2,lqr,3,3\n"},
                                     std::pair{"defaults", "1,lqr,3,3\n2,pid,0,3\n"}}) {
    fs::create_directories(dir / folder);
    std::ofstream(dir / folder / "ranking.csv") << "rank,controller,survived,runs\n" << rows;
  }
  return dir;
}

// The rows of the table captioned `caption`, each as its cells' text.
std::vector<std::vector<std::string>> TableRows(const XMLElement* root,
                                                const std::string& caption) {
  for (const XMLElement* table : Elements(root, "table")) {
    const XMLElement* c = table->FirstChildElement("caption");
    if (c == nullptr || TextOf(c).rfind(caption, 0) != 0) continue;
    std::vector<std::vector<std::string>> rows;
    for (const XMLElement* tr : Elements(table, "tr")) {
      std::vector<std::string> cells;
      for (const XMLElement* td : Elements(tr, "td")) cells.push_back(TextOf(td));
      if (!cells.empty()) rows.push_back(cells);
    }
    return rows;
  }
  ADD_FAILURE() << "no table captioned " << caption;
  return {};
}

TEST(TuneReport, DrawsTheSearchTheTunedSettingsAndTheRankingAtTheirBest) {
  Report report;
  testing::MakeAndParse(TuneFolder("tune-report"), ReportOptions{}, &report);
  const XMLElement* root = report.doc.RootElement();
  EXPECT_NE(report.html.find("Budget: 5 evaluations of 3 run(s) per controller, search seed 7"),
            std::string::npos);
  EXPECT_NE(report.html.find("Subject to (the worst run): peak_current_A &lt;= 18."),
            std::string::npos);
  const XMLElement* plot = PlotOf(root, "tune-convergence");
  ASSERT_NE(plot, nullptr);
  const std::string legend = TextOf(plot);
  EXPECT_NE(legend.find("lqr"), std::string::npos);
  EXPECT_NE(legend.find("pid"), std::string::npos);

  // The fronts: a line and a mark per setting, each controller in its style, named on its axes.
  const XMLElement* fronts = PlotOf(root, "tune-pareto");
  ASSERT_NE(fronts, nullptr);
  const std::string text = TextOf(fronts);
  EXPECT_NE(text.find("max_tilt_deg (mean over the runs)"), std::string::npos) << text;
  EXPECT_NE(text.find("energy_J"), std::string::npos) << text;

  const auto tuned = TableRows(root, "Default against tuned objective");
  ASSERT_EQ(tuned.size(), 2u);
  EXPECT_EQ(tuned[0], (std::vector<std::string>{"lqr", "20", "18", "20.5", "18.5", "2 (global)",
                                                "max_tilt_deg=3"}));
  EXPECT_EQ(tuned[1], (std::vector<std::string>{"pid", "falls", "25", "–", "–", "1 (global)",
                                                "max_tilt_deg=6"}));
  const auto ranking = TableRows(root, "Ranking at their best");
  ASSERT_EQ(ranking.size(), 2u);
  EXPECT_EQ(ranking[0], (std::vector<std::string>{"1", "pid", "3/3", "2", "0/3"}));
  EXPECT_EQ(ranking[1], (std::vector<std::string>{"2", "lqr", "3/3", "1", "3/3"}));
}

TEST(TuneReport, AFrontThatIsNotNumbersIsRefusedWithItsLine) {
  const fs::path dir = TuneFolder("tune-report-front");
  std::ofstream(dir / "pareto.csv") << "controller,mean_max_tilt_deg,mean_energy_J,evaluation,"
                                       "settings\nlqr,7.5,30,2,a\nlqr,tall,20,4,b\n";
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().message,
            (dir / "pareto.csv").string() + ":3: a front's figures must be numbers");
}

TEST(TuneReport, ATuneTableWithoutItsColumnsIsRefusedWithItsLine) {
  const fs::path dir = TuneFolder("tune-report-broken", /*with_feasible=*/false);
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string());
  ASSERT_FALSE(made);
  EXPECT_EQ(made.error().problem, ReportProblem::kBadInput);
  EXPECT_EQ(made.error().message,
            (dir / "tune.csv").string() + ":1: no column 'feasible' in the header");
}

}  // namespace
}  // namespace upright::runner
