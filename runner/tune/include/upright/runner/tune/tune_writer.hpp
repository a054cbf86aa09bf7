// The results folder of a tune: tune.csv (every evaluation), tune.md (per controller the default
// against the tuned objective, the settings and a ready-to-paste <controller> element, then the
// ranking at their best), with Pareto metrics pareto.csv, the held-out replays as results folders,
// and manifest.json, each file written atomically.
#pragma once

#include <string>

#include "upright/base/result.hpp"
#include "upright/runner/tune/tune.hpp"

namespace upright::runner {

// The subfolders holding the held-out replays of the tuned and of the default settings.
extern const char* const kTunedFolder;
extern const char* const kDefaultsFolder;

// The text of tune.csv and tune.md.
std::string TuneCsv(const TuneResult& result);
std::string TuneMarkdown(const TuneResult& result);

// Creates `dir` if needed and writes tune.csv, tune.md, the held-out replays' results folders
// (kTunedFolder, kDefaultsFolder; with held-out seeds only), with Pareto metrics pareto.csv
// (pareto_writer.hpp) and, last, manifest.json; otherwise why not.
Status WriteTuneResults(const std::string& dir, const TuneResult& result);

}  // namespace upright::runner
