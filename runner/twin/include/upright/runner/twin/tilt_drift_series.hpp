// TiltDriftSeries: tilt and drift at every physics step of one run, from t = 0 — what the linear
// twin produces and what a physics run records for the comparison between the two.
#pragma once

#include <cstddef>
#include <vector>

namespace upright::runner {

struct TiltDriftSeries {
  double dt_s = 0;               // sample k is at time k·dt_s
  std::vector<double> tilt_rad;  // pitch less the equilibrium pitch
  std::vector<double> drift_m;   // horizontal distance of the axle from the commanded path

  // Storage for `samples` samples, so that Add does not allocate.
  void Reserve(std::size_t samples) {
    tilt_rad.reserve(samples);
    drift_m.reserve(samples);
  }
  void Add(double tilt, double drift) {
    tilt_rad.push_back(tilt);
    drift_m.push_back(drift);
  }
  std::size_t size() const { return tilt_rad.size(); }
};

}  // namespace upright::runner
