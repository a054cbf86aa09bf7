#include "progress.hpp"

#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>

namespace upright::cli {
namespace {

// Seconds as m:ss.
std::string Clock(double seconds) {
  const long s = std::lround(std::max(0.0, seconds));
  char text[32];
  std::snprintf(text, sizeof text, "%ld:%02ld", s / 60, s % 60);
  return text;
}

}  // namespace

ProgressLine::ProgressLine()
    : terminal_(isatty(STDERR_FILENO) != 0), start_(std::chrono::steady_clock::now()) {}

void ProgressLine::Show(std::size_t done, std::size_t all) {
  if (!terminal_) return;
  open_ = done != all;
  const double elapsed =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  const double eta = elapsed / static_cast<double>(done) * static_cast<double>(all - done);
  std::fprintf(stderr, "\r  %zu/%zu runs  %3.0f %%  elapsed %s  left ~%s   ", done, all,
               100.0 * static_cast<double>(done) / static_cast<double>(all), Clock(elapsed).c_str(),
               Clock(eta).c_str());
  if (done == all) std::fputc('\n', stderr);
}

runner::ProgressFn ProgressLine::Callback() {
  return [this](std::size_t done, std::size_t all) { Show(done, all); };
}

void ProgressLine::Close() {
  if (open_) std::fputc('\n', stderr);
  open_ = false;
}

}  // namespace upright::cli
