#include "upright/runner/metrics/step_response.hpp"

#include <cmath>
#include <cstddef>
#include <limits>

namespace upright::runner {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

}  // namespace

double SettlingTime(std::span<const double> y, double dt_s, double final_value, double band) {
  if (y.empty()) return kNaN;
  // Walk back from the end to the last sample outside the band; a non-finite sample is outside.
  std::size_t first_in = y.size();
  while (first_in > 0 && std::abs(y[first_in - 1] - final_value) <= band) --first_in;
  if (first_in == y.size()) return kNaN;
  return static_cast<double>(first_in) * dt_s;
}

Rebound PeakAndRebound(std::span<const double> y, double dt_s, double final_value) {
  Rebound r;
  std::size_t peak = y.size();
  for (std::size_t i = 0; i < y.size(); ++i) {
    const double d = std::abs(y[i] - final_value);
    if (d > r.peak) {
      r.peak = d;
      peak = i;
    }
  }
  if (peak == y.size()) {
    r.rebound_pct = kNaN;
    return r;
  }
  r.peak_time_s = static_cast<double>(peak) * dt_s;
  const double other_side = y[peak] > final_value ? -1.0 : 1.0;
  for (std::size_t i = peak + 1; i < y.size(); ++i) {
    const double d = other_side * (y[i] - final_value);
    if (d > r.rebound) r.rebound = d;
  }
  r.rebound_pct = 100.0 * r.rebound / r.peak;
  return r;
}

}  // namespace upright::runner
