// `upright envelope SCENARIO --vary PARAM`: the options as parsed from the command line in; each
// controller's survival envelope over the parameter (and optionally a survival map over two), its
// results folder and a line per controller out.
#pragma once

#include <CLI/CLI.hpp>
#include <optional>
#include <string>

namespace upright::cli {

struct EnvelopeCommandOptions {
  std::string scenario_path;  // the scenario file
  std::string vary;           // --vary: parameter path (scenario_parameter.hpp)
  // --lo, --hi: the range; absent: 0.25 and 4 times the scenario's value.
  std::optional<double> lo;
  std::optional<double> hi;
  std::optional<double> tol;  // --tol; absent: (hi − lo) / 200
  std::string vary2;          // --vary2: a second parameter for a survival map
  std::optional<double> lo2;  // --lo2, --hi2: its range, defaults as for --lo, --hi
  std::optional<double> hi2;
  int grid = 9;         // --grid: map points per axis
  int jobs = 0;         // --jobs: runs in parallel; 0: one per core
  int seed_count = 0;   // --seeds: seeds 1..N instead of the scenario's own; 0: the file's
  std::string out_dir;  // --out; "": results/<scenario name>-envelope
  bool caution = true;  // close with the safety line (demo prints it once itself)
};

// Adds the `envelope` subcommand to `app`, parsing into `options`; returns it (parsed() tells
// whether it was chosen). The help lists the parameter paths.
CLI::App* AddEnvelopeCommand(CLI::App* app, EnvelopeCommandOptions* options);

// Runs the envelope and writes envelope.csv, envelope.md (envelope_map.csv with --vary2) and
// manifest.json. Exit 2 on bad input (an invalid file, an unknown parameter, an empty or refused
// range, bad options), 1 when a controller cannot be run (a module that will not load, settings
// it refuses) or the results cannot be written; falls are results, not failures.
int RunEnvelope(const EnvelopeCommandOptions& options);

}  // namespace upright::cli
