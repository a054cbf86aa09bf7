// Riccati and Lyapunov equation solvers: matrices in, a validated solution or a typed reason for
// failure out. They serve LQR, H-infinity state feedback (indefinite R) and Kalman filter design.
#pragma once

#include <Eigen/Dense>
#include <string>

#include "upright/base/result.hpp"

namespace upright::design {

// Why a solver (or a design built on one) has no answer; callers branch on it.
enum class SolveFailure {
  kInvalidInput,             // sizes disagree, non-finite entries, Q or R not symmetric
  kNotStabilisable,          // (A, B) has an uncontrollable mode that is not stable
  kNoStabilisingSolution,    // Hamiltonian / symplectic eigenvalues on the stability boundary
  kIllConditioned,           // a basis or linear system cannot be solved reliably (also: a singular
                             // Lyapunov equation)
  kResidualTooLarge,         // the candidate does not satisfy the equation
  kNotPositiveSemidefinite,  // X has a clearly negative eigenvalue (γ infeasible in H-infinity)
};

// "invalid_input", "not_stabilisable", ...
const char* ToString(SolveFailure failure);

// The failing side of every solver and design here: the typed reason and a message naming the
// matrix, eigenvalue or figure at fault.
struct SolveError {
  SolveFailure reason = SolveFailure::kInvalidInput;
  std::string message;
};

// A Riccati equation's stabilising solution.
struct RiccatiSolution {
  Eigen::MatrixXd X;             // symmetric
  double relative_residual = 0;  // ‖residual‖_F / (‖Q‖_F + ‖AᵀX‖_F + ‖XA‖_F + ...)
};

struct RiccatiOptions {
  bool require_psd = true;  // fail with kNotPositiveSemidefinite when λ_min(X) < −1e-8‖X‖₂
                            // (for the DARE also when R + BᵀXB is not positive definite)
  double residual_tolerance = 1e-9;  // largest relative residual accepted
};

// Continuous-time algebraic Riccati equation
//   AᵀX + XA − (XB + S) R⁻¹ (XB + S)ᵀ + Q = 0,
// A n×n, B n×m, Q n×n symmetric, R m×m symmetric invertible (may be indefinite, as in the
// H-infinity form), S n×m (pass an empty matrix for zero). The stabilising X makes
// A − B R⁻¹ (BᵀX + Sᵀ) Hurwitz. Schur method on the Hamiltonian (Laub 1979) in complex
// arithmetic with eigenvalue reordering, then Newton–Kleinman refinement.
Result<RiccatiSolution, SolveError> SolveCare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                              const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                                              const Eigen::MatrixXd& S = {},
                                              const RiccatiOptions& options = {});

// The same equation by the scaled matrix sign function of the Hamiltonian: an independent method,
// used to cross-check SolveCare.
Result<RiccatiSolution, SolveError> SolveCareBySign(
    const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, const Eigen::MatrixXd& Q,
    const Eigen::MatrixXd& R, const Eigen::MatrixXd& S = {}, const RiccatiOptions& options = {});

// Discrete-time algebraic Riccati equation
//   AᵀXA − X − (AᵀXB + S)(R + BᵀXB)⁻¹(AᵀXB + S)ᵀ + Q = 0,
// stabilising: A − B (R + BᵀXB)⁻¹ (BᵀXA + Sᵀ) has every eigenvalue inside the unit circle.
// Structure-preserving doubling (Chu, Fan, Lin 2005), then Hewer refinement.
Result<RiccatiSolution, SolveError> SolveDare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                              const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                                              const Eigen::MatrixXd& S = {},
                                              const RiccatiOptions& options = {});

// Continuous Lyapunov equation A X + X Aᵀ + Q = 0 by Bartels–Stewart on the complex Schur form:
// X. The solution is unique when no two eigenvalues of A satisfy λ_i + conj(λ_j) = 0 (A Hurwitz
// is enough); otherwise kIllConditioned. X is symmetrised when Q is symmetric.
Result<Eigen::MatrixXd, SolveError> SolveLyapunov(const Eigen::MatrixXd& A,
                                                  const Eigen::MatrixXd& Q);
// Discrete Lyapunov (Stein) equation A X Aᵀ − X + Q = 0; unique when no λ_i conj(λ_j) = 1 (A Schur
// stable is enough), otherwise kIllConditioned.
Result<Eigen::MatrixXd, SolveError> SolveDiscreteLyapunov(const Eigen::MatrixXd& A,
                                                          const Eigen::MatrixXd& Q);

// x[k+1] = Ad x[k] + Bd u[k]: a continuous system sampled with a zero-order hold.
struct ZohSystem {
  Eigen::MatrixXd Ad, Bd;
};

// Zero-order-hold discretisation of ẋ = A x + B u over a sample period T (Van Loan's block
// exponential). kInvalidInput for sizes that disagree, non-finite entries or a negative period.
Result<ZohSystem, SolveError> DiscretiseZoh(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                            double period_s);

}  // namespace upright::design
