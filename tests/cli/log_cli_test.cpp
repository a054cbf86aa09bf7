// The program's messages by level, end to end: module messages on stderr after a batch with
// their run and time, and in the manifest; --quiet keeps errors, warnings and the caution;
// --verbose adds debug lines, the modules' debug messages among them.
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

#include "program_output.hpp"

namespace {

namespace fs = std::filesystem;
using Json = nlohmann::json;

fs::path Scratch(const std::string& name) {
  return upright::test::ScratchFolder("upright_cli_log", name);
}

std::string Read(const fs::path& path) { return upright::test::ReadBytes(path); }

struct Outcome {
  int exit_code = -1;
  std::string out;  // stdout
  std::string err;  // stderr
};

// Runs `upright ARGS` with stdout and stderr apart (stderr through a file in `dir`).
Outcome Upright(const std::string& args, const fs::path& dir) {
  const fs::path err = dir / "stderr.txt";
  const upright::test::ProgramOutput ran =
      upright::test::RunShell(std::string(UPRIGHT_EXE) + " " + args + " 2>" + err.string());
  return {ran.exit_code, ran.output, Read(err)};
}

bool Has(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// Scenario "chatty" in `dir`: the courier for 0.2 s (too short to fall), controllers lqr and
// "mine" (the logging test module with `settings`, whole <setting/> elements), seed 1.
std::string ChattyScenario(const fs::path& dir, const std::string& settings) {
  const fs::path path = dir / "chatty.xml";
  std::ofstream(path) << R"(<scenario name="chatty" schema="1" duration_s="0.2">
  <description>Test: a module that logs.</description>
  <robot file=")" << UPRIGHT_SOURCE_DIR
                      << R"(/models/courier.xml"/>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr"/>
    <controller name="mine" file=")"
                      << UPRIGHT_TEST_MODULE_DIR << "/logging.so\">" << settings << R"(</controller>
  </controllers>
  <seeds list="1"/>
</scenario>
)";
  return path.string();
}

TEST(CliLog, ModuleMessagesFollowTheBatchOnStderrWithTheirRunAndTime) {
  const fs::path dir = Scratch("stderr");
  const std::string scenario = ChattyScenario(dir, R"(<setting key="per_step" value="1"/>)");
  const Outcome r = Upright("run " + scenario + " --out " + (dir / "out").string(), dir);
  ASSERT_EQ(r.exit_code, 0) << r.out << r.err;
  // Create's messages at or above info ("create" for their time), then each tick's.
  EXPECT_TRUE(Has(r.err, "chatty / mine / seed 1, create: module info: create: info\n")) << r.err;
  EXPECT_TRUE(Has(r.err, "chatty / mine / seed 1, create: module error: create: error\n")) << r.err;
  EXPECT_FALSE(Has(r.err, "module debug")) << r.err;
  EXPECT_TRUE(Has(r.err, "chatty / mine / seed 1, t = 0.000 s: module warning: first tick\n"))
      << r.err;
  EXPECT_TRUE(Has(r.err, "chatty / mine / seed 1, t = 0.005 s: module info: tick 2 message 1\n"))
      << r.err;
  // 40 ticks at 200 Hz: 3 + 1 + 40 messages, 20 kept, 24 dropped.
  EXPECT_TRUE(Has(r.err, "chatty / mine / seed 1, t = 0.075 s: module info: tick 16 message 1\n"))
      << r.err;
  EXPECT_FALSE(Has(r.err, "tick 17 message 1")) << r.err;
  EXPECT_TRUE(Has(r.err,
                  "chatty / mine / seed 1: module: 24 more message(s) dropped (the first 20 of "
                  "a run are kept)\n"))
      << r.err;
  // Nothing of them on stdout, which keeps the command's own lines.
  EXPECT_FALSE(Has(r.out, "module")) << r.out;
  EXPECT_TRUE(Has(r.out, "2 of 2 run(s) survived")) << r.out;
}

TEST(CliLog, TheManifestCarriesEachRunsModuleMessages) {
  const fs::path dir = Scratch("manifest");
  const std::string scenario = ChattyScenario(dir, R"(<setting key="per_step" value="1"/>)");
  const fs::path out = dir / "out";
  for (const bool twin : {false, true}) {
    const Outcome r =
        Upright("run " + scenario + " --out " + out.string() + (twin ? " --linear-twin" : ""), dir);
    ASSERT_EQ(r.exit_code, 0) << r.out << r.err;
    const Json manifest = Json::parse(Read(out / "manifest.json"));
    ASSERT_TRUE(manifest.contains("runs"));
    const Json& runs = manifest["runs"];
    ASSERT_EQ(runs.size(), 2u);
    const Json& lqr = runs[0];
    const Json& mine = runs[1];
    ASSERT_EQ(mine.value("controller", ""), "mine");
    // The built-in logs at debug only: nothing kept at the default level.
    ASSERT_TRUE(lqr.contains("module_log"));
    EXPECT_TRUE(lqr["module_log"]["messages"].empty());
    for (const char* key : {"module_log", "twin_module_log"}) {
      ASSERT_TRUE(mine.contains(key)) << key;
      const Json& log = mine[key];
      if (!twin && std::string(key) == "twin_module_log") {
        EXPECT_TRUE(log.is_null());
        continue;
      }
      ASSERT_TRUE(log.is_object()) << key;
      const Json& messages = log["messages"];
      ASSERT_EQ(messages.size(), 20u) << key;
      const Json& created = messages[0];
      EXPECT_TRUE(created["time_s"].is_null());  // before the first tick
      EXPECT_EQ(created.value("level", ""), "info");
      EXPECT_EQ(created.value("text", ""), "create: info");
      const Json& tick = messages[5];
      EXPECT_EQ(tick.value("text", ""), "tick 2 message 1");
      EXPECT_EQ(tick["time_s"].get<double>(), 0.005);
      EXPECT_EQ(log["dropped"].get<int>(), 24) << key;
    }
  }
}

TEST(CliLog, QuietKeepsErrorsWarningsAndTheCautionOnly) {
  const fs::path dir = Scratch("quiet");
  // A second copy of the module that refuses create: an error, and exit 1.
  const std::string scenario =
      ChattyScenario(dir, R"(<setting key="per_step" value="1"/></controller>
    <controller name="refuser" file=")" +
                              std::string(UPRIGHT_TEST_MODULE_DIR) +
                              R"(/logging.so"><setting key="refuse" value="true"/>)");
  const std::string args = "run " + scenario + " --out " + (dir / "out").string();
  const Outcome loud = Upright(args, dir);
  const Outcome quiet = Upright(args + " --quiet", dir);
  EXPECT_EQ(loud.exit_code, 1) << loud.out << loud.err;
  EXPECT_EQ(quiet.exit_code, 1) << quiet.out << quiet.err;
  // By default: the command's lines and the progress, as ever.
  EXPECT_TRUE(Has(loud.out, "upright run: 1 scenario(s), 3 run(s) into ")) << loud.out;
  EXPECT_TRUE(Has(loud.err, "upright run: 3/3 runs, 100 %")) << loud.err;
  EXPECT_TRUE(Has(loud.err, "chatty / mine / seed 1, create: module info: create: info"))
      << loud.err;
  // Quiet: no information, no progress, no module info; errors, warnings and the caution stay.
  EXPECT_FALSE(Has(quiet.out, "upright run:")) << quiet.out;
  EXPECT_FALSE(Has(quiet.out, "survived")) << quiet.out;
  EXPECT_FALSE(Has(quiet.out, "tables:")) << quiet.out;
  EXPECT_FALSE(Has(quiet.err, "runs, 100 %")) << quiet.err;
  EXPECT_FALSE(Has(quiet.err, "module info")) << quiet.err;
  EXPECT_FALSE(Has(quiet.err, "dropped")) << quiet.err;  // the dropped were info
  EXPECT_TRUE(Has(quiet.out, "  chatty / refuser: controller 'logging'")) << quiet.out;
  EXPECT_TRUE(Has(quiet.out, "create failed (status 2): refused as asked")) << quiet.out;
  EXPECT_TRUE(Has(quiet.err, "chatty / refuser / seed 1, create: module error: create: error"))
      << quiet.err;
  EXPECT_TRUE(Has(quiet.err, "chatty / mine / seed 1, t = 0.000 s: module warning: first tick"))
      << quiet.err;
  EXPECT_TRUE(Has(quiet.out, "Simulation only: validate on hardware")) << quiet.out;
  // The manifest does not depend on the verbosity: info is recorded all the same.
  EXPECT_TRUE(Has(Read(dir / "out" / "manifest.json"), "\"text\": \"tick 1 message 1\""));
}

TEST(CliLog, QuietCheckAndReportKeepTheirErrorsOnly) {
  const fs::path dir = Scratch("quiet-check");
  const std::string model = std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml";
  const Outcome ok = Upright("check --quiet " + model, dir);
  EXPECT_EQ(ok.exit_code, 0) << ok.err;
  EXPECT_EQ(ok.out, "");
  EXPECT_EQ(ok.err, "");
  const Outcome missing = Upright("check -q " + (dir / "none.xml").string(), dir);
  EXPECT_EQ(missing.exit_code, 2);
  EXPECT_TRUE(Has(missing.err, "none.xml")) << missing.err;
  EXPECT_TRUE(Has(missing.err, "1 of 1 file(s) invalid")) << missing.err;
  // design's report is what it makes, not a message: it stays.
  const Outcome design = Upright("design --quiet " + model, dir);
  EXPECT_EQ(design.exit_code, 0) << design.err;
  EXPECT_TRUE(Has(design.out, "== LQR: ok")) << design.out;
}

TEST(CliLog, VerboseAddsDebugLinesAndTheModulesDebugMessages) {
  const fs::path dir = Scratch("verbose");
  const std::string scenario = ChattyScenario(dir, "");
  const Outcome r = Upright("run --verbose " + scenario + " --out " + (dir / "out").string(), dir);
  ASSERT_EQ(r.exit_code, 0) << r.out << r.err;
  EXPECT_TRUE(Has(r.err, "chatty / mine / seed 1, create: module debug: create: debug\n")) << r.err;
  // The built-in's own debug message: its gain, on one line.
  EXPECT_TRUE(Has(r.err,
                  "chatty / lqr / seed 1, create: module debug: lqr: discrete LQR at 200 "
                  "Hz, K = | "))
      << r.err;
  EXPECT_TRUE(Has(r.err, "debug: " + scenario + ": scenario 'chatty', robot 'courier'")) << r.err;
  EXPECT_TRUE(Has(r.err, "debug: chatty / mine / seed 1: ok after 200 step(s)")) << r.err;
  // Kept, so in the manifest too.
  EXPECT_TRUE(Has(Read(dir / "out" / "manifest.json"), "\"text\": \"create: debug\""));
  // The default shows none of it.
  const Outcome plain = Upright("run " + scenario + " --out " + (dir / "out").string(), dir);
  EXPECT_FALSE(Has(plain.err, "debug")) << plain.err;
}

TEST(CliLog, EverySubcommandTakesQuietOrVerboseButNotBoth) {
  const fs::path dir = Scratch("flags");
  for (const char* command : {"check", "design", "run", "demo", "sweep", "envelope", "report"}) {
    const Outcome help = Upright(std::string(command) + " --help", dir);
    EXPECT_EQ(help.exit_code, 0) << command;
    EXPECT_TRUE(Has(help.out, "-q,--quiet")) << command << "\n" << help.out;
    EXPECT_TRUE(Has(help.out, "-v,--verbose")) << command << "\n" << help.out;
  }
  const std::string model = std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml";
  const Outcome both = Upright("check --quiet --verbose " + model, dir);
  EXPECT_EQ(both.exit_code, 2);
  EXPECT_TRUE(Has(both.err, "excludes")) << both.err;
}

}  // namespace
