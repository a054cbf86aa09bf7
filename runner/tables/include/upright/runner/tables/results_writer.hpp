// Results folder of a batch: a BatchResult in; the tidy summary, the comparison against each
// scenario's baseline, the ranking, one trace per traced run and the manifest out. Every file goes
// to a temporary name first and is renamed into place, so an interrupted write never leaves a
// half-written table.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner {

// Writes summary.csv/.md, compare.csv/.md, ranking.csv/.md, gap.csv/.md (only when
// batch.linear_twin), traces/<TraceFileName>.csv (runs with trace.rate_hz > 0) and, last,
// manifest.json into `dir`, creating it and its parents. In a folder written before, the gap
// tables and trace CSVs this batch does not write are removed, so none passes for its own. Every
// file but the manifest depends only on the runs' contents and order, never on timing or job
// count: identical batches give byte-identical files. Fails (the message naming the path) when
// the folder cannot be made, two traced runs map to the same trace file, or a file cannot be
// written or removed.
Status WriteResults(const std::string& dir, const BatchResult& batch);

// The names of the files WriteResults writes at the top of `dir`, for messages and tests (a
// batch that ran the linear twin adds gap.csv and gap.md).
const std::vector<std::string>& ResultFileNames();

// traces/<file name> of a run: "<scenario>__<controller>__seed<seed>.csv" with any character
// other than [A-Za-z0-9._-] replaced by '_'.
std::string TraceFileName(const RunResult& run);

}  // namespace upright::runner
