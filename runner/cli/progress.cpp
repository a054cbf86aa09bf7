#include "progress.hpp"

#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <string>
#include <utility>

#include "upright/base/number_text.hpp"

namespace upright::cli {
namespace {

// Seconds as m:ss.
std::string Clock(double seconds) {
  const long s = std::lround(std::max(0.0, seconds));
  char text[32];
  std::snprintf(text, sizeof text, "%ld:%02ld", s / 60, s % 60);
  return text;
}

double Seconds(std::chrono::steady_clock::duration d) {
  return std::chrono::duration<double>(d).count();
}

}  // namespace

ProgressLine::ProgressLine(ProgressOptions options)
    : options_(std::move(options)),
      terminal_(isatty(fileno(options_.stream)) != 0),
      start_(std::chrono::steady_clock::now()),
      last_line_(start_) {}

void ProgressLine::Show(std::size_t done, std::size_t all, const std::string& note) {
  done_ = done;
  const auto now = std::chrono::steady_clock::now();
  const double elapsed = Seconds(now - start_);
  const double eta = elapsed / static_cast<double>(done) * static_cast<double>(all - done);
  const double percent = 100.0 * static_cast<double>(done) / static_cast<double>(all);
  if (terminal_) {
    open_ = done != all;
    std::fprintf(options_.stream, "\r  %zu/%zu runs%s%s  %3s %%  elapsed %s  left ~%s   ", done,
                 all, note.empty() ? "" : "  ", note.c_str(), FixedText(percent, 0).c_str(),
                 Clock(elapsed).c_str(), Clock(eta).c_str());
    if (done == all) std::fputc('\n', options_.stream);
    return;
  }
  open_ = done != all;
  if (open_ && Seconds(now - last_line_) < options_.interval_s) return;
  last_line_ = now;
  if (done == all) {
    std::fprintf(options_.stream, "%s: %zu/%zu runs%s%s, 100 %%, %s elapsed\n",
                 options_.label.c_str(), done, all, note.empty() ? "" : ", ", note.c_str(),
                 Clock(elapsed).c_str());
  } else {
    std::fprintf(options_.stream, "%s: %zu/%zu runs%s%s, %s %%, %s elapsed, ~%s left\n",
                 options_.label.c_str(), done, all, note.empty() ? "" : ", ", note.c_str(),
                 FixedText(percent, 0).c_str(), Clock(elapsed).c_str(), Clock(eta).c_str());
  }
  std::fflush(options_.stream);
}

runner::ProgressFn ProgressLine::Callback() {
  return [this](std::size_t done, std::size_t all) { Show(done, all); };
}

void ProgressLine::Close() {
  if (open_ && terminal_) std::fputc('\n', options_.stream);
  if (open_ && !terminal_) {
    std::fprintf(options_.stream, "%s: %zu runs done, %s elapsed\n", options_.label.c_str(), done_,
                 Clock(Seconds(std::chrono::steady_clock::now() - start_)).c_str());
    std::fflush(options_.stream);
  }
  open_ = false;
}

}  // namespace upright::cli
