// Tune files: which settings of which controllers a tune varies, over what ranges, and the
// objective with its bounds. Read strictly (like scenario files): every problem is a
// "path:line: reason" before anything runs. The format is in scenarios/README.md ("Tune files").
#pragma once

#include <map>
#include <string>

#include "upright/base/result.hpp"
#include "upright/runner/tune/knob.hpp"
#include "upright/runner/tune/objective.hpp"

namespace upright::runner {

struct TuneSpec {
  std::string path;  // the tune file; empty for the built-in defaults
  // Knobs by controller name; a controller not named here takes its built-in default knobs.
  std::map<std::string, std::vector<Knob>> knobs;
  std::map<std::string, int> controller_lines;  // where each controller is named
  Objective objective = DefaultObjective();
};

// Reads a tune file; on failure every problem found, one "path:line: reason" per line.
Result<TuneSpec> ReadTuneFile(const std::string& path);

// As ReadTuneFile, from text in memory (`path` only names it in messages).
Result<TuneSpec> ParseTuneText(const std::string& text, const std::string& path);

}  // namespace upright::runner
