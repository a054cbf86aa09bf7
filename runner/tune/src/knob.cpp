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
  // The PID's pole choices, as multiples of the robot's fall rate λ (common practice for
  // balancing robots, no one source): the tilt pair from λ (a loop slower than the fall it must
  // catch) to 6λ (beyond, the gains mostly amplify sensor noise and eat into the latency's
  // phase), around the rule's 2λ; the speed pair from λ/10 (the robot regains its speed over
  // seconds) to λ, around the rule's λ/3. The speed response to wheel torque has a right-half-plane
  // zero (the robot rolls back to lean before it speeds up), at 0.58λ on both demo robots, which
  // bounds a speed loop's useful bandwidth near half of it in linear theory (S. Skogestad and
  // I. Postlethwaite, "Multivariable Feedback Control", 2nd ed., Wiley, 2005, limitations imposed
  // by RHP-zeros; from memory): the range goes past it so that the plant shows whether a faster
  // loop pays. Ratios count here, so both on a log scale. The module refuses a speed pair above
  // half the tilt pair, about 6 % of this box (tilt below 2λ with speed above half of it): such a
  // setting scores as one whose runs all fell at the start, with the module's reason; both ends
  // of the ranges are accepted.
  const Knob tilt_poles{"tilt_pole_factor", 1, 6, KnobScale::kLog};
  const Knob speed_poles{"speed_pole_factor", 0.1, 1, KnobScale::kLog};
  if (builtin == "lqr" || builtin == "lqg") return {tilt, drift, input};
  if (builtin == "hinf") return {gamma, drift, input};
  if (builtin == "pid") return {tilt_poles, speed_poles, tilt, filter};
  return {};
}

}  // namespace upright::runner
