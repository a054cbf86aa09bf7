// The progress line of a long command: runs done and expected in, one line on stderr out
// ("  12/40 runs   30 %  elapsed 0:04  left ~0:09"), redrawn in place, and only on a terminal.
#pragma once

#include <chrono>
#include <cstddef>

#include "upright/runner/batch.hpp"

namespace upright::cli {

class ProgressLine {
 public:
  // Starts the clock and notes whether stderr is a terminal (nothing is drawn when it is not).
  ProgressLine();

  // Redraws the line for `done` of `all` runs; ends it with a newline when done == all.
  void Show(std::size_t done, std::size_t all);

  // A callback for the runner that calls Show; this line must outlive it.
  runner::ProgressFn Callback();

  // Ends a line the last Show left open (the runs expected shrank after the last one ran).
  void Close();

 private:
  bool terminal_ = false;
  bool open_ = false;  // a line drawn without its newline yet
  std::chrono::steady_clock::time_point start_;
};

}  // namespace upright::cli
