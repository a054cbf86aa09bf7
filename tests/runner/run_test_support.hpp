// Test helpers for runs: a scenario parsed from text (with the demo robot beside it) and a
// scratch folder per test.
#pragma once

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "upright/runner/scenario_file.hpp"

namespace upright::runner::testing {

// Parses `xml` as if it were a file in scenarios/ (so "../models/courier.xml" names the demo
// robot); a test failure listing the errors when it does not parse.
inline Scenario ScenarioFromText(const std::string& xml, const std::string& name = "test.xml") {
  const std::string dir = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";
  ScenarioLoadResult loaded = ParseScenarioText(xml, dir + "/" + name, dir);
  std::ostringstream errors;
  for (const auto& e : loaded.errors) errors << e.ToString() << "\n";
  EXPECT_TRUE(loaded.ok()) << errors.str();
  return loaded.scenario;
}

// An empty folder for this test under the system's temporary folder.
inline std::filesystem::path ScratchDir(const std::string& name) {
  const auto dir = std::filesystem::temp_directory_path() /
                   ("upright-runner-test-" + std::to_string(::getpid()) + "-" + name);
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  return dir;
}

inline std::string ReadFile(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

}  // namespace upright::runner::testing
