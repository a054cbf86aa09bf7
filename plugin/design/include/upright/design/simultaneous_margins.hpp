// Margins for what hits several inputs at once. A loop broken at its m plant inputs,
// L = C (sI − A)⁻¹ B (or C (zI − A)⁻¹ B sampled) under unit negative feedback, perturbed on a set
// of its inputs J: the same gain k, phase e^{−jφ} or delay e^{−sτ} on every input of J at once
// (the common mode: battery sag, torque-constant drift, a shared latency), and the multi-loop disk
// margin, independent simultaneous gain and phase changes in every input of J (Seiler, Packard
// and Gahinet, "An introduction to disk margins", IEEE Control Systems Magazine 40(5), 2020).
// J = one input is the loop-at-a-time analysis; J = all is the simultaneous one.
#pragma once

#include <Eigen/Dense>
#include <vector>

#include "upright/design/analysis.hpp"

namespace upright::design {

// x' = A x + B v, u = −C x: closed by v = u, that is A − B C. period_s = 0: continuous (x' = ẋ);
// > 0: sampled at that period (x' = x_{k+1}), and the figures' frequencies in rad/s of real time.
struct BrokenLoop {
  Eigen::MatrixXd A, B, C;
  double period_s = 0;
  bool sampled() const { return period_s > 0; }
};

// The margins of `loop` for perturbations of the inputs in `inputs` (indices of B's columns,
// each once; the others stay closed), as LoopMargins:
//   gain_low, gain_high: the common factor k on those inputs; found by stepping k from 1 in
//     ratios of 1.02 out to 1e-6 and 1e6 (beyond: 0 or inf) and bisecting the first change of
//     stability to a relative 1e-12;
//   phase_deg: the common e^{−jφ}; delay_s: the common delay, each crossing (φ, ω) of the
//     stability boundary needing τ = φ / ω (sampled: z^{−τ/T} = e^{−jωτ}, exact for a whole number
//     of periods; see delayed_loop.hpp for fractional ones). The crossings are found by stepping
//     φ over (0°, 360°) by 0.5° and bisecting each change in the count of unstable poles;
//   disk_*: the multi-loop disk margin α = 1 / ‖S_J − ½ I‖∞ (σ = 0), S_J = (I + L_J)⁻¹ over the
//     inputs J, with the gain and phase it guarantees in every one of them at once (sampled: the
//     norm on the unit circle, by the bilinear map z = (1 + s) / (1 − s), which keeps it).
// A change narrower than the steps can be missed (common practice for a margin scan; the steps
// are far finer than a design needs). The nominal loop must be stable; a failure otherwise.
AnalysisResult<LoopMargins> PerturbedMargins(const BrokenLoop& loop,
                                             const std::vector<int>& inputs);

// The loop at every input of `loop` at once: PerturbedMargins over all of B's columns.
AnalysisResult<LoopMargins> SimultaneousMargins(const BrokenLoop& loop);

// The continuous system with the same H-infinity norm as a sampled one (x_{k+1} = A x + B u,
// y = C x + D u; A without an eigenvalue at −1): the bilinear map z = (1 + s) / (1 − s) takes the
// unit circle onto the imaginary axis, z = e^{jθ} to s = j tan(θ / 2) (from memory: the standard
// Cayley transform between discrete and continuous realisations).
StateSpace BilinearToContinuous(const StateSpace& sampled);

}  // namespace upright::design
