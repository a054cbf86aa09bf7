// A results folder found under the report's folder: where it is and which kinds of results it
// holds, so each gets its section.
#pragma once

#include <string>

namespace upright::runner::internal {

struct ResultsFolder {
  std::string path;       // to read from
  std::string relative;   // for headings: "." or "envelope", "a/b", ...
  bool run = false;       // summary.csv: upright run or demo
  bool envelope = false;  // envelope.csv
  bool sweep = false;     // sweep.csv
  bool design = false;    // loop_response.csv: upright design --report
  bool tune = false;      // tune.csv: upright tune
  std::string id;         // the prefix of its element ids ("f0-", "f1-", ...)
};

}  // namespace upright::runner::internal
