// Test helpers for runs: a scenario parsed from text (with the demo robot beside it), a built-in
// module loaded from the build tree, a small two-controller scenario, a batch run with one job and
// with two into scratch folders, a program run as a user runs it, and reading files back.
#pragma once

#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <memory>
#include <sstream>
#include <string>
#include <vector>

#include "succeeded.hpp"
#include "upright/host/module.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/scenario/scenario_file.hpp"
#include "upright/runner/tables/results_writer.hpp"

namespace upright::runner::testing {

// Parses `xml` as if it were a file in scenarios/ (so "../models/courier.xml" names the demo
// robot); a test failure listing the errors (and an exception ending the test) when it does not
// parse.
inline Scenario ScenarioFromText(const std::string& xml, const std::string& name = "test.xml") {
  const std::string dir = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";
  ScenarioLoadResult loaded = ParseScenarioText(xml, dir + "/" + name, dir);
  if (!loaded) {
    std::ostringstream errors;
    for (const auto& e : loaded.error()) errors << e.ToString() << "\n";
    ADD_FAILURE() << errors.str();
  }
  return std::move(loaded).value();
}

// The built-in module `name` ("lqr", "hinf", "lqg", "pid") from the default module folders; a test
// failure, and null, when it will not load.
inline std::shared_ptr<host::Module> BuiltinModule(const std::string& name) {
  const Result<std::string> path = host::FindBuiltinModule(name, host::DefaultModuleDirs());
  EXPECT_TRUE(Succeeded(path));
  if (!path) return nullptr;
  auto module = host::Module::Load(*path);
  EXPECT_TRUE(Succeeded(module));
  return module.value_or(nullptr);
}

// Scenario "two": the courier for 1.5 s under lqr and pid (the baseline), seeds 1 and 2, a 40 N
// step push from 0.3 s for 0.4 s, then the timeline elements in `more_events` (whole lines).
inline std::string TwoControllersText(const std::string& more_events = "") {
  return R"(<scenario name="two" schema="1" duration_s="1.5">
  <description>Test: two controllers, two seeds, a step push.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.3" shape="step" peak_N="40" duration_s="0.4"/>
)" + more_events +
         R"(  </timeline>
  <controllers baseline="pid">
    <controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>
  </controllers>
  <seeds list="1 2"/>
</scenario>)";
}

// An empty folder for this test under the system's temporary folder.
inline std::filesystem::path ScratchDir(const std::string& name) {
  const auto dir = std::filesystem::temp_directory_path() /
                   ("upright-runner-test-" + std::to_string(::getpid()) + "-" + name);
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  return dir;
}

// One batch run twice, with one job and with two, each written to its own results folder.
struct OneJobAndTwo {
  BatchResult one, two;
  std::filesystem::path dir_one, dir_two;
};

// Runs `scenarios` with `options` but jobs 1, then jobs 2, and writes each into the scratch
// folder "<name>-jobs1" / "<name>-jobs2"; a test failure when either cannot be written.
inline OneJobAndTwo RunWithOneJobAndTwo(const std::vector<Scenario>& scenarios,
                                        BatchOptions options, const std::string& name) {
  OneJobAndTwo out;
  options.jobs = 1;
  out.one = RunBatch(scenarios, options, "test", nullptr);
  options.jobs = 2;
  out.two = RunBatch(scenarios, options, "test", nullptr);
  out.dir_one = ScratchDir(name + "-jobs1");
  out.dir_two = ScratchDir(name + "-jobs2");
  const Status one = WriteResults(out.dir_one.string(), out.one);
  EXPECT_TRUE(one) << one.error();
  const Status two = WriteResults(out.dir_two.string(), out.two);
  EXPECT_TRUE(two) << two.error();
  return out;
}

// What a program run as a user runs it came to.
struct ProgramOutcome {
  int code = -1;    // exit code; -1 when it could not be started or did not exit normally
  std::string out;  // stdout and stderr together
};

// Runs `exe arguments` through the shell (`arguments` as typed on a command line) and collects
// its output and exit code.
inline ProgramOutcome RunProgram(const std::string& exe, const std::string& arguments) {
  ProgramOutcome outcome;
  const std::string command = exe + " " + arguments + " 2>&1";
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return outcome;
  char buffer[4096];
  for (std::size_t n; (n = fread(buffer, 1, sizeof buffer, pipe)) > 0;)
    outcome.out.append(buffer, n);
  const int status = pclose(pipe);
  outcome.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return outcome;
}

inline std::string ReadFile(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

}  // namespace upright::runner::testing
