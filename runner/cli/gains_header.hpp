// The gains of `upright design` as a C header for firmware (`--export-c`): each usable design's
// gain at the module's rate, the LQG filter's matrices and the PID gains, with the model file's
// SHA-256, the rate, the state order, units and signs written beside them.
#pragma once

#include <string>

#include "upright/base/result.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::cli {

struct GainsHeaderSource {
  const model::RobotModel* model = nullptr;
  const design::DesignSet* set = nullptr;
  std::string model_path;    // as the user gave it
  std::string model_sha256;  // of the file's bytes
  std::string version;       // of the program
};

// The header's text (C99 and C++), identifiers prefixed with the robot's name made a C
// identifier ("courier_lqr_K"). Only designs whose status is ok are written; the others are named
// in a comment with their reason. Fails when no design is usable or a value is not finite.
Result<std::string> GainsHeader(const GainsHeaderSource& source);

// The robot's name as a C identifier prefix: lowercase letters, digits and '_', other characters
// as '_', "robot_" in front of a leading digit or an empty name.
std::string IdentifierPrefix(const std::string& name);

}  // namespace upright::cli
