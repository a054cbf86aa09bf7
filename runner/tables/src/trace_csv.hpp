// traces/<run>.csv: one run's sampled trace as CSV — one column per TraceRow field (named as the
// field; the linear twin's two only when the run ran it), then `event`: the labels of the marks
// that happened by the row's time and not by the row before's.
#pragma once

#include <string>

#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner::internal {

// The trace as CSV, numbers "%.6g". A mark belongs to the first row whose time_s is at or after
// its time (marks before the first row go to the first row); a mark after the last row's time
// happened after the trace ended and appears nowhere. Several labels join with "; ".
std::string TraceCsv(const Trace& trace);

}  // namespace upright::runner::internal
