#include "upright/runner/tune/evaluation_log.hpp"

#include <algorithm>
#include <bit>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <limits>
#include <sstream>
#include <system_error>
#include <type_traits>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {
namespace {

constexpr std::string_view kMagic = "upright-tune-log";
constexpr std::string_view kFormat = "1";
constexpr int kEvaluationFields = 11;
// The bits of std::numeric_limits<double>::quiet_NaN(), written "nan"; any other NaN keeps its
// bits in the text.
constexpr std::uint64_t kQuietNanBits = 0x7ff8000000000000ULL;

// The text in double quotes.
std::string Quoted(std::string_view text) {
  std::string quoted = "\"";
  quoted.append(text);
  quoted += '"';
  return quoted;
}

std::string Escape(std::string_view text) {
  std::string out;
  for (const char c : text) {
    switch (c) {
      case '\\':
        out += "\\\\";
        break;
      case '\t':
        out += "\\t";
        break;
      case '\n':
        out += "\\n";
        break;
      case '\r':
        out += "\\r";
        break;
      default:
        out += c;
    }
  }
  return out;
}

Result<std::string> Unescape(std::string_view text) {
  std::string out;
  for (std::size_t i = 0; i < text.size(); ++i) {
    if (text[i] != '\\') {
      out += text[i];
      continue;
    }
    const char next = i + 1 < text.size() ? text[i + 1] : '\0';
    switch (next) {
      case '\\':
        out += '\\';
        break;
      case 't':
        out += '\t';
        break;
      case 'n':
        out += '\n';
        break;
      case 'r':
        out += '\r';
        break;
      default:
        return Failure("a backslash not followed by \\, t, n or r");
    }
    ++i;
  }
  return out;
}

void AppendDouble(std::string* out, double value) {
  if (std::isnan(value)) {
    const auto bits = std::bit_cast<std::uint64_t>(value);
    if (bits == kQuietNanBits) {
      *out += "nan";
      return;
    }
    static constexpr char kHex[] = "0123456789abcdef";
    *out += "nan:";
    for (int shift = 60; shift >= 0; shift -= 4) *out += kHex[(bits >> shift) & 0xf];
  } else if (value == 0 && std::signbit(value)) {
    *out += "-0";  // number_text writes every zero unsigned
  } else {
    AppendShortest(out, value);
  }
}

Result<double> ReadDouble(std::string_view text) {
  if (text == "nan") return std::bit_cast<double>(kQuietNanBits);
  if (text.starts_with("nan:")) {
    const std::string_view hex = text.substr(4);
    std::uint64_t bits = 0;
    const auto [end, error] = std::from_chars(hex.data(), hex.data() + hex.size(), bits, 16);
    const double value = std::bit_cast<double>(bits);
    if (hex.size() != 16 || error != std::errc() || end != hex.data() + hex.size() ||
        !std::isnan(value)) {
      return Failure(Quoted(text) + " is not a NaN's 16 hex digits");
    }
    return value;
  }
  double value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  // from_chars reads "nan" itself: only the forms above name a NaN.
  if (text.empty() || error != std::errc() || end != text.data() + text.size() ||
      std::isnan(value)) {
    return Failure(Quoted(text) + " is not a number");
  }
  return value;
}

template <typename Int>
Result<Int> ReadCount(std::string_view text, const char* what) {
  Int value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  bool negative = false;
  if constexpr (std::is_signed_v<Int>) negative = value < 0;
  if (text.empty() || error != std::errc() || end != text.data() + text.size() || negative) {
    return Failure(std::string(what) + " " + Quoted(text) + " is not a count");
  }
  return value;
}

void AppendList(std::string* out, const std::vector<double>& values) {
  for (std::size_t i = 0; i < values.size(); ++i) {
    if (i > 0) *out += ' ';
    AppendDouble(out, values[i]);
  }
}

Result<std::vector<double>> ReadList(std::string_view text, const char* what) {
  std::vector<double> values;
  if (text.empty()) return values;
  std::size_t start = 0;
  while (true) {
    const std::size_t space = text.find(' ', start);
    const std::string_view item = text.substr(
        start, space == std::string_view::npos ? std::string_view::npos : space - start);
    Result<double> value = ReadDouble(item);
    if (!value) return Failure(std::string(what) + ": " + value.error());
    values.push_back(*value);
    if (space == std::string_view::npos) return values;
    start = space + 1;
  }
}

std::vector<std::string_view> Split(std::string_view text, char separator) {
  std::vector<std::string_view> parts;
  std::size_t start = 0;
  while (true) {
    const std::size_t at = text.find(separator, start);
    if (at == std::string_view::npos) {
      parts.push_back(text.substr(start));
      return parts;
    }
    parts.push_back(text.substr(start, at - start));
    start = at + 1;
  }
}

bool StageFromString(std::string_view text, EvaluationStage* stage) {
  for (const EvaluationStage s : {EvaluationStage::kDefault, EvaluationStage::kGlobal,
                                  EvaluationStage::kLocal, EvaluationStage::kHeldOut}) {
    if (text == ToString(s)) {
      *stage = s;
      return true;
    }
  }
  return false;
}

bool SameBits(const std::vector<double>& a, const std::vector<double>& b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i) {
    if (std::bit_cast<std::uint64_t>(a[i]) != std::bit_cast<std::uint64_t>(b[i])) return false;
  }
  return true;
}

// The header line's fields read back (without the newline); otherwise why not.
Result<TuneLogHeader> ParseHeader(std::string_view line) {
  const std::vector<std::string_view> parts = Split(line, '\t');
  if (parts.front() != kMagic) {
    return Failure("not a tune evaluation log (its first line does not start with " +
                   std::string(kMagic) + ")");
  }
  TuneLogHeader header;
  for (std::size_t i = 1; i < parts.size(); ++i) {
    const std::size_t equals = parts[i].find('=');
    if (equals == std::string_view::npos) {
      return Failure("header field " + Quoted(parts[i]) + " is not name=value");
    }
    Result<std::string> value = Unescape(parts[i].substr(equals + 1));
    if (!value) return Failure("header field " + std::string(parts[i]) + ": " + value.error());
    header.fields.emplace_back(std::string(parts[i].substr(0, equals)), std::move(*value));
  }
  return header;
}

// "" when the two headers are equal; otherwise the first field that differs.
std::string HeaderDifference(const TuneLogHeader& here, const TuneLogHeader& logged) {
  const auto value_text = [](const std::string& v) { return v.empty() ? "(none)" : v; };
  std::map<std::string, int> seen;
  for (std::size_t i = 0; i < std::max(here.fields.size(), logged.fields.size()); ++i) {
    if (i >= here.fields.size()) {
      return "the log has " + logged.fields[i].first + " " + value_text(logged.fields[i].second) +
             " too";
    }
    const auto& [name, value] = here.fields[i];
    const int nth = ++seen[name];
    if (i >= logged.fields.size()) return "the log has no " + name + " " + value_text(value);
    if (logged.fields[i].first != name) {
      return "the log has " + logged.fields[i].first + " where this tune has " + name;
    }
    if (logged.fields[i].second != value) {
      const std::string label = name == "format" || name == "version" || name == "budget" ||
                                        name == "seed" || name == "holdout" || name == "tune"
                                    ? name
                                    : name + " " + std::to_string(nth);
      return label + " is " + value_text(value) + " here, " + value_text(logged.fields[i].second) +
             " in the log";
    }
  }
  return "";
}

std::string OsError(int error) { return std::generic_category().message(error); }

}  // namespace

std::string TuneLogHeader::Line() const {
  std::string line(kMagic);
  for (const auto& [name, value] : fields) line += "\t" + name + "=" + Escape(value);
  return line + "\n";
}

TuneLogHeader MakeTuneLogHeader(const std::vector<Scenario>& scenarios, const TuneOptions& options,
                                const TunePlan& plan, const std::string& tool_version) {
  TuneLogHeader header;
  auto& f = header.fields;
  f.emplace_back("format", kFormat);
  f.emplace_back("version", tool_version);
  for (const ControllerTunePlan& controller : plan.controllers) {
    f.emplace_back("controller", controller.name);
  }
  f.emplace_back("budget", std::to_string(options.budget_runs));
  f.emplace_back("seed", std::to_string(options.seed));
  f.emplace_back("holdout", std::to_string(options.holdout_seeds));
  // What is searched: a Pareto front asks for other settings after the start.
  f.emplace_back("pareto", plan.pareto_metrics.empty()
                               ? std::string("none")
                               : plan.pareto_metrics[0] + "," + plan.pareto_metrics[1]);
  for (const Scenario& scenario : scenarios) {
    f.emplace_back("scenario", Sha256OfFile(scenario.path).value_or(""));
    f.emplace_back("robot", Sha256OfFile(scenario.model_path).value_or(""));
    std::string seeds;
    for (const std::uint64_t seed : scenario.seeds) {
      if (!seeds.empty()) seeds += ' ';
      seeds += std::to_string(seed);
    }
    f.emplace_back("seeds", seeds);
  }
  f.emplace_back("tune", plan.tune_path.empty() ? "-" : Sha256OfFile(plan.tune_path).value_or(""));
  for (const ControllerTunePlan& controller : plan.controllers) {
    if (controller.builtin) continue;
    f.emplace_back("module", controller.name + ":" + Sha256OfFile(controller.module).value_or(""));
  }
  return header;
}

std::string EvaluationLogLine(const LoggedEvaluation& e) {
  std::string line = Escape(e.controller);
  line += '\t';
  line += ToString(e.stage);
  line += '\t';
  line += std::to_string(e.index);
  line += '\t';
  AppendList(&line, e.values);
  line += '\t';
  AppendDouble(&line, e.score.objective);
  line += '\t' + std::to_string(e.score.runs) + '\t' + std::to_string(e.score.survived) + '\t';
  AppendList(&line, e.score.worst);
  line += '\t';
  AppendList(&line, e.score.violation);
  line += '\t';
  AppendList(&line, e.score.mean_metrics);
  line += '\t';
  line += Escape(e.score.failure);
  return line + "\n";
}

Result<LoggedEvaluation> ParseEvaluationLogLine(std::string_view line) {
  const std::vector<std::string_view> parts = Split(line, '\t');
  if (parts.size() != kEvaluationFields) {
    return Failure("an evaluation has " + std::to_string(kEvaluationFields) +
                   " tab-separated fields, this line " + std::to_string(parts.size()));
  }
  LoggedEvaluation e;
  Result<std::string> controller = Unescape(parts[0]);
  if (!controller) return Failure("controller: " + controller.error());
  e.controller = std::move(*controller);
  if (!StageFromString(parts[1], &e.stage)) {
    return Failure("stage " + Quoted(parts[1]) + " is none of default, global, local, held_out");
  }
  Result<std::size_t> index = ReadCount<std::size_t>(parts[2], "index");
  if (!index) return Failure(index.error());
  e.index = *index;
  Result<std::vector<double>> values = ReadList(parts[3], "values");
  if (!values) return Failure(values.error());
  e.values = std::move(*values);
  Result<double> objective = ReadDouble(parts[4]);
  if (!objective) return Failure("objective: " + objective.error());
  e.score.objective = *objective;
  Result<int> runs = ReadCount<int>(parts[5], "runs");
  if (!runs) return Failure(runs.error());
  Result<int> survived = ReadCount<int>(parts[6], "survived");
  if (!survived) return Failure(survived.error());
  if (*survived > *runs) {
    return Failure("survived " + std::to_string(*survived) + " is more than runs " +
                   std::to_string(*runs));
  }
  e.score.runs = *runs;
  e.score.survived = *survived;
  Result<std::vector<double>> worst = ReadList(parts[7], "worst");
  if (!worst) return Failure(worst.error());
  Result<std::vector<double>> violation = ReadList(parts[8], "violation");
  if (!violation) return Failure(violation.error());
  if (worst->size() != violation->size()) {
    return Failure("worst has " + std::to_string(worst->size()) + " values, violation " +
                   std::to_string(violation->size()));
  }
  e.score.worst = std::move(*worst);
  e.score.violation = std::move(*violation);
  Result<std::vector<double>> means = ReadList(parts[9], "mean_metrics");
  if (!means) return Failure(means.error());
  if (means->size() != MetricColumns().size()) {
    return Failure("mean_metrics has " + std::to_string(means->size()) + " values, not one per " +
                   "metric column (" + std::to_string(MetricColumns().size()) + ")");
  }
  e.score.mean_metrics = std::move(*means);
  Result<std::string> failure = Unescape(parts[10]);
  if (!failure) return Failure("failure: " + failure.error());
  e.score.failure = std::move(*failure);
  return e;
}

Result<std::unique_ptr<EvaluationLog>> EvaluationLog::Start(const std::string& path,
                                                            const TuneLogHeader& header) {
  std::FILE* file = std::fopen(path.c_str(), "wb");
  if (file == nullptr) {
    return Failure(path + ": cannot write the evaluation log: " + OsError(errno));
  }
  const std::string line = header.Line();
  const bool written =
      std::fwrite(line.data(), 1, line.size(), file) == line.size() && std::fflush(file) == 0;
  const int why = errno;
  std::unique_ptr<EvaluationLog> log(new EvaluationLog(path, file));
  if (!written) return Failure(path + ": cannot write the evaluation log: " + OsError(why));
  return log;
}

Result<std::unique_ptr<EvaluationLog>> EvaluationLog::Resume(const std::string& path,
                                                             const TuneLogHeader& header) {
  std::error_code error;
  if (!std::filesystem::is_regular_file(path, error)) {
    return Failure(path + ": no evaluation log to resume from (run without --resume to start " +
                   "the tune)");
  }
  std::ifstream in(path, std::ios::binary);
  std::ostringstream bytes;
  bytes << in.rdbuf();
  if (!in && !in.eof()) return Failure(path + ": cannot read the evaluation log");
  const std::string text = bytes.str();
  // Complete lines only: whatever follows the last newline was cut short.
  const std::size_t kept = text.rfind('\n') == std::string::npos ? 0 : text.rfind('\n') + 1;
  if (kept == 0) return Start(path, header);  // not even the header was written whole
  const std::vector<std::string_view> lines =
      Split(std::string_view(text).substr(0, kept - 1), '\n');
  Result<TuneLogHeader> logged_header = ParseHeader(lines.front());
  if (!logged_header) return Failure(path + ":1: " + logged_header.error());
  if (const std::string differs = HeaderDifference(header, *logged_header); !differs.empty()) {
    return Failure(path + ":1: the log is of another tune: " + differs +
                   " (run without --resume to start over)");
  }
  std::map<Key, LoggedEvaluation> logged;
  for (std::size_t i = 1; i < lines.size(); ++i) {
    Result<LoggedEvaluation> e = ParseEvaluationLogLine(lines[i]);
    if (!e) return Failure(path + ":" + std::to_string(i + 1) + ": " + e.error());
    Key key{e->controller, static_cast<int>(e->stage), e->index};
    logged[std::move(key)] = std::move(*e);
  }
  if (kept < text.size()) {
    std::filesystem::resize_file(path, kept, error);
    if (error) return Failure(path + ": cannot cut the log's last line: " + error.message());
  }
  std::FILE* file = std::fopen(path.c_str(), "ab");
  if (file == nullptr) {
    return Failure(path + ": cannot append to the evaluation log: " + OsError(errno));
  }
  std::unique_ptr<EvaluationLog> log(new EvaluationLog(path, file));
  log->logged_ = std::move(logged);
  return log;
}

EvaluationLog::~EvaluationLog() { std::fclose(file_); }

const EvaluationScore* EvaluationLog::Find(const std::string& controller, EvaluationStage stage,
                                           std::size_t index,
                                           const std::vector<double>& values) const {
  const auto it = logged_.find(Key{controller, static_cast<int>(stage), index});
  if (it == logged_.end() || !SameBits(it->second.values, values)) return nullptr;
  return &it->second.score;
}

void EvaluationLog::Append(const LoggedEvaluation& evaluation) {
  const std::string line = EvaluationLogLine(evaluation);
  std::lock_guard<std::mutex> lock(mutex_);
  if (!write_error_.empty()) return;
  if (std::fwrite(line.data(), 1, line.size(), file_) != line.size() || std::fflush(file_) != 0) {
    write_error_ = path_ + ": cannot append to the evaluation log: " + OsError(errno);
  }
}

std::string EvaluationLog::write_error() const {
  std::lock_guard<std::mutex> lock(mutex_);
  return write_error_;
}

}  // namespace upright::runner
