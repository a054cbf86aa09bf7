// The catalogue of RunMetrics figures as the tables show them: the CSV column name, the reading
// label with its unit, whether lower is better and the floor of its comparisons; and a run's
// outcome cells (status, survival, figures, message) in CSV. Every table of every results folder
// takes its columns from here.
#pragma once

#include <span>
#include <string>

#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner {

// One numeric RunMetrics figure as a column.
struct MetricColumn {
  const char* name;           // CSV column and compare.csv metric name, e.g. "max_tilt_deg"
  const char* label;          // Markdown header, e.g. "max tilt (deg)"
  double RunMetrics::*field;  // the figure, read as metrics.*field
  bool compared;              // a lower-is-better figure that compare and ranking judge
  // The floor of a compared figure (metric_floors.hpp): the smallest |baseline| of which a
  // percentage means something, and the unit its differences read in ("deg", "%", "" for a ratio).
  double floor = 0;
  const char* unit = "";
};

// All numeric figures, in summary.csv order (fall_time_s … energy_J, end_time_s).
std::span<const MetricColumn> MetricColumns();

// Appends ",status,survived,<every column name>,message": the header of the outcome columns that
// end a row of summary.csv and of sweep.csv.
void AppendOutcomeHeader(std::string* csv);

// Appends the outcome cells of `run` under that header: ",<status>,<survived: true | false>,<every
// figure>,<message>" (figures as AppendNumber prints them, every one empty for a run that was not
// played (WasPlayed) whatever its metrics hold; the message as one CSV field).
void AppendOutcomeCells(std::string* csv, const RunResult& run);

}  // namespace upright::runner
