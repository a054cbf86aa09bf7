// Closed loops of the linear robot with a linear controller: the controller as a state-space
// system from measurements to wheel inputs, and what the loop gives — closed-loop poles, the
// H-infinity norm from a push to the weighted performance output, and margins at the plant input.
#pragma once

#include <Eigen/Dense>

#include <complex>
#include <string>
#include <vector>

#include "upright/design/analysis.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/simultaneous_margins.hpp"

namespace upright::design {

// What the controller measures, y = Cy x + Dy u (Dy for sensors that feel the input, like an
// accelerometer).
struct Measurement {
  Eigen::MatrixXd Cy;  // p × 6
  Eigen::MatrixXd Dy;  // p × 2 (may be zero)
};

// A linear controller ẋc = Ac xc + Bc y, u = Cc xc + Dc y. A static state feedback has no states.
struct LinearController {
  Eigen::MatrixXd Ac, Bc, Cc, Dc;
  int states() const { return static_cast<int>(Ac.rows()); }
};

// u = −K x with the full state measured.
Measurement FullState();
LinearController StateFeedback(const Eigen::Matrix<double, kInputs, kStates>& K);

// The performance channel every controller is judged on: a push of `push_scale_N` (w = 1) at the
// model's push height → z = [Q½ x; R½ u].
struct Performance {
  StateMatrix Q;
  Eigen::Matrix2d R;
  double push_scale_N = 1;
};

struct LoopAnalysis {
  std::vector<std::complex<double>> poles;  // closed loop, s-plane, sorted by real part
  double push_norm = 0;                     // ‖T_zw‖∞ (inf when unstable)
  LoopMargins margins;                      // worst over the two input channels
  std::vector<LoopMargins> channel_margins; // [left, right]
  // Both wheels at once (simultaneous_margins.hpp): the common-mode gain, phase and delay margins
  // and the multi-loop disk margin.
  LoopMargins both_wheels;
};

// States the controller never reads and that act on nothing else (position and heading, for a
// controller of speed and yaw rate) are left out of the analysis and of the push norm's weights:
// they only integrate other states. A failure (an algebraic loop, an unstable loop, margins or
// norm not computed) keeps what was found: an unstable loop's poles, with an infinite push norm.
AnalysisResult<LoopAnalysis> AnalyseLoop(const LinearModel& plant, const Measurement& measurement,
                                         const LinearController& controller,
                                         const Performance& performance);

// The loop broken at both wheel inputs, continuous, as AnalyseLoop's margins read it (the same
// states left out): L(s) = C (sI − A)⁻¹ B under unit negative feedback. An algebraic loop (see
// AnalyseLoop) gives an empty loop.
BrokenLoop LoopAtWheels(const LinearModel& plant, const Measurement& measurement,
                        const LinearController& controller);

// The closed loop driven by the push force alone (N, along +x at the model's push height), every
// state kept: states [x; xc], outputs [x; u] (kStates + kInputs rows). An algebraic loop gives an
// empty system.
StateSpace PushedLoop(const LinearModel& plant, const Measurement& measurement,
                      const LinearController& controller);

}  // namespace upright::design
