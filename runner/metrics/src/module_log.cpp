#include "upright/runner/metrics/module_log.hpp"

#include <algorithm>
#include <cstring>

namespace upright::runner {
namespace {

constexpr std::string_view kCutMark = "...";

bool Continuation(unsigned char byte) { return byte >= 0x80 && byte <= 0xbf; }

// The length of the well-formed UTF-8 sequence starting at text[i], or 0 when the byte there
// starts none. The ranges of the second byte are those of RFC 3629 §4 (no overlong forms, no
// surrogates, nothing above U+10FFFF).
std::size_t SequenceLength(std::string_view text, std::size_t i) {
  const auto at = [&](std::size_t k) { return static_cast<unsigned char>(text[i + k]); };
  const unsigned char lead = at(0);
  if (lead < 0x80) return 1;
  std::size_t length = 0;
  unsigned char second_lo = 0x80, second_hi = 0xbf;
  if (lead >= 0xc2 && lead <= 0xdf) {
    length = 2;
  } else if (lead >= 0xe0 && lead <= 0xef) {
    length = 3;
    if (lead == 0xe0) second_lo = 0xa0;
    if (lead == 0xed) second_hi = 0x9f;
  } else if (lead >= 0xf0 && lead <= 0xf4) {
    length = 4;
    if (lead == 0xf0) second_lo = 0x90;
    if (lead == 0xf4) second_hi = 0x8f;
  } else {
    return 0;
  }
  if (i + length > text.size() || at(1) < second_lo || at(1) > second_hi) return 0;
  for (std::size_t k = 2; k < length; ++k) {
    if (!Continuation(at(k))) return 0;
  }
  return length;
}

// Copies whole characters of `text` into `out` (room for `capacity` bytes), each byte that starts
// no well-formed sequence as '?'; stops before a character that would not fit. Returns the bytes
// written; as many as text.size() when everything fitted.
std::size_t CopyUtf8(std::string_view text, char* out, std::size_t capacity) {
  std::size_t in = 0, written = 0;
  while (in < text.size()) {
    const std::size_t length = SequenceLength(text, in);
    const std::size_t step = length == 0 ? 1 : length;
    if (written + step > capacity) break;
    if (length == 0) {
      out[written] = '?';
    } else {
      std::memcpy(out + written, text.data() + in, length);
    }
    in += step;
    written += step;
  }
  return written;
}

}  // namespace

const char* ToString(LogLevel level) {
  switch (level) {
    case LogLevel::kDebug:
      return "debug";
    case LogLevel::kInfo:
      return "info";
    case LogLevel::kWarning:
      return "warning";
    case LogLevel::kError:
      return "error";
  }
  return "error";
}

LogLevel LogLevelFromModule(int level) {
  return static_cast<LogLevel>(
      std::clamp(level, static_cast<int>(LogLevel::kDebug), static_cast<int>(LogLevel::kError)));
}

ModuleLogRecorder::ModuleLogRecorder(LogLevel min_level) : min_level_(min_level) {
  slots_.reserve(kModuleMessagesKept);
}

void ModuleLogRecorder::Add(int level, double time_s, std::string_view text) {
  const LogLevel read = LogLevelFromModule(level);
  if (read < min_level_) return;
  if (slots_.size() == kModuleMessagesKept) {
    ++dropped_;
    dropped_level_ = std::max(dropped_level_, read);
    return;
  }
  Slot& slot = slots_.emplace_back();  // within the reserved capacity: no allocation
  slot.time_s = time_s;
  slot.level = read;
  if (text.size() <= kModuleMessageBytes) {
    slot.size = CopyUtf8(text, slot.bytes.data(), kModuleMessageBytes);
    return;
  }
  slot.size = CopyUtf8(text, slot.bytes.data(), kModuleMessageBytes - kCutMark.size());
  std::memcpy(slot.bytes.data() + slot.size, kCutMark.data(), kCutMark.size());
  slot.size += kCutMark.size();
}

ModuleLog ModuleLogRecorder::Log() const {
  ModuleLog log;
  log.messages.reserve(slots_.size());
  for (const Slot& slot : slots_) {
    log.messages.push_back({slot.time_s, slot.level, std::string(slot.bytes.data(), slot.size)});
  }
  log.dropped = dropped_;
  log.dropped_level = dropped_level_;
  return log;
}

}  // namespace upright::runner
