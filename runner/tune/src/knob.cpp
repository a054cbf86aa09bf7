#include "upright/runner/tune/knob.hpp"

#include <algorithm>
#include <cmath>

#include "upright/base/number_text.hpp"

namespace upright::runner {

const char* ToString(KnobScale scale) { return scale == KnobScale::kLog ? "log" : "linear"; }

Status Knob::Validate() const {
  const std::string where = "knob " + (setting.empty() ? std::string("''") : setting) + ": ";
  if (setting.empty()) return Failure("knob: the setting name is empty");
  if (!std::isfinite(lo) || !std::isfinite(hi)) {
    return Failure(where + "lo = " + ShortestText(lo) + ", hi = " + ShortestText(hi) +
                   ", must be finite");
  }
  if (!(lo < hi)) {
    return Failure(where + "lo = " + ShortestText(lo) + " must be below hi = " + ShortestText(hi));
  }
  if (scale == KnobScale::kLog && !(lo > 0)) {
    return Failure(where + "lo = " + ShortestText(lo) +
                   ": a log scale needs a range above 0 (or scale=\"linear\")");
  }
  return {};
}

double Knob::ValueAt(double u) const {
  const double t = std::clamp(u, 0.0, 1.0);
  double value = 0;
  if (t == 0) {
    value = lo;
  } else if (t == 1) {
    value = hi;
  } else if (scale == KnobScale::kLog) {
    value = lo * std::pow(hi / lo, t);
  } else {
    value = lo + (hi - lo) * t;
  }
  return std::clamp(RoundToSignificant(value, 6), lo, hi);
}

std::vector<Knob> DefaultKnobs(const std::string& builtin) {
  // Ranges wide enough for robots from a tabletop to a courier (the modules' own defaults for
  // both demo robots lie inside): tilt weight 0.5–15 deg, drift weight 5 cm–5 m, input weight
  // 5–100 % of the drive's limit, γ 1.05–20 × γ_opt, the tilt filter 0.05–5 s.
  const Knob tilt{"max_tilt_deg", 0.5, 15, KnobScale::kLog};
  const Knob drift{"max_drift_m", 0.05, 5, KnobScale::kLog};
  const Knob input{"max_input_fraction", 0.05, 1, KnobScale::kLog};
  const Knob gamma{"gamma_factor", 1.05, 20, KnobScale::kLog};
  const Knob filter{"tilt_filter_s", 0.05, 5, KnobScale::kLog};
  if (builtin == "lqr" || builtin == "lqg") return {tilt, drift, input};
  if (builtin == "hinf") return {gamma, drift, input};
  if (builtin == "pid") return {tilt, filter};
  return {};
}

}  // namespace upright::runner
