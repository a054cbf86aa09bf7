// The H-infinity norm of a discrete-time system: the system in, the peak of its largest singular
// value over the unit circle and where it is reached out.
#pragma once

#include "upright/design/analysis.hpp"

namespace upright::design {

// ‖G‖∞ = sup over θ in [0, π] of σ̄(G(e^{jθ})) for x⁺ = A x + B u, y = C x + D u sampled every
// period_s (the StateSpace read as a discrete system). The bilinear map s = (z − 1)/(z + 1) takes
// the unit circle onto the imaginary axis (θ = 2 atan ω) and keeps the norm; HinfNorm then
// computes it to `relative_tolerance`. peak_rad_s is θ / period_s (π / period_s at Nyquist). An A
// with an eigenvalue on or outside the unit circle fails with found.norm = inf, naming it.
AnalysisResult<NormPeak> DiscreteHinfNorm(const StateSpace& system, double period_s,
                                          double relative_tolerance = 1e-10);

}  // namespace upright::design
