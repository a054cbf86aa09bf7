// summary.csv and summary.md: every run's figures as a tidy table (one row per scenario ×
// controller × seed, batch order), and per scenario a readable table of each controller's means
// and spreads.
#pragma once

#include <string>
#include <vector>

#include "batch_groups.hpp"
#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner::internal {

// summary.csv: header, then one row per run in batch order; numbers "%.6g", NaN empty, every
// figure of a run that was not played empty; yes/no cells true or false.
std::string SummaryCsv(const BatchResult& batch);

// summary.md: one table per scenario, one column per controller, one row for survival and one per
// figure of the catalogue: means over seeds rounded to 3 significant digits with their spread and
// the runs they skipped, and a line saying what "—" and "[k of n]" mean.
std::string SummaryMarkdown(const std::vector<ScenarioGroup>& groups);

}  // namespace upright::runner::internal
