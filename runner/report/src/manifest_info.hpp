// What the report takes from a results folder's manifest.json: the tool version, the input files
// with their SHA-256, the trace of each run, and the envelope's parameters, the sweep's spreads or
// the design's robot and push.
// Fields the manifest lacks stay empty; timings are never read, so the report does not vary.
#pragma once

#include <cstdint>
#include <limits>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner::internal {

struct ManifestScenario {
  std::string name, path, sha256;
  std::string model_name, model_path, model_sha256;
  std::string baseline;
};

struct ManifestRun {
  std::string scenario, controller;
  std::uint64_t seed = 0;
  std::string trace;  // relative to the folder; "" when the run has no trace
};

// One swept or bisected parameter, or one spread of a sweep ("kind" and its numbers as text).
struct ManifestParameter {
  std::string path, unit, kind;
  // name → value, in file order, as the manifest writes it (integers in digits, others in the
  // shortest exact form)
  std::vector<std::pair<std::string, std::string>> numbers;
  double scenario_value = 0;
  bool has_scenario_value = false;
};

// `upright design --report`: the robot designed for and the figures its pictures are drawn
// against (NaN where the manifest lacks them).
struct ManifestDesign {
  std::string input;  // "torque" or "voltage"
  double rate_hz = kNoNumber, latency_s = kNoNumber, fall_rate_1_s = kNoNumber;
  double push_impulse_Ns = kNoNumber, push_duration_s = kNoNumber, push_peak_N = kNoNumber;
  double push_height_m = kNoNumber;
  double ground_contact_forward_deg = kNoNumber, ground_contact_backward_deg = kNoNumber;
  double current_limit_A = kNoNumber;
  static constexpr double kNoNumber = std::numeric_limits<double>::quiet_NaN();
};

// `upright tune`: what was searched, as the manifest writes it.
struct ManifestTune {
  std::string objective;            // "1 × max_tilt_deg + 10 × max_drift_m"
  std::vector<std::string> bounds;  // "peak_current_A <= 18"
  std::string search_seed, evaluations, runs_per_evaluation;  // as written
  // Per controller tuned, its name and the evaluation number of its tuned setting in tune.csv
  // (-1 when it was not tuned).
  std::vector<std::pair<std::string, long>> best_evaluation;
};

struct ManifestInfo {
  bool present = false;  // manifest.json was there and parsed
  std::string tool_version;
  std::string command;  // "envelope", "sweep", or "" for run and demo
  std::vector<ManifestScenario> scenarios;
  std::vector<ManifestRun> runs;
  std::vector<ManifestParameter> parameters;   // envelope: the parameter, then parameter2
  std::vector<ManifestParameter> dispersions;  // sweep: the spreads in file order
  std::string sweep_seed, samples;             // sweep: as the manifest writes them
  // design: the model (in scenarios, as the one entry's model_* fields) and these figures
  ManifestDesign design;
  ManifestTune tune;  // tune: what was searched
};

// Reads <dir>/manifest.json. A missing file gives present = false; a malformed one fails
// ("<path>:<line>: ...").
Result<ManifestInfo> ReadManifest(const std::string& dir);

// The same from the manifest's text; `path` is used only in messages.
Result<ManifestInfo> ParseManifest(std::string_view text, const std::string& path);

}  // namespace upright::runner::internal
