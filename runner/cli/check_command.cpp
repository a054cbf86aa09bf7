// `upright check`: validates each file by the kind its root element names.
#include <tinyxml2.h>

#include <iostream>

#include "commands.hpp"
#include "upright/model/model_file.hpp"
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

}  // namespace

int RunCheck(const std::vector<std::string>& files) {
  int bad = 0;
  for (const auto& path : files) {
    const std::string root = RootName(path);
    if (root == "scenario") {
      const runner::ScenarioLoadResult scenario = runner::LoadScenarioFile(path);
      if (scenario.ok()) {
        std::cout << path << ": ok (scenario '" << scenario.scenario.name << "', robot '"
                  << scenario.scenario.model.name << "', " << scenario.scenario.controllers.size()
                  << " controller(s))\n";
      } else {
        for (const auto& e : scenario.errors) std::cerr << e.ToString() << "\n";
        ++bad;
      }
      continue;
    }
    if (!root.empty() && root != "balancer" && root != "robot") {
      std::cerr << path << ": root element <" << root << "> is not a known file kind "
                << "(expected <balancer> or <scenario>)\n";
      ++bad;
      continue;
    }
    const ModelLoadResult result = LoadModelFile(path);
    if (result.ok()) {
      std::cout << path << ": ok (robot model '" << result.model.name << "')\n";
    } else {
      for (const auto& e : result.errors) std::cerr << e.ToString() << "\n";
      ++bad;
    }
  }
  if (bad > 0) {
    std::cerr << bad << " of " << files.size() << " file(s) invalid\n";
    return kExitBadInput;
  }
  return kExitOk;
}

}  // namespace upright::cli
