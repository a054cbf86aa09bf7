// What a controller module logged during one run (or its linear twin): the first messages at or
// above a level, each with its simulated time and cut to a fixed length, and a count of the rest.
// ModuleLogRecorder takes them as the controller host hands them on, from create to the last step,
// and allocates nothing once built: a module that logs every step costs a run no memory.
#pragma once

#include <array>
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace upright::runner {

// A message's level, with the values of upright_log_level (controller_abi.h).
enum class LogLevel { kDebug = 0, kInfo = 1, kWarning = 2, kError = 3 };

// "debug", "info", "warning", "error".
const char* ToString(LogLevel level);

// The level a module passed: upright_log_level's values; below them reads debug, above error.
LogLevel LogLevelFromModule(int level);

inline constexpr std::size_t kModuleMessagesKept = 20;   // per run (and per twin)
inline constexpr std::size_t kModuleMessageBytes = 512;  // per message, a cut one ending "..."

struct ModuleMessage {
  double time_s = 0;  // simulated time of the control tick that logged it; NaN: before the first
  LogLevel level = LogLevel::kInfo;
  std::string text;  // UTF-8 (an invalid byte reads '?'), at most kModuleMessageBytes bytes
};

struct ModuleLog {
  std::vector<ModuleMessage> messages;  // the first kModuleMessagesKept kept, in the order logged
  long dropped = 0;                     // messages at or above the level past those
  LogLevel dropped_level = LogLevel::kDebug;  // the most severe of the dropped (when any)
};

class ModuleLogRecorder {
 public:
  // Keeps messages at `min_level` and above; all its storage is allocated here.
  explicit ModuleLogRecorder(LogLevel min_level = LogLevel::kInfo);

  // One message: `level` as the module passed it, the tick's time (NaN before the first), the
  // text. Never allocates.
  void Add(int level, double time_s, std::string_view text);

  // What was recorded so far.
  ModuleLog Log() const;

 private:
  struct Slot {
    double time_s = 0;
    LogLevel level = LogLevel::kInfo;
    std::size_t size = 0;
    std::array<char, kModuleMessageBytes> bytes{};
  };
  LogLevel min_level_;
  std::vector<Slot> slots_;  // capacity kModuleMessagesKept, reserved up front
  long dropped_ = 0;
  LogLevel dropped_level_ = LogLevel::kDebug;
};

}  // namespace upright::runner
