// manifest.json: what a batch ran and with what — tool version, jobs, the scenario and model files
// with their SHA-256, time step, controllers, baseline and seeds, and per run its status, steps,
// wall time, trace file and what its module (and its linear twin's) logged. The one results file
// that may differ between identical batches.
#pragma once

#include <string>
#include <vector>

#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner::internal {

// `trace_files` runs parallel to batch.runs: the trace's path relative to the results folder
// ("traces/<name>.csv"), or "" for a run without a trace (written as null).
std::string ManifestJson(const BatchResult& batch, const std::vector<std::string>& trace_files);

}  // namespace upright::runner::internal
