// The floor of each compared figure: an absolute value below which a difference in percent of the
// baseline means nothing (a tilt of 0.0001° against 0.1°). compare.csv and compare.md give the
// difference in the figure's unit instead below it; the paired verdict counts a difference only
// when it reaches 0.5 % of the baseline, or the floor itself below it. The values live with the
// columns (metric_columns.cpp), one per figure.
#pragma once

#include <string_view>

namespace upright::runner {

struct MetricFloor {
  double value = 0;       // in the figure's unit; 0: no floor (percentages whenever baseline ≠ 0)
  const char* unit = "";  // as read after a number: "deg", "m", "A", "%", "" for a ratio
};

// The floor of the figure named `metric` (a summary.csv column) as the column catalogue gives it;
// {0, ""} for a name the catalogue does not list or does not compare.
MetricFloor FloorOf(std::string_view metric);

}  // namespace upright::runner
