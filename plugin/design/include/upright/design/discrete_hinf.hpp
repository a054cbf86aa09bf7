// Discrete-time H-infinity state feedback, the design the hinf module runs at its own rate: the
// sampled plant and a γ in, the central gain (or why γ is infeasible), the discrete γ_opt, and the
// sampled loop's push norm out.
#pragma once

#include <Eigen/Dense>

#include "upright/design/analysis.hpp"
#include "upright/design/closed_loop.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/synthesis.hpp"

namespace upright::design {

// H-infinity state feedback for the discrete system x⁺ = A x + B1 w + B2 u, z = [Q½ x; R½ u]
// (R > 0): the central controller u = −K x with Σ zᵀz < γ² Σ wᵀw for every w (the discrete
// full-information problem; Başar and Bernhard, H∞-Optimal Control and Related Minimax Design
// Problems, 2nd ed., 1995, ch. 3; Green and Limebeer, Linear Robust Control, 1995). X is the
// stabilising solution of the game Riccati equation, the DARE with the indefinite weight
//   X = AᵀXA + Q − AᵀX B̃ (R̃ + B̃ᵀX B̃)⁻¹ B̃ᵀX A,   B̃ = [B1 B2],  R̃ = diag(−γ² I, R),
// and γ is feasible when X ≥ 0 and γ² I − B1ᵀX B1 > 0. The saddle point of the step is
// [w*; u] = −(R̃ + B̃ᵀX B̃)⁻¹ B̃ᵀX A x; K is its u rows. Returns K (and X in *X when asked for).
Result<Eigen::MatrixXd, SolveError> DiscreteHinfGain(
    const Eigen::MatrixXd& A, const Eigen::MatrixXd& B1, const Eigen::MatrixXd& B2,
    const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R, double gamma, Eigen::MatrixXd* X = nullptr);

// The discrete γ_opt by the bisection of OptimalGamma on DiscreteHinfGain.
Result<GammaSearch, SolveError> DiscreteOptimalGamma(const Eigen::MatrixXd& A,
                                                     const Eigen::MatrixXd& B1,
                                                     const Eigen::MatrixXd& B2,
                                                     const Eigen::MatrixXd& Q,
                                                     const Eigen::MatrixXd& R, double upper_gamma,
                                                     double relative_gap = 1e-4);

// The robot sampled at period_s: the input and the push (E's first column × push_scale_N) both
// held over the sample (zero-order hold), z sampled at the ticks with the continuous weights, as
// RobotDiscreteLqr has them. Σ over the ticks of zᵀz and of wᵀw are both ≈ ∫ / T, so γ compares
// with the continuous design's and K tends to RobotHinf's as period_s → 0.
Result<Eigen::MatrixXd, SolveError> RobotDiscreteHinf(const LinearModel& plant,
                                                      const StateMatrix& Q,
                                                      const Eigen::Matrix2d& R, double push_scale_N,
                                                      double gamma, double period_s);
// Searches from 1.01 × the sampled push norm of the discrete LQR's loop.
Result<GammaSearch, SolveError> RobotDiscreteOptimalGamma(const LinearModel& plant,
                                                          const StateMatrix& Q,
                                                          const Eigen::Matrix2d& R,
                                                          double push_scale_N, double period_s);

// The sampled loop's push norm: u_k = −K x_k held over each period, the push w_k held likewise,
// z_k = [Q½ x_k; R½ u_k]; the discrete H-infinity norm from w to z (DiscreteHinfNorm), peak in
// rad/s.
AnalysisResult<NormPeak> SampledPushNorm(const LinearModel& plant, const Gain& K,
                                         const Performance& performance, double period_s);

}  // namespace upright::design
