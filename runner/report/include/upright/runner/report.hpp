// The HTML report: a results folder (of `upright run` / `demo`, `envelope` or `sweep`, or a folder
// holding such folders) in; one self-contained report.html beside the results out — time plots
// per scenario, the tables, envelope, map, sweep and gap charts as inline SVG, the input files
// with their SHA-256 and the safety caution. No script, no link, nothing fetched.
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

enum class ReportStatus {
  kWritten,      // report.html written
  kNoResults,    // the folder holds no results files (ReportLooksFor)
  kBadInput,     // a results file could not be read or parsed; nothing written
  kWriteFailed,  // report.html could not be written
};

struct ReportOutcome {
  ReportStatus status = ReportStatus::kNoResults;
  std::string path;         // <dir>/report.html
  std::size_t bytes = 0;    // its size when written
  std::size_t folders = 0;  // results folders found
  std::string message;      // what went wrong, when status is not kWritten
};

// What the report looks for, for messages: the files that mark a results folder and where.
std::string ReportLooksFor();

// The results folders under `dir`, relative to it ("." first, then subfolders in sorted order;
// at most 3 levels down, traces/ skipped): folders holding summary.csv, envelope.csv or
// sweep.csv.
std::vector<std::string> FindResultsFolders(const std::string& dir);

// Builds the report of `dir` and writes it atomically to <dir>/report.html. The bytes depend only
// on the folder's results files (never on timings, the clock or where the folder lies).
ReportOutcome MakeReport(const std::string& dir, const ReportOptions& options = {});

// MakeReport with default options, for callers that only need yes or no (the demo): true and
// *report_path when written; false and *error otherwise.
bool WriteReport(const std::string& dir, std::string* report_path, std::string* error);

}  // namespace upright::runner
