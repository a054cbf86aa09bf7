// Probe values rounded for reading: a double in, the nearest value with 12 significant digits out,
// so that a value is run, printed and read back as the same number (0.1 + 0.2 as 0.3).
#pragma once

#include <cmath>
#include <cstdio>
#include <cstdlib>

namespace upright::runner::internal {

// `value` to 12 significant digits; non-finite values unchanged.
inline double RoundForReading(double value) {
  if (!std::isfinite(value)) return value;
  char text[32];
  std::snprintf(text, sizeof text, "%.12g", value);
  return std::strtod(text, nullptr);
}

}  // namespace upright::runner::internal
