// The subcommands of `upright`: each takes its parsed arguments and returns the process exit code
// (0 success, 1 a run failed, 2 bad input or usage).
#pragma once

#include <string>
#include <vector>

#include "upright/design/design_set.hpp"

namespace upright::cli {

inline constexpr int kExitOk = 0;
inline constexpr int kExitFailed = 1;
inline constexpr int kExitBadInput = 2;

// `upright check FILE...`: validates robot model files; prints every problem as path:line.
int RunCheck(const std::vector<std::string>& files);

struct DesignOptions {
  std::string model_path;
  bool json = false;  // one JSON object on stdout instead of text
  std::string input_text = "torque";  // --input, parsed into request.input
  design::DesignRequest request;
};

// `upright design MODEL`: linear model, controller gains, poles, norms and margins. Exit 1 when a
// design fails (its reason printed), 2 on bad input.
int RunDesign(const DesignOptions& options);

struct PlantDemoOptions {
  std::string model_path;     // robot model file
  double duration_s = 6.0;    // simulated time
  double push_N = 0;          // half-sine push peak; 0 = a size derived from the robot's mass
  double print_every_s = 0.5; // state line interval
};

// `upright demo`: the demo robot balancing under a simple built-in state feedback while it is
// pushed, printing a few lines of state.
int RunPlantDemo(const PlantDemoOptions& options);

}  // namespace upright::cli
