// End-to-end tests of the `upright` program: exit codes, messages with path:line, the demo.
#include <gtest/gtest.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>
#include <sys/wait.h>
#include <unistd.h>

namespace {

struct Result {
  int exit_code = -1;
  std::string output;  // stdout and stderr together
};

Result RunUpright(const std::string& args) {
  Result r;
  const std::string command = std::string(UPRIGHT_EXE) + " " + args + " 2>&1";
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

TEST(Cli, DesignPrintsEveryControllerForBothDemoRobots) {
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const Result r = RunUpright("design " + Models() + name);
    EXPECT_EQ(r.exit_code, 0) << r.output;
    for (const char* part : {"== LQR: ok", "== H-infinity state feedback: ok", "gamma_opt",
                             "== LQG", "== PID cascade", "input margins", "push norm"}) {
      EXPECT_NE(r.output.find(part), std::string::npos) << name << ": " << part;
    }
  }
}

TEST(Cli, DesignJsonCarriesTheDocumentedKeys) {
  const Result r = RunUpright("design --json " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  for (const char* key : {"\"A\":[[", "\"B\":[[", "\"lqr\":{", "\"hinf\":{", "\"lqg\":{",
                          "\"K\":[[", "\"poles\":[[", "\"gamma\":", "\"gamma_opt\":",
                          "\"norm\":", "\"margins\":{", "\"gain_low\":", "\"gain_high\":",
                          "\"phase_deg\":", "\"disk_alpha\":", "\"delay_s\":"}) {
    EXPECT_NE(r.output.find(key), std::string::npos) << key;
  }
  EXPECT_EQ(r.output.front(), '{');
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

TEST(Cli, DemoBalancesThroughThePush) {
  const Result r = RunUpright("demo --duration-s 3");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("balanced for 3.0 s"), std::string::npos) << r.output;
}

TEST(Cli, DemoFailsWhenTheRobotFalls) {
  // A shove of 20 times the robot's weight knocks any balance law over.
  const Result r = RunUpright("demo --duration-s 3 --push-N 6000");
  EXPECT_EQ(r.exit_code, 1) << r.output;
  EXPECT_NE(r.output.find("fell"), std::string::npos) << r.output;
}

}  // namespace
