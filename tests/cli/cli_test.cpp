// End-to-end tests of the `upright` program: exit codes, messages with path:line, runs and the
// demo suite.
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>
#include <utility>

namespace {

struct Result {
  int exit_code = -1;
  std::string output;  // stdout and stderr together
};

// Runs `upright ARGS` (in folder `cwd` when given) and collects its output and exit code.
Result RunUpright(const std::string& args, const std::string& cwd = "") {
  Result r;
  const std::string command =
      (cwd.empty() ? "" : "cd " + cwd + " && ") + std::string(UPRIGHT_EXE) + " " + args + " 2>&1";
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return r;
  std::array<char, 4096> buffer;
  size_t n;
  while ((n = fread(buffer.data(), 1, buffer.size(), pipe)) > 0) r.output.append(buffer.data(), n);
  const int status = pclose(pipe);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

std::string Models() { return std::string(UPRIGHT_SOURCE_DIR) + "/models/"; }

// Writes `text` to `name` in this test process's temporary folder; returns the path.
std::string WriteTemp(const std::string& name, const std::string& text) {
  const auto dir =
      std::filesystem::temp_directory_path() / ("upright_cli_" + std::to_string(getpid()));
  std::filesystem::create_directories(dir);
  const auto path = (dir / name).string();
  std::ofstream(path) << text;
  return path;
}

// A copy of a demo model with its first `from` replaced by `to`.
std::string BrokenCopy(const std::string& name, const std::string& from, const std::string& to) {
  std::ifstream in(Models() + name);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  const auto at = text.find(from);
  EXPECT_NE(at, std::string::npos) << from;
  if (at != std::string::npos) text.replace(at, from.size(), to);
  return WriteTemp(name, text);
}

TEST(Cli, VersionPrintsTheToolVersion) {
  const Result r = RunUpright("--version");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.output.find("upright 0."), std::string::npos) << r.output;
}

TEST(Cli, HelpListsTheCommandsAndTheSafetyCaution) {
  const Result r = RunUpright("--help");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.output.find("check"), std::string::npos);
  EXPECT_NE(r.output.find("demo"), std::string::npos);
  EXPECT_NE(r.output.find("never certify"), std::string::npos);
}

TEST(Cli, NoCommandIsAUsageError) { EXPECT_EQ(RunUpright("").exit_code, 2); }

TEST(Cli, CheckAcceptsTheDemoModels) {
  const Result r = RunUpright("check " + Models() + "courier.xml " + Models() + "tabletop.xml");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("courier.xml: ok"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("tabletop.xml: ok"), std::string::npos) << r.output;
}

TEST(Cli, CheckReportsABrokenModelWithItsLineAndExitsTwo) {
  const std::string bad = BrokenCopy("courier.xml", "mass_kg=\"24\"", "mass_kg=\"-24\"");
  const Result r = RunUpright("check " + Models() + "tabletop.xml " + bad);
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find(bad + ":22: chassis mass_kg = -24"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("1 of 2 file(s) invalid"), std::string::npos) << r.output;
}

TEST(Cli, CheckRejectsAMissingFileAndAnUnknownRoot) {
  EXPECT_EQ(RunUpright("check /nonexistent/robot.xml").exit_code, 2);
  const std::string other = WriteTemp("vehicle.xml", "<vehicle name=\"x\"/>\n");
  const Result r = RunUpright("check " + other);
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find("<vehicle>"), std::string::npos) << r.output;
}

TEST(Cli, CheckTellsASchemaOneModelTheNamesThatReplacedItsOwn) {
  std::ifstream in(Models() + "courier.xml");
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  for (const auto& [from, to] : {std::pair<std::string, std::string>{"balancer", "robot"},
                                 {"balancer", "robot"},
                                 {"schema=\"2\"", "schema=\"1\""},
                                 {"<principal_moments ", "<inertia "}}) {
    const auto at = text.find(from);
    ASSERT_NE(at, std::string::npos) << from;
    text.replace(at, from.size(), to);
  }
  const std::string old = WriteTemp("courier-schema-1.xml", text);
  const Result r = RunUpright("check " + old);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(old +
                          ":21: <robot> is the former name of this file's root element: "
                          "rename it <balancer> (schema 2)\n" +
                          old +
                          ":23: chassis: <inertia> is the former name of this element: "
                          "rename it <principal_moments> (schema 2)\n"),
            std::string::npos)
      << r.output;
  const std::string other = WriteTemp("vehicle.xml", "<vehicle name=\"x\"/>\n");
  EXPECT_NE(RunUpright("check " + other).output.find("(expected <balancer> or <scenario>)"),
            std::string::npos);
}

TEST(Cli, DesignPrintsEveryControllerForBothDemoRobots) {
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const Result r = RunUpright("design " + Models() + name);
    EXPECT_EQ(r.exit_code, 0) << r.output;
    for (const char* part : {"== LQR: ok", "== H-infinity state feedback: ok", "gamma_opt",
                             "== LQG", "== PID cascade", "input margins", "push norm",
                             "sampled as the module runs it"}) {
      EXPECT_NE(r.output.find(part), std::string::npos) << name << ": " << part;
    }
  }
}

TEST(Cli, DesignJsonCarriesTheDocumentedKeys) {
  const Result r = RunUpright("design --json " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  for (const char* key :
       {"\"A\":[[", "\"B\":[[", "\"lqr\":{", "\"hinf\":{", "\"lqg\":{", "\"K\":[[", "\"poles\":[[",
        "\"gamma\":", "\"gamma_opt\":", "\"norm\":", "\"margins\":{",
        "\"gain_low\":", "\"gain_high\":", "\"phase_deg\":", "\"disk_alpha\":", "\"delay_s\":",
        "\"sampled\":{", "\"max_abs_z\":"}) {
    EXPECT_NE(r.output.find(key), std::string::npos) << key;
  }
  EXPECT_EQ(r.output.front(), '{');
}

TEST(Cli, DesignNotesAnEstimatorFasterThanItsSamplingOnlyThen) {
  // The note appears exactly when the continuous estimator's fastest pole, printed in the JSON,
  // is beyond the Nyquist rate π · rate_hz of the control rate.
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const Result json = RunUpright("design --json " + Models() + name);
    const std::string key = "\"estimator_fastest_1_s\":";
    const auto at = json.output.find(key);
    ASSERT_NE(at, std::string::npos) << json.output;
    const double fastest = std::stod(json.output.substr(at + key.size()));
    const Result text = RunUpright("design " + Models() + name);
    const std::string rate_key = "controllers at ";
    const auto rate_at = text.output.find(rate_key);
    ASSERT_NE(rate_at, std::string::npos) << text.output;
    const double rate_hz = std::stod(text.output.substr(rate_at + rate_key.size()));
    const bool beyond = fastest > 3.141592653589793 * rate_hz;
    EXPECT_EQ(text.output.find("note: the continuous estimator reaches") != std::string::npos,
              beyond)
        << name << ": fastest " << fastest << " 1/s\n" << text.output;
  }
}

TEST(Cli, DesignWithAnInfeasibleGammaExitsOneWithTheReason) {
  const Result r = RunUpright("design --gamma 0.001 " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 1) << r.output;
  EXPECT_NE(r.output.find("design failed: H-infinity at gamma = 0.001"), std::string::npos)
      << r.output;
}

TEST(Cli, DesignRejectsBadWeightsAsBadInput) {
  const Result r = RunUpright("design --max-tilt-deg -1 " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("DesignWeights::max_tilt_deg = -1, must be > 0"), std::string::npos)
      << r.output;
}

// A short scenario for the courier robot: two built-ins, a half-sine shove.
std::string ShortScenario(const std::string& name, const std::string& extra = "") {
  return WriteTemp(name + ".xml", R"(<scenario name=")" + name + R"(" schema="1" duration_s="2">
  <description>Test: a parked courier shoved once.</description>
  <robot file=")" + Models() + R"(courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N="80" duration_s="0.2"/>
  </timeline>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>)" +
                                      extra + R"(
  </controllers>
</scenario>)");
}

std::filesystem::path TempOut(const std::string& name) {
  const auto dir =
      std::filesystem::temp_directory_path() / ("upright_cli_" + std::to_string(getpid())) / name;
  std::filesystem::remove_all(dir);
  return dir;
}

std::size_t CountFiles(const std::filesystem::path& dir) {
  std::size_t n = 0;
  for (const auto& e : std::filesystem::recursive_directory_iterator(dir)) n += e.is_regular_file();
  return n;
}

TEST(Cli, CheckAcceptsEveryDemoScenario) {
  std::string args = "check";
  for (const auto& e :
       std::filesystem::directory_iterator(std::string(UPRIGHT_SOURCE_DIR) + "/scenarios")) {
    if (e.path().extension() == ".xml") args += " " + e.path().string();
  }
  const Result r = RunUpright(args);
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("ok (scenario 'courier-shove-half-sine', robot 'courier'"),
            std::string::npos)
      << r.output;
}

// A controller element the short scenario ends with: it lands on line 10.
constexpr int kExtraControllerLine = 10;

// `upright check` on the short scenario with `extra` controllers: exit 2 and one problem, at the
// first extra controller's line, whose message starts with `message`.
void ExpectCheckRefusesController(const std::string& name, const std::string& extra,
                                  const std::string& message) {
  const std::string path = ShortScenario(name, extra);
  const Result r = RunUpright("check " + path);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  const std::string problem = path + ":" + std::to_string(kExtraControllerLine) + ": " + message;
  EXPECT_EQ(r.output.substr(0, problem.size()), problem);
  const std::string last = "\n1 of 1 file(s) invalid\n";
  ASSERT_GE(r.output.size(), last.size());
  EXPECT_EQ(r.output.find('\n'), r.output.size() - last.size()) << "one problem only:\n"
                                                                << r.output;
}

TEST(Cli, CheckRefusesAMisspeltBuiltinSettingAsARunWould) {
  ExpectCheckRefusesController("typo", R"(
    <controller name="lqr-typo" builtin="lqr">
      <setting key="max_tilt" value="10"/>
    </controller>)",
                               "controller 'lqr-typo': create failed (status 2): unknown key "
                               "max_tilt (= 10); known keys: state, input, ");
}

TEST(Cli, CheckRefusesABadBuiltinSettingValue) {
  ExpectCheckRefusesController("badvalue", R"(
    <controller name="pid-slow" builtin="pid">
      <setting key="input" value="voltage"/>
    </controller>)",
                               "controller 'pid-slow': create failed (status 2): input = voltage: "
                               "this controller commands torque only");
}

TEST(Cli, CheckRefusesAModuleFileThatRefusesItsSettings) {
  const std::string module = std::string(UPRIGHT_TEST_MODULE_DIR) + "/faulty_5.so";
  ExpectCheckRefusesController("refusing", R"(
    <controller name="mine" file=")" + module + R"("/>)",
                               "controller 'mine': create failed (status 2): gain = banana: must "
                               "be a number");
}

TEST(Cli, CheckRefusesAModuleFileThatWillNotLoad) {
  const std::string module = std::string(UPRIGHT_TEST_MODULE_DIR) + "/faulty_3.so";
  const std::string why =
      ": built for controller ABI version 99, this program speaks version 1; rebuild it against "
      "this version's upright/controller_abi.h";
  ExpectCheckRefusesController("unloadable", R"(
    <controller name="mine" file=")" + module + R"("/>)",
                               "controller 'mine': " + module + why);
}

TEST(Cli, CheckRefusesAMissingModuleFile) {
  ExpectCheckRefusesController("missing-module", R"(
    <controller name="mine" file="/nonexistent/mine.so"/>)",
                               "controllers/controller file = '/nonexistent/mine.so': no such "
                               "file (resolved to '/nonexistent/mine.so')");
}

TEST(Cli, CheckRefusesAModelWhoseImuMissesTheDefaultStep) {
  const std::string bad =
      BrokenCopy("courier.xml", R"(<imu rate_hz="1000")", R"(<imu rate_hz="400")");
  const Result r = RunUpright("check " + bad);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(bad + ":32: sensors/imu rate_hz = 400: its period is 2.5 physics "
                                "steps of the default dt_s = 0.001 s"),
            std::string::npos)
      << r.output;
}

TEST(Cli, CheckOfAFolderChecksItsXmlFilesOnly) {
  namespace fs = std::filesystem;
  const auto folder = TempOut("folder");
  fs::create_directories(folder / "sub");
  fs::copy_file(Models() + "tabletop.xml", folder / "b.xml");
  fs::copy_file(BrokenCopy("courier.xml", "mass_kg=\"24\"", "mass_kg=\"-24\""), folder / "a.xml");
  std::ofstream(folder / "notes.txt") << "not a model\n";
  fs::copy_file(Models() + "tabletop.xml", folder / "sub" / "c.xml");  // not looked into
  const Result r = RunUpright("check " + folder.string());
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find((folder / "a.xml").string() + ":22: chassis mass_kg = -24"),
            std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find((folder / "b.xml").string() + ": ok (robot model 'tabletop')\n"),
            std::string::npos)
      << r.output;
  EXPECT_EQ(r.output.find("c.xml"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("1 of 2 file(s) invalid"), std::string::npos) << r.output;

  const auto empty = TempOut("empty-folder");
  fs::create_directories(empty);
  const Result none = RunUpright("check " + empty.string());
  EXPECT_EQ(none.exit_code, 2) << none.output;
  EXPECT_EQ(none.output, empty.string() +
                             ": a folder with no .xml files (expected robot model or scenario "
                             "files, or a folder of them)\n1 of 1 file(s) invalid\n");
}

TEST(Cli, RunWritesEveryResultFileAndSaysWhere) {
  const auto out = TempOut("run");
  const Result r = RunUpright("run " + ShortScenario("short") + " --out " + out.string() +
                              " --jobs 2 --seeds 2");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("4 run(s)"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find(out.string() + "/summary.md"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("Simulation only"), std::string::npos) << r.output;
  for (const char* name : {"summary.csv", "summary.md", "compare.csv", "compare.md", "ranking.csv",
                           "ranking.md", "manifest.json"}) {
    EXPECT_TRUE(std::filesystem::is_regular_file(out / name)) << name;
  }
  // 2 controllers × 2 seeds: four traces, and nothing else (no temporary left behind).
  EXPECT_EQ(CountFiles(out / "traces"), 4u);
  EXPECT_EQ(CountFiles(out), 7u + 4u);
  std::ifstream summary(out / "summary.csv");
  std::string header;
  std::getline(summary, header);
  EXPECT_EQ(header.rfind("scenario,controller,seed,", 0), 0u) << header;
}

TEST(Cli, LinearTwinAddsTheGapTables) {
  const auto out = TempOut("twin");
  const Result r = RunUpright("run " + ShortScenario("twin") + " --out " + out.string() +
                              " --linear-twin --trace-rate 0");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find(out.string() + "/gap.md"), std::string::npos) << r.output;
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "gap.csv"));
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "gap.md"));
}

TEST(Cli, RunRejectsAnInvalidScenarioWithItsLineAndRunsNothing) {
  const auto out = TempOut("invalid");
  const std::string path = ShortScenario("invalid", R"(
    <controller name="lqr" builtin="lqr"/>)");
  const Result r = RunUpright("run " + path + " --out " + out.string());
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(path + ":"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("nothing was run"), std::string::npos) << r.output;
  EXPECT_FALSE(std::filesystem::exists(out));
}

TEST(Cli, RunWithABrokenModuleFileExitsOneAndStillWritesTheTables) {
  const auto out = TempOut("missing");
  const std::string not_a_module = WriteTemp("not_a_module.so", "plain text\n");
  const Result r = RunUpright("run " + ShortScenario("missing", R"(
    <controller name="mine" file=")" + not_a_module + R"("/>)") +
                              " --out " + out.string() + " --trace-rate 0");
  EXPECT_EQ(r.exit_code, 1) << r.output;
  EXPECT_NE(r.output.find("missing / mine: "), std::string::npos) << r.output;
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "summary.csv"));
}

TEST(Cli, DemoRunsTheWholeSuiteIntoResultsDemo) {
  const auto cwd = TempOut("demo");
  std::filesystem::create_directories(cwd);
  const Result demo = RunUpright("demo --jobs 2 --trace-rate 10 --seeds 1", cwd.string());
  ASSERT_EQ(demo.exit_code, 0) << demo.output;
  EXPECT_NE(demo.output.find("results/demo/summary.md"), std::string::npos) << demo.output;
  const auto out = cwd / "results" / "demo";
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "ranking.md"));
  // Every demo scenario compares at least the four built-ins: one trace per scenario × controller.
  std::size_t scenarios = 0;
  for (const auto& e :
       std::filesystem::directory_iterator(std::string(UPRIGHT_SOURCE_DIR) + "/scenarios")) {
    scenarios += e.path().extension() == ".xml";
  }
  EXPECT_GE(CountFiles(out / "traces"), 4 * scenarios);
}

}  // namespace
