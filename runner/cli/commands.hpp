// The subcommands of `upright`: each takes its parsed arguments and returns the process exit code
// (0 success, 1 a run failed, 2 bad input or usage).
#pragma once

#include <string>
#include <vector>

#include "upright/design/design_set.hpp"
#include "upright/runner/batch.hpp"

namespace upright::cli {

inline constexpr int kExitOk = 0;
inline constexpr int kExitFailed = 1;
inline constexpr int kExitBadInput = 2;

// `upright check FILE...`: validates robot model and scenario files (by their root element; a
// folder: its .xml files), and creates each scenario controller as a run would; prints every
// problem as path:line.
int RunCheck(const std::vector<std::string>& files);

struct DesignOptions {
  std::string model_path;
  bool json = false;                  // one JSON object on stdout instead of text
  std::string input_text = "torque";  // --input, parsed into request.input
  design::DesignRequest request;
};

// `upright design MODEL`: linear model, controller gains, poles, norms and margins. Exit 1 when a
// design fails (its reason printed), 2 on bad input.
int RunDesign(const DesignOptions& options);

struct RunCommandOptions {
  std::vector<std::string> scenario_paths;  // scenario files; `demo`: empty = the demo suite
  std::string out_dir;                      // "": results/<scenario or folder name>
  runner::BatchOptions batch;               // jobs, seeds, trace rate
  std::string verb = "upright run:";        // how the first line starts
};

// `upright run SCENARIO...`: every scenario × controller × seed, tables into the results folder.
// Exit 2 when a file is invalid (nothing runs), 1 when a run could not start (a module missing)
// or the results cannot be written; falls are results, not failures.
int RunScenarios(const RunCommandOptions& options);

// `upright demo`: the scenarios/ suite into results/demo.
int RunDemo(const RunCommandOptions& options);

}  // namespace upright::cli
