#include "upright/runner/twin/twin_gap.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

#include "upright/base/number_text.hpp"
#include "upright/model/check.hpp"
#include "upright/model/conventions.hpp"

namespace upright::runner {
namespace {

constexpr double kDeg = 180 / std::numbers::pi;

double PeakAbs(const std::vector<double>& values) {
  double peak = 0;
  for (double v : values) peak = std::max(peak, std::abs(v));
  return peak;
}

// The time of the first common sample where |a − b| > band; NaN when there is none.
double FirstApart(const std::vector<double>& a, const std::vector<double>& b, double band,
                  double dt_s) {
  const std::size_t n = std::min(a.size(), b.size());
  for (std::size_t k = 0; k < n; ++k) {
    if (std::abs(a[k] - b[k]) > band) return static_cast<double>(k) * dt_s;
  }
  return std::numeric_limits<double>::quiet_NaN();
}

}  // namespace

GapFigures CompareTwin(const TiltDriftSeries& twin, const TiltDriftSeries& plant,
                       const GapBands& bands) {
  UPRIGHT_CHECK(twin.dt_s == plant.dt_s, "twin dt %g, plant dt %g", twin.dt_s, plant.dt_s);
  GapFigures gap;
  gap.ran = true;
  gap.peak_tilt_linear_deg = PeakAbs(twin.tilt_rad) * kDeg;
  gap.peak_tilt_plant_deg = PeakAbs(plant.tilt_rad) * kDeg;
  gap.peak_drift_linear_m = PeakAbs(twin.drift_m);
  gap.peak_drift_plant_m = PeakAbs(plant.drift_m);
  gap.tilt_band_deg = std::max(bands.tilt_floor_deg, bands.fraction * gap.peak_tilt_plant_deg);
  gap.drift_band_m = std::max(bands.drift_floor_m, bands.fraction * gap.peak_drift_plant_m);
  gap.tilt_diverge_s =
      FirstApart(twin.tilt_rad, plant.tilt_rad, gap.tilt_band_deg / kDeg, plant.dt_s);
  gap.drift_diverge_s = FirstApart(twin.drift_m, plant.drift_m, gap.drift_band_m, plant.dt_s);
  return gap;
}

std::string NotModelled(const Scenario& s) {
  std::string text;
  const auto add = [&](const std::string& item) {
    if (!text.empty()) text += "; ";
    text += item;
  };
  for (const sim::Push& p : s.pushes) {
    const double lateral = std::sin(p.direction_deg / kDeg);
    if (std::abs(lateral) > 1e-9) {
      add("lateral part of the push at " + SignificantText(p.start_s, 6) + " s (" +
          FixedText(100 * std::abs(lateral), 0) + " % of it)");
    }
  }
  for (const PayloadShift& p : s.payload_shifts) {
    add("payload shift " + SignedSignificantText(p.distance_m, 6) + " m at " +
        SignificantText(p.start_s, 6) + " s");
  }
  for (const sim::MotorFault& f : s.motor_faults) {
    add(std::string("motor fault ") + sim::ToString(f.side) + " x" +
        SignificantText(f.torque_scale, 6) + " at " + SignificantText(f.start_s, 6) + " s");
  }
  for (const sim::SensorFault& f : s.sensor_faults) {
    add(std::string("sensor fault ") + sim::ToString(f.channel) + " " + sim::ToString(f.kind) +
        " at " + SignificantText(f.start_s, 6) + " s");
  }
  switch (s.terrain.kind) {
    case sim::TerrainKind::kFlat:
      break;
    case sim::TerrainKind::kSlope:
      add("slope " + SignificantText(s.terrain.slope_deg, 6) + " deg");
      break;
    case sim::TerrainKind::kProfile:
      add("ground profile (ramps, bumps, curbs)");
      break;
  }
  if (!s.terrain.friction_regions.empty()) {
    add(std::to_string(s.terrain.friction_regions.size()) + " friction region(s)");
  }
  return text;
}

}  // namespace upright::runner
