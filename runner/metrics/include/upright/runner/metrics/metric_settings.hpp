// MetricSettings: how a scenario judges its runs — the tilt that counts as a fall, the settling
// bands and the window after each disturbance over which settling and overshoot are measured.
#pragma once

#include <string>

#include "upright/base/result.hpp"

namespace upright::runner {

struct MetricSettings {
  double fall_tilt_deg = 45;   // |pitch| beyond this (or the chassis touching ground) is a fall
  double tilt_band_deg = 1.0;  // tilt has settled once it stays within this of its final value
  double drift_band_m = 0.05;  // position has settled once it stays within this of its final value
  double window_s = 4.0;  // after each disturbance's start; settling beyond it counts as unsettled
  // A wheel counts as slipping while |slip ratio| exceeds this (common practice: traction
  // control treats 0.1–0.2 as the edge of the tyre's peak grip).
  double slip_threshold = 0.15;
  // Fine when valid; otherwise the broken rule, naming the field and value
  // ("MetricSettings::window_s = 0, must be > 0").
  Status Validate() const;
};

}  // namespace upright::runner
