// A Pareto tune's tables: pareto.csv (every controller's front) and the parts of tune.md that
// say what was searched and give each controller's front.
#pragma once

#include <string>

#include "upright/runner/tune/tune.hpp"

namespace upright::runner {

// pareto.csv: "controller,mean_<A>,mean_<B>,evaluation,settings", one row per front point, each
// controller's sorted by A ascending; `evaluation` is the row's evaluation number in tune.csv.
std::string ParetoCsv(const TuneResult& result);

// The paragraph of tune.md saying which front was searched; "" without Pareto metrics.
std::string ParetoSearchedMarkdown(const TuneResult& result);

// `tune`'s front as a Markdown table under a heading; "" without Pareto metrics.
std::string ParetoFrontMarkdown(const TuneResult& result, const ControllerTune& tune);

}  // namespace upright::runner
