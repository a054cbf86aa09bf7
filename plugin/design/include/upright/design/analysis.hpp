// Closed-loop analysis of state-space systems: H-infinity norms (Bruinsma–Steinbuch), and
// stability margins at the plant input of a state-feedback loop — loop-at-a-time gain and phase
// margins, disk margins and the delay margin.
#pragma once

#include <Eigen/Dense>
#include <limits>
#include <string>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::design {

// The frequency reported for a margin that nothing reaches.
inline constexpr double kNoFrequency = std::numeric_limits<double>::quiet_NaN();

// Why an analysis stopped short, with the figures it had found by then (a report may still show
// them beside the reason).
template <class T>
struct AnalysisFailure {
  std::string message;
  T found;
};

// An analysis's figures, or why it stopped short and what it had found.
template <class T>
using AnalysisResult = Result<T, AnalysisFailure<T>>;

// A continuous-time system ẋ = A x + B u, y = C x + D u: A n×n, B n×m, C p×n, D p×m. An empty D
// means zero; with n = 0 (a pure gain) B and C may be empty.
struct StateSpace {
  Eigen::MatrixXd A, B, C, D;
};

struct NormPeak {
  double norm = 0;                   // sup over ω of the largest singular value of G(jω)
  double peak_rad_s = kNoFrequency;  // where the supremum is reached (0 for DC, inf at ∞); NaN
                                     // when no finite norm was computed
};

// H-infinity norm of a stable continuous system to a relative tolerance in (0, 1) (Bruinsma and
// Steinbuch, Systems & Control Letters 14, 1990): the result is a value of σ̄(G(jω)) and the true
// norm is below (1 + 2 tolerance) times it. An A with an eigenvalue in the closed right
// half-plane (within 1e-12 max|λ|) fails naming the eigenvalue, with found.norm = inf; an
// iteration that stops short fails with the largest gain found (a lower bound) and where; bad
// input fails with found.norm = 0. A pure gain (n = 0) gives σ̄(D) at ω = 0. Works with D ≠ 0.
AnalysisResult<NormPeak> HinfNorm(const StateSpace& system, double relative_tolerance = 1e-10);

// Stability margins of one loop under unit negative feedback. For the state-feedback functions
// below the loop is broken at a plant input of u = −K x on ẋ = A x + B u, loop at a time: channel
// j alone is perturbed while the others stay closed. Each *_rad_s is the frequency of the
// closed-loop pole that reaches the imaginary axis at that margin: 0 for DC, inf for a pole
// through infinity, kNoFrequency (NaN) when nothing crosses (a margin of 0 or inf).
struct LoopMargins {
  double gain_low = 0;    // smallest gain factor (< 1) that keeps the loop stable; 0 if none
  double gain_high = 0;   // largest gain factor (> 1); inf if any increase is tolerated
  double phase_deg = 0;   // smallest |phase| change that destabilises; inf if none (≤ 180)
  double disk_alpha = 0;  // disk margin α (symmetric disk, σ = 0), Seiler, Packard, Gahinet 2020
  double disk_gain_low = 0, disk_gain_high = 0, disk_phase_deg = 0;  // what α guarantees
  double delay_s = 0;  // smallest input delay that destabilises; inf if none

  double gain_low_rad_s = kNoFrequency;   // where gain_low is reached
  double gain_high_rad_s = kNoFrequency;  // where gain_high is reached (a phase crossover)
  double phase_rad_s = kNoFrequency;      // the gain crossover |L| = 1 that sets phase_deg
  double delay_rad_s = kNoFrequency;      // the gain crossover that sets delay_s
  double disk_rad_s = kNoFrequency;       // where |S − ½| peaks (0 for DC, inf at ∞)
};

// Per input channel (0 ≤ channel < m), L_j(s) = K_j (sI − A + Σ_{i≠j} b_i K_i)⁻¹ b_j, and the worst
// over channels (largest gain_low, smallest gain_high, phase, delay and α, each with its own
// frequency). A n×n, B n×m, K m×n. The closed loop A − B K must be stable; otherwise a failure
// with a message.
AnalysisResult<LoopMargins> InputMargins(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                         const Eigen::MatrixXd& K, int channel);
// The worst of each figure over channels (largest gain_low, smallest gain_high, phase, disk α and
// delay, each with its own frequency); the first failed channel if any failed.
AnalysisResult<LoopMargins> WorstOf(const std::vector<AnalysisResult<LoopMargins>>& channels);
AnalysisResult<LoopMargins> WorstInputMargins(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                              const Eigen::MatrixXd& K);

// The sensitivity at the plant input of u = −K x, S = (I + K (sI − A)⁻¹ B)⁻¹, realised as
// (A − B K, B, −K, I). HinfNorm of it is ‖S‖∞ (≤ 1 for a continuous LQR with R = ρI), and
// 1 / ‖S − ½ I‖∞ is the disk margin for simultaneous perturbations of all inputs. When the sizes
// disagree the matrices are returned as given, (A, B, −K, I), for HinfNorm to report.
StateSpace InputSensitivity(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                            const Eigen::MatrixXd& K);

// Margins of a SISO open loop L(s) = C (sI − A)⁻¹ B + D under unit negative feedback (the
// classical definitions; used for the handbook checks and by InputMargins). Gain margins are the
// factors k at which 1 + k L gets a closed-loop pole on the imaginary axis (phase crossovers, DC,
// or infinity when 1 + k D = 0), confirmed by closed-loop stability; phase margin 180° − |∠L|
// and delay margin (∠L + π) / ω over the gain crossovers |L(jω)| = 1 (exact for |D| < 1); disk
// margin α = 1 / ‖(1 − L) / (2 (1 + L))‖∞. The closed loop must be stable. A failure part way
// keeps the margins found before it.
AnalysisResult<LoopMargins> SisoMargins(const StateSpace& loop);

}  // namespace upright::design
