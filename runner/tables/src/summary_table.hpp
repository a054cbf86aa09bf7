// summary.csv and summary.md: every run's figures as a tidy table (one row per scenario ×
// controller × seed, batch order), and per scenario a readable table of each controller's means.
#pragma once

#include <string>
#include <vector>

#include "batch_groups.hpp"
#include "upright/runner/run_result.hpp"

namespace upright::runner::internal {

// summary.csv: header, then one row per run in batch order; numbers "%.6g", NaN empty.
std::string SummaryCsv(const BatchResult& batch);

// summary.md: one table per scenario, one row per controller, means over seeds rounded to 3
// significant digits, with a line saying what "—" and "*" mean.
std::string SummaryMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
