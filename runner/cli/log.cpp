#include "log.hpp"

#include <cstdarg>

namespace upright::cli {
namespace {

Logger& ProgramLogger() {
  static Logger logger(Verbosity::kNormal, stdout, stderr);
  return logger;
}

}  // namespace

Logger::Logger(Verbosity verbosity, std::FILE* out, std::FILE* err)
    : verbosity_(verbosity), out_(out), err_(err) {}

bool Logger::Shows(LogLevel level) const {
  switch (verbosity_) {
    case Verbosity::kQuiet:
      return level >= LogLevel::kWarning;
    case Verbosity::kNormal:
      return level >= LogLevel::kInfo;
    case Verbosity::kVerbose:
      return true;
  }
  return true;
}

void Logger::Out(LogLevel level, std::string_view line) const {
  if (Shows(level)) Write(out_, "", line);
}

void Logger::Err(LogLevel level, std::string_view line) const {
  if (Shows(level)) Write(err_, "", line);
}

void Logger::Debug(std::string_view line) const {
  if (Shows(LogLevel::kDebug)) Write(err_, "debug: ", line);
}

void Logger::Caution(std::string_view line) const { Write(out_, "", line); }

void Logger::Write(std::FILE* stream, std::string_view prefix, std::string_view line) const {
  // Flushed line by line, so that stdout and stderr interleave in the order written.
  std::fwrite(prefix.data(), 1, prefix.size(), stream);
  std::fwrite(line.data(), 1, line.size(), stream);
  std::fputc('\n', stream);
  std::fflush(stream);
}

const Logger& Log() { return ProgramLogger(); }

void SetLogVerbosity(Verbosity verbosity) { ProgramLogger() = Logger(verbosity, stdout, stderr); }

std::string Printf(const char* format, ...) {
  std::va_list args;
  va_start(args, format);
  std::va_list again;
  va_copy(again, args);
  const int size = std::vsnprintf(nullptr, 0, format, args);
  va_end(args);
  std::string text(size > 0 ? static_cast<std::size_t>(size) : 0, '\0');
  if (size > 0) std::vsnprintf(text.data(), text.size() + 1, format, again);
  va_end(again);
  return text;
}

}  // namespace upright::cli
