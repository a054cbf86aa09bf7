// Push: an external force on the chassis with a direction, a height and a time profile
// (impulse, step or half-sine). The plant evaluates active pushes each physics step.
#pragma once

#include <string>

#include "upright/base/result.hpp"

namespace upright::sim {

enum class PushShape {
  kImpulse,   // rectangular pulse: peak_N for duration_s (impulse = peak_N · duration_s)
  kStep,      // peak_N from start_s on, for duration_s (infinite duration: until the run ends)
  kHalfSine,  // peak_N · sin(π (t − start_s) / duration_s) for duration_s
};

struct Push {
  PushShape shape = PushShape::kImpulse;
  double start_s = 0;
  double duration_s = 0.1;
  double peak_N = 0;           // magnitude at the peak; the sign flips the direction
  double direction_deg = 0;    // world horizontal azimuth: 0 pushes toward +x, 90 toward +y (left)
  double height_m = 0.3;       // point of application on the chassis, above the axle, body z

  // Force magnitude at time t (N).
  double ForceAt(double t_s) const;
  // Mean force over [t0, t1] (N): the exact impulse of the step divided by its length, so a
  // pulse delivers the same impulse whatever its alignment with the physics steps.
  double MeanForce(double t0_s, double t1_s) const;
  double end_s() const { return start_s + duration_s; }
  // The broken rule, naming the field and value; success when there is none.
  Status Validate() const;
};

const char* ToString(PushShape shape);
bool FromString(const std::string& text, PushShape* shape);

}  // namespace upright::sim
