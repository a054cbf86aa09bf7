// The subcommands of `upright`: each takes its parsed arguments and returns the process exit code
// (0 success, 1 a run failed, 2 bad input or usage; `design` alone also 3, some designs unusable).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "upright/design/design_set.hpp"
#include "upright/runner/run/batch.hpp"

namespace upright::cli {

inline constexpr int kExitOk = 0;
inline constexpr int kExitFailed = 1;
inline constexpr int kExitBadInput = 2;
inline constexpr int kExitSomeDesignsUnusable = 3;  // `design`: some designs usable, some not

// The closing line of every command that runs the plant, printed once per command.
inline constexpr const char* kCaution =
    "Simulation only: validate on hardware with a tether or spotter, at low speed first, within "
    "local rules.";

// `upright check FILE...`: validates robot model and scenario files (by their root element; a
// folder: its .xml files), and creates each scenario controller as a run would; prints every
// problem as path:line.
int RunCheck(const std::vector<std::string>& files);

struct DesignOptions {
  std::string model_path;
  bool json = false;                  // one JSON object on stdout instead of text
  std::string input_text = "torque";  // --input, parsed into request.input
  // As typed; absent: the request's own default (the model's rate, γ by the rule of the design
  // push, the COM height, 10 % of the weight, a fifth of the ground-contact tilt). When given,
  // each must be a real value (> 0; height >= 0; factor > 1).
  std::optional<double> rate_hz;        // --rate
  std::optional<double> gamma;          // --gamma
  std::optional<double> gamma_factor;   // --gamma-factor
  std::optional<double> push_height_m;  // --push-height-m
  std::optional<double> push_scale_N;   // --push-scale-N
  std::optional<double> max_tilt_deg;   // --max-tilt-deg
  design::DesignRequest request;        // the other flags (the other weights)
  std::string export_c_path;            // --export-c: also write the usable gains as a C header
  std::string report_dir;  // --report: also write the design pictures' folder and its report
};

// `upright design MODEL`: linear model, controller gains, poles, norms and margins, a status per
// controller. Exit 0 when every design offered for the input is usable (made, and stable as the
// module samples it), 3 when some are and some are not (each says why in place), 1 when none is,
// 2 on bad input (the message names the flag). With --export-c the usable designs' gains are
// written as a C header too (gains_header.hpp); with --report the designs' curves and margins go
// to that folder (design_folder.hpp) with its report.html; when either fails, exit 1.
int RunDesign(const DesignOptions& options);

struct RunCommandOptions {
  // Scenario files, or folders standing for their *.xml files whose root element is not another
  // file kind (sorted by name); `demo`: empty = the demo suite.
  std::vector<std::string> scenario_paths;
  std::string out_dir;                // "": results/<scenario or folder name>
  runner::BatchOptions batch;         // jobs, seeds, trace rate
  std::string verb = "upright run:";  // how the first line starts
  std::string label = "upright run";  // starts each progress line off a terminal
  bool caution = true;                // close with kCaution (demo prints it once itself)
};

// `upright run SCENARIO...`: every scenario × controller × seed, tables into the results folder.
// Exit 2 when a file is invalid or a folder holds no scenario (nothing runs), 1 when a run could
// not start (a module missing) or the results cannot be written; falls are results, not failures.
int RunScenarios(const RunCommandOptions& options);

// `upright demo`: the scenarios/ suite into results/demo.
int RunDemo(const RunCommandOptions& options);

}  // namespace upright::cli
