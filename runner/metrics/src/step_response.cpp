#include "upright/runner/step_response.hpp"

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

Excursion AnalyseExcursion(std::span<const double> y, double dt_s, double final_value) {
  Excursion e;
  // The side of the first excursion: the sign of the first sample off the final value.
  std::size_t i = 0;
  while (i < y.size() && y[i] == final_value) ++i;
  if (i == y.size()) {
    e.overshoot_pct = kNaN;
    return e;
  }
  const double side = y[i] > final_value ? 1.0 : -1.0;
  for (; i < y.size(); ++i) {
    const double d = side * (y[i] - final_value);
    if (d < 0) break;  // crossed back over the final value
    if (d > e.first_peak) {
      e.first_peak = d;
      e.first_peak_time_s = static_cast<double>(i) * dt_s;
    }
  }
  const bool crossed = i < y.size();
  for (; i < y.size(); ++i) {
    const double d = -side * (y[i] - final_value);
    if (d > e.rebound) e.rebound = d;
  }
  if (!(e.first_peak > 0)) {
    e.overshoot_pct = kNaN;
  } else {
    e.overshoot_pct = crossed ? 100.0 * e.rebound / e.first_peak : 0.0;
  }
  return e;
}

double StepOvershootPct(std::span<const double> y, double initial, double final_value) {
  const double step = final_value - initial;
  if (y.empty() || !(step != 0)) return kNaN;
  const double side = step > 0 ? 1.0 : -1.0;
  double beyond = 0;  // furthest past the final value, in the step's direction
  for (double v : y) {
    const double d = side * (v - final_value);
    if (d > beyond) beyond = d;
  }
  return 100.0 * beyond / std::abs(step);
}

double PeakTime(std::span<const double> y, double dt_s, double initial, double final_value) {
  const double step = final_value - initial;
  if (y.empty() || !(step != 0)) return kNaN;
  const double side = step > 0 ? 1.0 : -1.0;
  std::size_t peak = 0;
  for (std::size_t i = 1; i < y.size(); ++i) {
    if (side * y[i] > side * y[peak]) peak = i;
  }
  return static_cast<double>(peak) * dt_s;
}

}  // namespace upright::runner
