// traces/<run>.csv: one run's sampled trace as CSV — one column per TraceRow field (named as the
// field; the linear twin's two only when the run ran it), then `event`: the labels of the marks
// that fall within the row's sample interval.
#pragma once

#include <string>

#include "upright/runner/run_result.hpp"

namespace upright::runner::internal {

// The trace as CSV, numbers "%.6g". A mark belongs to the row whose interval
// [time_s, next row's time_s) holds it; marks before the first row go to the first row and marks
// after the last row's time to the last row, so none is lost. Several labels join with "; ".
std::string TraceCsv(const Trace& trace);

}  // namespace upright::runner::internal
