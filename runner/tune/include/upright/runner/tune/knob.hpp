// Knobs: the controller settings a tune varies, each a setting key with a range and a scale, and
// the default knobs of the built-in controllers. A search point is a vector of numbers in [0, 1],
// one per knob; a knob maps its number onto its range.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner {

enum class KnobScale {
  kLinear,  // equal steps of the value
  kLog,     // equal ratios of the value (lo > 0)
};

const char* ToString(KnobScale scale);  // "linear", "log"

struct Knob {
  std::string setting;  // the controller's setting key, e.g. "max_tilt_deg"
  double lo = 0;        // range, in the setting's own unit; lo < hi
  double hi = 0;
  KnobScale scale = KnobScale::kLog;
  int line = 0;  // the <knob> element's line in the tune file; 0 for a built-in default
  // Fine when the range is finite and not empty (and positive on a log scale); otherwise the
  // broken rule, naming the setting and its values.
  Status Validate() const;
  // The value at u in [0, 1] (clamped): lo at 0, hi at 1, rounded to 6 significant digits so
  // that the value run is the value written in the tables and the pasted settings.
  double ValueAt(double u) const;
};

// The knobs of a built-in controller ("lqr", "hinf", "lqg", "pid") when a tune file names none;
// empty for any other name. Documented in the README ("Tuning").
std::vector<Knob> DefaultKnobs(const std::string& builtin);

}  // namespace upright::runner
