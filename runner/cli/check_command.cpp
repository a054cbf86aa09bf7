// `upright check`: validates each file by the kind its root element names; a scenario's controllers
// are also loaded and created exactly as a run would, so that check passes only what runs.
#include <tinyxml2.h>

#include <algorithm>
#include <filesystem>
#include <system_error>

#include "commands.hpp"
#include "log.hpp"
#include "module_messages.hpp"
#include "upright/base/read_file.hpp"
#include "upright/model/model_file.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/scenario/scenario_file.hpp"

namespace upright::cli {
namespace {

// The root element's name, or "" when the file cannot be read or parsed (the loader then
// reports why, with a line).
std::string RootName(const std::string& path) {
  const Result<std::string> text = ReadRegularFile(path, kMaxInputFileBytes);
  tinyxml2::XMLDocument doc;
  if (!text || doc.Parse(text->data(), text->size()) != tinyxml2::XML_SUCCESS) return "";
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
// What each module logged while it was created is logged as it would be after a run.
std::vector<model::FileError> ControllerProblems(const runner::Scenario& scenario) {
  std::vector<model::FileError> problems;
  const runner::ModuleSet modules({&scenario, 1}, {});
  const LogLevel level = Log().Shows(LogLevel::kDebug) ? LogLevel::kDebug : LogLevel::kInfo;
  for (std::size_t i = 0; i < scenario.controllers.size(); ++i) {
    const runner::ControllerEntry& entry = scenario.controllers[i];
    const runner::LoadedModule& loaded = modules.Get(entry);
    std::string problem;
    if (!loaded) {
      problem = loaded.error();
    } else {
      const host::Module& module = **loaded;
      Log().Debug(model::FileError{
          scenario.path, entry.line,
          "controller '" + entry.name + "': module '" + module.name() + "' from " + module.path()}
                      .ToString());
      runner::ModuleLog module_log;
      const Status start = runner::CheckRunStart(scenario, i, *loaded, &module_log, level);
      LogModuleMessages(
          Log(),
          model::FileError{scenario.path, entry.line, "controller '" + entry.name + "'"}.ToString(),
          module_log);
      if (start) continue;
      problem = start.error();
      // The host names the module by its own name and file; the message names the controller.
      const std::string host_lead = "controller '" + module.name() + "' (" + module.path() + "): ";
      if (problem.rfind(host_lead, 0) == 0) problem.erase(0, host_lead.size());
    }
    problems.push_back(
        model::FileError{scenario.path, entry.line, "controller '" + entry.name + "': " + problem});
  }
  return problems;
}

// Checks one scenario file; true when it is valid and every controller of it can start.
bool CheckScenario(const std::string& path) {
  const runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(path);
  const std::vector<model::FileError> problems =
      loaded ? ControllerProblems(*loaded) : loaded.error();
  if (problems.empty()) {
    Log().Info(path + ": ok (scenario '" + loaded->name + "', robot '" + loaded->model.name +
               "', " + std::to_string(loaded->controllers.size()) + " controller(s))");
    return true;
  }
  for (const auto& e : problems) Log().Error(e.ToString());
  return false;
}

}  // namespace

int RunCheck(const std::vector<std::string>& args) {
  std::vector<std::string> folder_problems;
  const std::vector<std::string> files = ExpandFolders(args, &folder_problems);
  for (const std::string& problem : folder_problems) Log().Error(problem);
  std::size_t bad = folder_problems.size();
  for (const auto& path : files) {
    const std::string root = RootName(path);
    if (root == "scenario") {
      bad += CheckScenario(path) ? 0 : 1;
      continue;
    }
    if (!root.empty() && root != "balancer" && root != "robot") {
      Log().Error(path + ": root element <" + root + "> is not a known file kind " +
                  "(expected <balancer> or <scenario>)");
      ++bad;
      continue;
    }
    const auto result = model::LoadModelFile(path);
    if (result) {
      Log().Info(path + ": ok (robot model '" + result->name + "')");
    } else {
      for (const auto& e : result.error()) Log().Error(e.ToString());
      ++bad;
    }
  }
  if (bad > 0) {
    Log().Error(Printf("%zu of %zu file(s) invalid", bad, files.size() + folder_problems.size()));
    return kExitBadInput;
  }
  return kExitOk;
}

}  // namespace upright::cli
