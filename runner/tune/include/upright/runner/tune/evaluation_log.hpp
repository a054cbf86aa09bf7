// The evaluation log of a tune (tune.log in its results folder): a header line naming what was
// tuned, then one line per evaluation appended and flushed as soon as it is scored, so a tune cut
// short resumes where it stopped. Plain text, one record a line, fields separated by tabs:
//   header:     upright-tune-log  format=1  version=...  controller=NAME...  budget=N  seed=N
//               holdout=N  scenario=SHA-256  robot=SHA-256  seeds=N N... (per scenario)
//               tune=SHA-256 or -
//               module=NAME:SHA-256 (per module file)
//   evaluation: controller  stage  index  values  objective  runs  survived  worst  violation
//               mean_metrics  failure
// Lists are space-separated; every double reads back bit for bit (the shortest decimal, -0,
// inf, -inf, nan, or nan:<16 hex digits> for any NaN but the default quiet one); \\, tab, CR and
// newline in text are escaped as \\, \t, \r and \n.
#pragma once

#include <cstddef>
#include <cstdio>
#include <map>
#include <memory>
#include <mutex>
#include <string>
#include <string_view>
#include <tuple>
#include <utility>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/tune/objective.hpp"
#include "upright/runner/tune/tune.hpp"
#include "upright/runner/tune/tune_plan.hpp"

namespace upright::runner {

// The log's file name in a tune's results folder.
inline constexpr const char* kEvaluationLogName = "tune.log";

// What identifies a tune: the fields of the header line, in order, as name and value.
struct TuneLogHeader {
  std::vector<std::pair<std::string, std::string>> fields;
  std::string Line() const;  // the header line, its newline included
};

// The header of a tune of `scenarios` with `options` and `plan` by the program at `tool_version`:
// the files' SHA-256 (an unreadable file hashes as ""), each scenario's seeds, the controllers,
// budget, seed, held-out seeds and Pareto metrics. The jobs are left out: they change nothing
// tuned.
TuneLogHeader MakeTuneLogHeader(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                                const TunePlan& plan, const std::string& tool_version);

// One evaluation as the log holds it.
struct LoggedEvaluation {
  std::string controller;
  EvaluationStage stage = EvaluationStage::kDefault;
  // In the search, the evaluation's number (0: the default setting); held out, 0 for the default
  // setting and 1 for the tuned one.
  std::size_t index = 0;
  std::vector<double> values;  // per knob; empty for the default setting
  EvaluationScore score;
};

// The evaluation's line, its newline included.
std::string EvaluationLogLine(const LoggedEvaluation& evaluation);
// A line (without its newline) read back; otherwise what is wrong with it.
Result<LoggedEvaluation> ParseEvaluationLogLine(std::string_view line);

// A tune's log, open for appending: the evaluations it held when opened are looked up by the
// tune, which appends those it plays. Safe to use from several threads.
class EvaluationLog {
 public:
  // A new log at `path` holding the header alone, replacing any file there; otherwise why not.
  static Result<std::unique_ptr<EvaluationLog>> Start(const std::string& path,
                                                      const TuneLogHeader& header);
  // The log at `path` read to resume a tune: refused ("path:line: ...") when it is missing, is
  // of another tune (another header) or has a line that does not read; a last line cut short
  // (no newline) is dropped from the file, and one with no complete header starts over.
  static Result<std::unique_ptr<EvaluationLog>> Resume(const std::string& path,
                                                       const TuneLogHeader& header);
  ~EvaluationLog();
  EvaluationLog(const EvaluationLog&) = delete;
  EvaluationLog& operator=(const EvaluationLog&) = delete;

  // The score logged for this controller, stage and index when its values are `values` bit for
  // bit; null otherwise.
  const EvaluationScore* Find(const std::string& controller, EvaluationStage stage,
                              std::size_t index, const std::vector<double>& values) const;
  // Appends the evaluation's line and flushes it; the first failure is kept (write_error).
  void Append(const LoggedEvaluation& evaluation);

  std::size_t logged() const { return logged_.size(); }  // evaluations read when opened
  std::string write_error() const;                       // "" while every line has been written

 private:
  EvaluationLog(std::string path, std::FILE* file) : path_(std::move(path)), file_(file) {}

  using Key = std::tuple<std::string, int, std::size_t>;  // controller, stage, index
  std::string path_;
  std::FILE* file_;
  std::map<Key, LoggedEvaluation> logged_;  // the later line of two with one key
  mutable std::mutex mutex_;
  std::string write_error_;
};

}  // namespace upright::runner
