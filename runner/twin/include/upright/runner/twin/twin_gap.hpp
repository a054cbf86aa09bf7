// The gap between the linear twin and the physics plant for one run: both tilt-and-drift series
// in, the peaks, the first times they part by more than a band, and the scenario's events the
// linear model leaves out (so a reader knows why a gap appears) out.
#pragma once

#include <string>

#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/twin/tilt_drift_series.hpp"

namespace upright::runner {

// When the twin and the plant count as apart: |Δtilt| > max(tilt_floor_deg, fraction × the
// plant's peak |tilt|), |Δdrift| > max(drift_floor_m, fraction × the plant's peak drift). The
// floors sit above what a parked robot does that a linear model with ideal sensors cannot: the
// courier's sensor biases, held by wheel friction, make it wander by up to 0.5° (LQR) and 0.7°
// (LQG) at rest and creep a few centimetres (measured). The fraction lets a hard shove differ by
// a few percent in its peak, and by a few milliseconds of sensor latency in its timing.
struct GapBands {
  double tilt_floor_deg = 1.0;
  double drift_floor_m = 0.05;
  double fraction = 0.10;
};

// Peaks of each series over its own length; divergence times over the samples both have (sample
// k at k·dt_s, which must agree). GapFigures::ran is set; not_modelled and twin_message are left
// for the caller.
GapFigures CompareTwin(const TiltDriftSeries& twin, const TiltDriftSeries& plant,
                       const GapBands& bands = {});

// The scenario's events and ground the linear model leaves out, "; "-joined in the order: pushes'
// lateral parts, payload shifts, motor faults, sensor faults, ground; "" when there are none.
// Drive changes are not listed: the twin gets the same speed and yaw-rate reference and is judged
// against the same commanded path. Always left out, and so not listed: contact and slip, motor
// limits and friction, the coupling of turning and pitch (the model is linearised at rest),
// sensor noise, quantisation and latency (the twin's sensors do carry the robot's constant biases).
std::string NotModelled(const Scenario& scenario);

}  // namespace upright::runner
