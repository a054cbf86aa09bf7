// Results folder of a sweep: a SweepResult in; sweep.csv (one row per sample × controller),
// sweep.md (survival with its interval, percentiles of the figures, the paired comparison with the
// baseline, the dispersions) and manifest.json out, each written atomically, the manifest last.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/sweep/sweep.hpp"

namespace upright::runner {

// Writes sweep.csv, sweep.md and, last, manifest.json into `dir`, creating it and its parents.
// sweep.csv and sweep.md depend only on the result's contents, never on timing or job count.
// Fails (the message naming the path) when the folder cannot be made or a file cannot be written.
Status WriteSweepResults(const std::string& dir, const SweepResult& result);

// The names of the files WriteSweepResults writes, in writing order.
const std::vector<std::string>& SweepFileNames();

// The files' contents, for tests and other writers.
std::string SweepCsv(const SweepResult& result);
std::string SweepMarkdown(const SweepResult& result);
std::string SweepManifestJson(const SweepResult& result);

}  // namespace upright::runner
