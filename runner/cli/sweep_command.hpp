// `upright sweep SCENARIO --samples N`: the options as parsed from the command line in; a Monte
// Carlo sweep over the scenario's <dispersions>, its results folder and a short summary out.
#pragma once

#include <cstdint>
#include <string>

namespace upright::cli {

struct SweepCommandOptions {
  std::string scenario_path;  // the scenario file; it must declare <dispersions>
  int samples = 100;          // --samples: N, >= 1 (default 100)
  std::uint64_t seed = 1;     // --seed: the sweep seed; the same seed gives the same samples
  std::string out_dir;        // --out; "": results/<scenario name>-sweep
  int jobs = 0;               // --jobs: runs in parallel; 0: one per core
  bool caution = true;        // close with the safety line (demo prints it once itself)
};

// Runs the sweep and writes sweep.csv, sweep.md and manifest.json. Exit 2 on bad input (an
// invalid file, a scenario without dispersions, bad options), 1 when a controller module cannot
// be loaded or the results cannot be written; falls are results, not failures.
int RunSweep(const SweepCommandOptions& options);

}  // namespace upright::cli
