// The catalogue of RunMetrics figures as the tables show them: the CSV column name, the reading
// label with its unit, and whether lower is better. Every table takes its columns from here.
#pragma once

#include <span>

#include "upright/runner/run_metrics.hpp"

namespace upright::runner::internal {

struct MetricColumn {
  const char* name;   // CSV column and compare.csv metric name, e.g. "max_tilt_deg"
  const char* label;  // Markdown header, e.g. "max tilt (deg)"
  double RunMetrics::*field;
  bool compared;  // a lower-is-better figure that compare and ranking judge
};

// All numeric figures, in summary.csv order (fall_time_s … energy_J, end_time_s).
std::span<const MetricColumn> MetricColumns();

}  // namespace upright::runner::internal
