// The HTML report: a results folder (of `upright run` / `demo`, `envelope`, `sweep` or `design
// --report`, or a folder holding such folders) in; one self-contained report.html beside the
// results out — time plots per scenario, the tables, envelope, map, sweep and gap charts, the
// designs' Bode, Nyquist and push-response plots as inline SVG, the input files with their
// SHA-256 and the safety caution. No script, no link, nothing fetched.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner {

inline constexpr const char* kReportFileName = "report.html";

struct ReportOptions {
  // Samples per plotted series at most (min/max decimation keeps every peak); >= 4.
  std::size_t max_points = 480;

  // Fine when valid; otherwise the broken rule, naming the field and value.
  Status Validate() const;
};

// What MakeReport wrote.
struct ReportWritten {
  std::string path;         // <dir>/report.html
  std::size_t bytes = 0;    // its size
  std::size_t folders = 0;  // results folders found
};

// Why MakeReport wrote nothing, in kinds a caller can choose its exit code by.
enum class ReportProblem {
  kNoResults,    // the folder holds no results files (ReportLooksFor)
  kBadInput,     // the options are refused, or a results file could not be read or parsed
  kWriteFailed,  // report.html could not be written
};

struct ReportFailure {
  ReportProblem problem = ReportProblem::kBadInput;
  std::string message;  // what went wrong
};

// What the report looks for, for messages: the files that mark a results folder and where.
std::string ReportLooksFor();

// The results folders under `dir`, relative to it ("." first, then subfolders in sorted order;
// at most 3 levels down, traces/ skipped): folders holding summary.csv, envelope.csv, sweep.csv
// or loop_response.csv.
std::vector<std::string> FindResultsFolders(const std::string& dir);

// Builds the report of `dir` and writes it atomically to <dir>/report.html. The bytes depend only
// on the folder's results files (never on timings, the clock or where the folder lies).
Result<ReportWritten, ReportFailure> MakeReport(const std::string& dir,
                                                const ReportOptions& options = {});

// MakeReport with default options, for callers that only need yes or no (the demo): the path of
// the report written, or why none was.
Result<std::string> WriteReport(const std::string& dir);

}  // namespace upright::runner
