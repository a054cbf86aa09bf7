// A run's trace file read back for plotting: traces/<run>.csv in; the time and the plotted
// signals (tilt, position, drift, mean wheel torque, the larger slip ratio, the linear twin's tilt
// and position when the trace has them) and the event labels by row out.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner::internal {

struct TraceLabel {
  double time_s = 0;  // the time of the row that carries it
  std::string label;  // one mark ("push 160 N half-sine 0.3 s", "fell")
};

struct TraceSignals {
  std::vector<double> time_s;
  std::vector<double> pitch_deg;
  std::vector<double> x_m;
  std::vector<double> drift_m;
  std::vector<double> torque_Nm;  // mean of the two wheel torques
  std::vector<double> slip;       // the wheel slip ratio larger in magnitude, with its sign
  bool has_twin = false;
  std::vector<double> twin_pitch_deg;  // NaN where the twin had stopped
  std::vector<double> twin_x_m;
  std::vector<TraceLabel> labels;  // the event column split at "; ", in row order
};

// Reads a trace CSV. Fails ("<path>:<line>: ...", or "<path>: no column <name>") when it cannot be
// read or lacks a column the plots need.
Result<TraceSignals> ReadTrace(const std::string& path);

}  // namespace upright::runner::internal
