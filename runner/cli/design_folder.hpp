// `upright design --report` and the demo's design pictures: one robot's designs as a results
// folder the report reads — each controller's loop at the wheel inputs over frequency
// (loop_response.csv), its linear response to the design push (push_response.csv), its margins
// (margins.csv) and manifest.json naming the model file and its SHA-256.
#pragma once

#include <string>

#include "upright/base/result.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::cli {

struct DesignFolderSource {
  const model::RobotModel* model = nullptr;
  const design::DesignSet* set = nullptr;
  std::string model_path;    // as the user gave it
  std::string model_sha256;  // of the file's bytes
  std::string version;       // of the program
};

// Writes the four files into `dir` (which must exist), each atomically. The curves are those of
// each design made (LoopAtWheels, LoopAtInput of the left wheel, CommonModeLoop), continuous and,
// where analysed, as the module samples it with the sensors' latency (up to the Nyquist
// frequency); a design not made gets its margins row with the reason and no curves.
Status WriteDesignFolder(const std::string& dir, const DesignFolderSource& source);

// The default designs of the model file at `model_path` into `dir` (made if missing), as
// WriteDesignFolder writes them; the model's load errors or the write's failure otherwise.
Status WriteDefaultDesignFolder(const std::string& model_path, const std::string& dir,
                                const std::string& version);

}  // namespace upright::cli
