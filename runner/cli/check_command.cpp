// `upright check`: validates each file by the kind its root element names; a scenario's controllers
// are also loaded and created exactly as a run would, so that check passes only what runs.
#include <tinyxml2.h>

#include <algorithm>
#include <filesystem>
#include <iostream>
#include <system_error>

#include "commands.hpp"
#include "upright/model/model_file.hpp"
#include "upright/runner/modules.hpp"
#include "upright/runner/run_one.hpp"
#include "upright/runner/scenario_file.hpp"

namespace upright::cli {
namespace {

// The root element's name, or "" when the file cannot be read or parsed (the loader then
// reports why, with a line).
std::string RootName(const std::string& path) {
  tinyxml2::XMLDocument doc;
  if (doc.LoadFile(path.c_str()) != tinyxml2::XML_SUCCESS) return "";
  const auto* root = doc.RootElement();
  return root ? root->Name() : "";
}

// The files to check: each argument, or the .xml files of a folder (not its subfolders) in name
// order. A folder holding none is a problem of its own, in *problems.
std::vector<std::string> ExpandFolders(const std::vector<std::string>& args,
                                       std::vector<std::string>* problems) {
  std::vector<std::string> files;
  for (const std::string& arg : args) {
    std::error_code error;
    if (!std::filesystem::is_directory(arg, error)) {
      files.push_back(arg);
      continue;
    }
    std::vector<std::string> found;
    for (const auto& entry : std::filesystem::directory_iterator(arg, error)) {
      if (entry.path().extension() == ".xml" && !entry.is_directory(error)) {
        found.push_back(entry.path().string());
      }
    }
    if (found.empty()) {
      problems->push_back(arg +
                          ": a folder with no .xml files (expected robot model or scenario "
                          "files, or a folder of them)");
    }
    std::sort(found.begin(), found.end());
    files.insert(files.end(), found.begin(), found.end());
  }
  return files;
}

// What a run of each controller of `scenario` would refuse at set-up, at the controller's line:
// its module not loading, its create refusing the robot, settings or rate, or the plant refusing.
std::vector<FileError> ControllerProblems(const runner::Scenario& scenario) {
  std::vector<FileError> problems;
  const runner::ModuleSet modules({&scenario, 1}, {});
  for (std::size_t i = 0; i < scenario.controllers.size(); ++i) {
    const runner::ControllerEntry& entry = scenario.controllers[i];
    const runner::LoadedModule& loaded = modules.Get(entry);
    std::string problem = loaded.error;
    if (loaded.module) {
      problem = runner::RunStartProblem(scenario, i, loaded.module);
      if (problem.empty()) continue;
      // The host names the module by its own name and file; the message names the controller.
      const std::string host_lead =
          "controller '" + loaded.module->name() + "' (" + loaded.module->path() + "): ";
      if (problem.rfind(host_lead, 0) == 0) problem.erase(0, host_lead.size());
    }
    problems.push_back(
        FileError{scenario.path, entry.line, "controller '" + entry.name + "': " + problem});
  }
  return problems;
}

// Checks one scenario file; true when it is valid and every controller of it can start.
bool CheckScenario(const std::string& path) {
  const runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
  std::vector<FileError> problems = loaded.errors;
  if (loaded.ok()) problems = ControllerProblems(loaded.scenario);
  if (problems.empty()) {
    std::cout << path << ": ok (scenario '" << loaded.scenario.name << "', robot '"
              << loaded.scenario.model.name << "', " << loaded.scenario.controllers.size()
              << " controller(s))\n";
    return true;
  }
  for (const auto& e : problems) std::cerr << e.ToString() << "\n";
  return false;
}

}  // namespace

int RunCheck(const std::vector<std::string>& args) {
  std::vector<std::string> folder_problems;
  const std::vector<std::string> files = ExpandFolders(args, &folder_problems);
  for (const std::string& problem : folder_problems) std::cerr << problem << "\n";
  std::size_t bad = folder_problems.size();
  for (const auto& path : files) {
    const std::string root = RootName(path);
    if (root == "scenario") {
      bad += CheckScenario(path) ? 0 : 1;
      continue;
    }
    if (!root.empty() && root != "balancer" && root != "robot") {
      std::cerr << path << ": root element <" << root << "> is not a known file kind "
                << "(expected <balancer> or <scenario>)\n";
      ++bad;
      continue;
    }
    const auto result = LoadModelFile(path);
    if (result) {
      std::cout << path << ": ok (robot model '" << result->name << "')\n";
    } else {
      for (const auto& e : result.error()) std::cerr << e.ToString() << "\n";
      ++bad;
    }
  }
  if (bad > 0) {
    std::cerr << bad << " of " << files.size() + folder_problems.size() << " file(s) invalid\n";
    return kExitBadInput;
  }
  return kExitOk;
}

}  // namespace upright::cli
