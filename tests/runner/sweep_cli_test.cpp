// `upright sweep` as a user runs it: exit codes and messages for bad input and a module that will
// not load, and a tiny sweep writing its three files.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "run_test_support.hpp"
#include "upright/runner/sweep/sweep_writer.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using testing::ProgramOutcome;
using testing::ReadFile;
using testing::ScratchDir;

// `upright ARGUMENTS`: its exit code and output.
ProgramOutcome RunUpright(const std::string& arguments) {
  return testing::RunProgram(UPRIGHT_EXE, arguments);
}

const std::string kScenarios = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";

std::string TinyScenario(const std::string& controller_line) {
  return R"(<scenario name="tiny" schema="1" duration_s="0.5">
  <description>Test: a light knock on a parked courier.</description>
  <robot file=")" +
         kScenarios + R"(/../models/courier.xml"/>
  <timeline>
    <push at_s="0.1" shape="impulse" peak_N="60" duration_s="0.05"/>
  </timeline>
  <controllers>
    )" + controller_line +
         R"(
  </controllers>
  <dispersions>
    <spread param="timeline/push[1].peak_N" kind="normal" sd="10"/>
  </dispersions>
</scenario>
)";
}

TEST(SweepCommand, SaysHowToDeclareDispersionsWhenThereAreNone) {
  const ProgramOutcome o =
      RunUpright("sweep " + kScenarios + "/courier-bump-impulse.xml --samples 3");
  EXPECT_EQ(o.code, 2) << o.out;
  EXPECT_NE(o.out.find("declares no dispersions"), std::string::npos) << o.out;
  EXPECT_NE(o.out.find("<spread param=\"robot/chassis.mass_kg\" kind=\"normal\""),
            std::string::npos)
      << o.out;
}

TEST(SweepCommand, RefusesBadInput) {
  EXPECT_EQ(RunUpright("sweep /nonexistent/s.xml --samples 3").code, 2);
  EXPECT_EQ(RunUpright("sweep " + kScenarios + "/courier-shove-half-sine.xml --samples 0").code, 2);
}

TEST(SweepCommand, FailsWhenAModuleCannotLoad) {
  const fs::path dir = ScratchDir("sweep-cli-module");
  std::ofstream(dir / "not_a_module.so") << "stand-in";
  std::ofstream(dir / "tiny.xml") << TinyScenario(
      R"(<controller name="mine" file="not_a_module.so"/>)");
  const ProgramOutcome o = RunUpright("sweep " + (dir / "tiny.xml").string() +
                                      " --samples 2 --out " + (dir / "out").string());
  EXPECT_EQ(o.code, 1) << o.out;
  EXPECT_NE(o.out.find("controller 'mine'"), std::string::npos) << o.out;
  EXPECT_FALSE(fs::exists(dir / "out" / "sweep.csv"));
}

TEST(SweepCommand, WritesTheThreeFiles) {
  const fs::path dir = ScratchDir("sweep-cli-tiny");
  std::ofstream(dir / "tiny.xml") << TinyScenario(R"(<controller name="lqr" builtin="lqr"/>)");
  const ProgramOutcome o =
      RunUpright("sweep " + (dir / "tiny.xml").string() + " --samples 2 --seed 9 --jobs 1 --out " +
                 (dir / "out").string());
  EXPECT_EQ(o.code, 0) << o.out;
  EXPECT_NE(o.out.find("lqr"), std::string::npos) << o.out;
  for (const std::string& name : SweepFileNames()) {
    EXPECT_TRUE(fs::exists(dir / "out" / name)) << name;
  }
  EXPECT_NE(ReadFile(dir / "out" / "manifest.json").find("\"seed\": 9"), std::string::npos);
}

}  // namespace
}  // namespace upright::runner
