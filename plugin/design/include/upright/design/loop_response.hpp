// Frequency responses of a loop broken at the wheel inputs, for Bode and Nyquist pictures: the
// loop one wheel sees with the other closed, and the loop both wheels see together.
#pragma once

#include <complex>
#include <vector>

#include "upright/design/analysis.hpp"
#include "upright/design/simultaneous_margins.hpp"

namespace upright::design {

// The SISO loop at input `channel` of `loop` with its other inputs closed:
// L_j = c_j (sI − A + Σ_{i≠j} b_i c_i)⁻¹ b_j (sampled: z in place of s), as the margins of one
// wheel at a time read it. A channel out of range gives an empty system.
StateSpace LoopAtInput(const BrokenLoop& loop, int channel);

// The loop of two inputs driven alike, their common mode (u₁ + u₂)/√2, with their difference
// (u₁ − u₂)/√2 closed: channel 0 of the loop in the input basis [1 1; 1 −1]/√2. On a robot
// symmetric left to right the modes part exactly: this is the balance loop (forward motion and
// pitch) that a gain, phase or delay on both wheels at once acts on. Needs two inputs (else an
// empty system).
StateSpace CommonModeLoop(const BrokenLoop& loop);

// L(jω) = C (jωI − A)⁻¹ B + D at each ω in rad/s; sampled at period_s > 0, C (e^{jωT} I − A)⁻¹ B
// + D. SISO only (the first input and output); NaN where jωI − A is singular.
std::vector<std::complex<double>> FrequencyResponse(const StateSpace& siso, double period_s,
                                                    const std::vector<double>& omegas_rad_s);

// `per_decade` frequencies to the decade, evenly spaced in log ω, from lo to hi inclusive
// (0 < lo < hi, per_decade ≥ 1; otherwise empty).
std::vector<double> LogFrequencies(double lo_rad_s, double hi_rad_s, int per_decade);

// The phase of each value in degrees, the first in (−360, 0] (a loop's phase read as a lag, as
// Bode plots show it), each next one moved by whole turns to within 180° of the one before
// (unwrapped along the curve). A non-finite value gives NaN and the unwrapping starts again
// after it, in (−360, 0].
std::vector<double> UnwrappedPhaseDeg(const std::vector<std::complex<double>>& values);

}  // namespace upright::design
