#include "module_messages.hpp"

#include <cmath>

#include "upright/base/number_text.hpp"

namespace upright::cli {
namespace {

bool Blank(char c) { return c == ' ' || c == '\t' || c == '\r'; }

std::string_view Trimmed(std::string_view text) {
  while (!text.empty() && Blank(text.front())) text.remove_prefix(1);
  while (!text.empty() && Blank(text.back())) text.remove_suffix(1);
  return text;
}

// "t = 0.250 s", or "create" before the first control tick.
std::string When(double time_s) {
  return std::isnan(time_s) ? std::string("create") : "t = " + FixedText(time_s, 3) + " s";
}

}  // namespace

std::string OneLine(std::string_view text) {
  std::string line;
  while (!text.empty()) {
    const std::size_t end = text.find('\n');
    const std::string_view piece = Trimmed(text.substr(0, end));
    if (!piece.empty()) {
      if (!line.empty()) line += " | ";
      for (const char c : piece) {
        const auto byte = static_cast<unsigned char>(c);
        line += byte < 0x20 || byte == 0x7f ? ' ' : c;
      }
    }
    if (end == std::string_view::npos) break;
    text.remove_prefix(end + 1);
  }
  return line;
}

void LogModuleMessages(const Logger& logger, std::string_view where, const runner::ModuleLog& log) {
  for (const runner::ModuleMessage& message : log.messages) {
    logger.Err(message.level, std::string(where) + ", " + When(message.time_s) + ": module " +
                                  runner::ToString(message.level) + ": " + OneLine(message.text));
  }
  if (log.dropped > 0) {
    logger.Err(log.dropped_level,
               Printf("%.*s: module: %ld more message(s) dropped (the first %zu of a run are kept)",
                      static_cast<int>(where.size()), where.data(), log.dropped,
                      runner::kModuleMessagesKept));
  }
}

void LogModuleMessages(const Logger& logger, const runner::BatchResult& batch) {
  for (const runner::RunResult& run : batch.runs) {
    const std::string where =
        run.scenario + " / " + run.controller + " / seed " + std::to_string(run.seed);
    LogModuleMessages(logger, where, run.module_log);
    LogModuleMessages(logger, where + ", linear twin", run.twin_module_log);
  }
}

}  // namespace upright::cli
