// Thinning a trace for plotting: a series of (time, value) samples in, at most a given number of
// them out, chosen so the plotted line keeps every peak and trough of the original.
#pragma once

#include <cstddef>
#include <vector>

namespace upright::runner::internal {

// The indices of the samples to plot, ascending. All of them when values.size() <= max_points;
// otherwise min/max decimation: the samples are cut into max_points / 2 buckets of consecutive
// indices, and each bucket gives its smallest and its largest value (once when they are the same
// sample), in index order. The first and last samples are always kept: at most max_points + 2
// samples, plus one for each bucket holding NaN values, which keeps its first NaN so a break in
// the line stays a break. max_points must be at least 4 (UPRIGHT_CHECK).
std::vector<std::size_t> MinMaxDecimate(const std::vector<double>& values, std::size_t max_points);

}  // namespace upright::runner::internal
