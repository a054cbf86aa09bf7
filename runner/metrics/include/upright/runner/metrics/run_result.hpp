// RunResult and BatchResult: what the runner hands the table writers — per run its identity, its
// metrics, its trace and its module's messages; per scenario what the manifest records. Plain
// data, no behaviour.
#pragma once

#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "upright/runner/metrics/module_log.hpp"
#include "upright/runner/metrics/run_metrics.hpp"

namespace upright::runner {

// One sampled row of a run's trace, at the trace rate. Sensed values are what the controller
// read; the rest is the true state. Commands are volts or newton-metres as the module declared.
struct TraceRow {
  double time_s = 0;
  double x_m = 0, y_m = 0;  // axle midpoint, world
  double pitch_deg = 0;     // chassis tilt, + forward
  double pitch_rate_deg_s = 0;
  double yaw_deg = 0;
  double speed_m_s = 0;      // forward speed of the axle
  double ref_speed_m_s = 0;  // reference handed to the controller
  double ref_yaw_rate_deg_s = 0;
  double drift_m = 0;       // horizontal distance from the commanded path
  double gyro_y_rad_s = 0;  // sensed pitch rate
  double accel_x_m_s2 = 0;  // sensed forward specific force
  double encoder_left_rad = 0, encoder_right_rad = 0;  // sensed wheel angles
  double command_left = 0, command_right = 0;
  double voltage_left_V = 0, voltage_right_V = 0;
  double current_left_A = 0, current_right_A = 0;
  double torque_left_Nm = 0, torque_right_Nm = 0;  // on the wheels
  double load_left_N = 0, load_right_N = 0;        // ground normal loads
  double slip_left = 0, slip_right = 0;            // slip ratios
  double payload_x_m = 0;                          // carriage position on the deck
  // The linear twin at the same time (Trace::has_twin; NaN where the twin had stopped).
  double twin_pitch_deg = std::numeric_limits<double>::quiet_NaN();
  double twin_x_m = std::numeric_limits<double>::quiet_NaN();  // axle midpoint, world x
};

// A moment worth marking in a trace: an event starting, a fault, a fall.
struct EventMark {
  double time_s = 0;  // when it acts: a trace shows it on the first row at or after this time
  std::string label;  // "push 120 N half-sine", "fall", ...
};

struct Trace {
  double rate_hz = 0;  // 0: no trace recorded
  std::vector<TraceRow> rows;
  std::vector<EventMark> marks;  // in time order
  bool has_twin = false;         // rows carry the linear twin's columns
};

// The linear twin against the plant for one run (RunOptions::linear_twin; runner/twin). Peaks are
// each model's own over its own run (the twin always runs the scenario's whole duration unless it
// stops, see twin_message); divergence times compare the two at the same physics steps, while
// both ran, against the bands stated beside them. NaN: does not apply (never diverged, no twin).
struct GapFigures {
  bool ran = false;  // the twin was asked for and built
  double peak_tilt_linear_deg = std::numeric_limits<double>::quiet_NaN();
  double peak_tilt_plant_deg = std::numeric_limits<double>::quiet_NaN();
  double peak_drift_linear_m = std::numeric_limits<double>::quiet_NaN();
  double peak_drift_plant_m = std::numeric_limits<double>::quiet_NaN();
  double tilt_band_deg = std::numeric_limits<double>::quiet_NaN();  // the |Δtilt| band used
  double drift_band_m = std::numeric_limits<double>::quiet_NaN();   // the |Δdrift| band used
  // First time |Δtilt| (|Δdrift|) exceeded its band; NaN when it never did.
  double tilt_diverge_s = std::numeric_limits<double>::quiet_NaN();
  double drift_diverge_s = std::numeric_limits<double>::quiet_NaN();
  std::string not_modelled;  // the scenario's events the linear model leaves out, "; "-joined
  std::string twin_message;  // empty when the twin ran to the end; otherwise why it stopped
};

struct RunResult {
  std::string scenario;    // scenario name
  std::string controller;  // controller name within the scenario
  std::uint64_t seed = 0;  // sensor noise seed
  bool baseline = false;   // this controller is the scenario's baseline
  RunMetrics metrics;
  Trace trace;
  long steps = 0;             // physics steps taken
  double wall_s = 0;          // wall-clock time of the run (manifest only, never in tables)
  GapFigures gap;             // the linear twin's comparison, when asked for
  ModuleLog module_log;       // what the module logged, create included (RunOptions's level)
  ModuleLog twin_module_log;  // what the linear twin's instance of it logged, when asked for
};

// What the manifest says about one scenario of a batch.
struct ScenarioInfo {
  std::string name;
  std::string path;    // as given on the command line
  std::string sha256;  // of the scenario file's bytes
  std::string model_name;
  std::string model_path;
  std::string model_sha256;
  double dt_s = 0;
  double duration_s = 0;
  std::vector<std::string> controllers;  // in scenario order
  std::string baseline;                  // one of controllers
  std::vector<std::uint64_t> seeds;
};

struct BatchResult {
  std::string tool_version;
  std::vector<ScenarioInfo> scenarios;
  // Scenario by scenario, controller by controller (scenario order), seed by seed; the order does
  // not depend on how many jobs ran them.
  std::vector<RunResult> runs;
  int jobs = 1;
  double trace_rate_hz = 0;
  double wall_s = 0;
  bool linear_twin = false;  // every run also ran the linear twin (gap.csv, gap.md)
};

}  // namespace upright::runner
