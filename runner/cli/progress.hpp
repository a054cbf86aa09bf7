// The progress of a long command: runs done and expected in; on a terminal one line on stderr
// redrawn in place ("  12/40 runs   30 %  elapsed 0:04  left ~0:09"), elsewhere (a CI job, a log
// file) a plain line every few seconds and at the end ("upright run: 12/40 runs, 30 %, 0:04
// elapsed, ~0:09 left"), so a log shows the work going on.
#pragma once

#include <chrono>
#include <cstddef>
#include <cstdio>
#include <string>

#include "upright/runner/run/batch.hpp"

namespace upright::cli {

struct ProgressOptions {
  std::string label = "upright run";  // starts each plain line
  double interval_s = 5;              // plain lines at most this often (0: at every update)
  std::FILE* stream = stderr;         // where the progress goes; a terminal gets the live line
};

class ProgressLine {
 public:
  // Starts the clock and notes whether the stream is a terminal.
  explicit ProgressLine(ProgressOptions options = {});

  // Shows `done` of `all` runs: redraws the live line (ended with a newline when done == all),
  // or prints a plain line when the interval has passed since the last one, or done == all.
  // A `note` not empty ("best 3.21") follows the runs on either line.
  void Show(std::size_t done, std::size_t all, const std::string& note = "");

  // A callback for the runner that calls Show; this line must outlive it.
  runner::ProgressFn Callback();

  // Ends what the last Show left open (the runs expected shrank after the last one ran): the
  // live line's newline, or a last plain line with the runs done.
  void Close();

 private:
  ProgressOptions options_;
  bool terminal_ = false;
  bool open_ = false;     // the last Show was not the final one (done < all)
  std::size_t done_ = 0;  // as last shown
  std::chrono::steady_clock::time_point start_;
  std::chrono::steady_clock::time_point last_line_;  // the last plain line (at first the start)
};

}  // namespace upright::cli
