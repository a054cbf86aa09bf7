#include "upright/runner/metrics/metric_settings.hpp"

#include <cmath>
#include <sstream>

namespace upright::runner {

Status MetricSettings::Validate() const {
  std::ostringstream why;
  if (!(fall_tilt_deg > 0 && fall_tilt_deg <= 90)) {
    why << "MetricSettings::fall_tilt_deg = " << fall_tilt_deg << ", must be in (0, 90]";
  } else if (!(tilt_band_deg > 0)) {
    why << "MetricSettings::tilt_band_deg = " << tilt_band_deg << ", must be > 0";
  } else if (!std::isfinite(tilt_band_deg)) {
    why << "MetricSettings::tilt_band_deg = " << tilt_band_deg << ", must be finite";
  } else if (!(drift_band_m > 0)) {
    why << "MetricSettings::drift_band_m = " << drift_band_m << ", must be > 0";
  } else if (!std::isfinite(drift_band_m)) {
    why << "MetricSettings::drift_band_m = " << drift_band_m << ", must be finite";
  } else if (!(window_s > 0)) {
    why << "MetricSettings::window_s = " << window_s << ", must be > 0";
  } else if (!std::isfinite(window_s)) {
    why << "MetricSettings::window_s = " << window_s << ", must be finite";
  } else if (!(slip_threshold > 0 && slip_threshold <= 1)) {
    why << "MetricSettings::slip_threshold = " << slip_threshold << ", must be in (0, 1]";
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

}  // namespace upright::runner
