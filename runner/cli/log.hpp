// The program's own messages, through one logger. Each line has a level and a stream: stdout for
// what a command did (where its results went, what survived), stderr for problems, debug lines
// and the controller modules' messages; the progress line (progress.hpp) shows only when the
// logger says so. Default: errors, warnings and information; --quiet (Verbosity::kQuiet): errors
// and warnings only, no progress; --verbose: debug lines too. The safety caution always shows.
#pragma once

#include <cstdio>
#include <string>
#include <string_view>

#include "upright/runner/metrics/module_log.hpp"

namespace upright::cli {

using runner::LogLevel;

enum class Verbosity { kQuiet, kNormal, kVerbose };

class Logger {
 public:
  // Writes to `out` (stdout's role) and `err` (stderr's role); neither is closed.
  Logger(Verbosity verbosity, std::FILE* out, std::FILE* err);

  Verbosity verbosity() const { return verbosity_; }
  // Whether a line at `level` is written: errors and warnings always, information unless quiet,
  // debug when verbose.
  bool Shows(LogLevel level) const;
  // Whether the progress line shows (not when quiet).
  bool ShowsProgress() const { return verbosity_ != Verbosity::kQuiet; }

  // `line` and a newline on stdout, when `level` shows.
  void Out(LogLevel level, std::string_view line) const;
  // `line` and a newline on stderr, when `level` shows.
  void Err(LogLevel level, std::string_view line) const;

  void Error(std::string_view line) const { Err(LogLevel::kError, line); }
  void Warning(std::string_view line) const { Err(LogLevel::kWarning, line); }
  void Info(std::string_view line) const { Out(LogLevel::kInfo, line); }
  // On stderr, after "debug: ".
  void Debug(std::string_view line) const;
  // The safety caution: on stdout, whatever the verbosity.
  void Caution(std::string_view line) const;

 private:
  void Write(std::FILE* stream, std::string_view prefix, std::string_view line) const;

  Verbosity verbosity_;
  std::FILE* out_;
  std::FILE* err_;
};

// The program's logger: stdout and stderr at Verbosity::kNormal until SetLogVerbosity.
const Logger& Log();

// Sets the program's verbosity; main calls it once, from the flags, before the command runs.
void SetLogVerbosity(Verbosity verbosity);

// printf into a string, for the lines the logger takes.
std::string Printf(const char* format, ...) __attribute__((format(printf, 1, 2)));

}  // namespace upright::cli
