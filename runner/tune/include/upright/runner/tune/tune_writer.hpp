// The results folder of a tune: tune.csv (every evaluation) and tune.md (per controller the
// default against the tuned objective, the settings and a ready-to-paste <controller> element),
// and with Pareto metrics pareto.csv (pareto_writer.hpp), each written atomically.
#pragma once

#include <string>

#include "upright/base/result.hpp"
#include "upright/runner/tune/tune.hpp"

namespace upright::runner {

// The text of tune.csv and tune.md.
std::string TuneCsv(const TuneResult& result);
std::string TuneMarkdown(const TuneResult& result);

// Creates `dir` if needed and writes the files; otherwise why not.
Status WriteTuneResults(const std::string& dir, const TuneResult& result);

}  // namespace upright::runner
