// Riccati and Lyapunov equation solvers: matrices in, a validated solution or a typed reason for
// failure out. They serve LQR, H-infinity state feedback (indefinite R) and Kalman filter design.
#pragma once

#include <Eigen/Dense>
#include <string>

namespace upright::design {

enum class SolveFailure {
  kNone,
  kInvalidInput,             // sizes disagree, non-finite entries, Q or R not symmetric
  kNotStabilisable,          // (A, B) has an uncontrollable mode that is not stable
  kNoStabilisingSolution,    // Hamiltonian / symplectic eigenvalues on the stability boundary
  kIllConditioned,           // a basis or linear system cannot be solved reliably (also: a singular
                             // Lyapunov equation)
  kResidualTooLarge,         // the candidate does not satisfy the equation
  kNotPositiveSemidefinite,  // X has a clearly negative eigenvalue (γ infeasible in H-infinity)
};

const char* ToString(SolveFailure failure);

struct RiccatiResult {
  Eigen::MatrixXd X;  // the stabilising solution (symmetric) when ok()
  SolveFailure failure = SolveFailure::kInvalidInput;
  std::string message = "not solved";
  double relative_residual = 0;  // ‖residual‖_F / (‖Q‖_F + ‖AᵀX‖_F + ‖XA‖_F + ...), always set
  bool ok() const { return failure == SolveFailure::kNone; }
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
RiccatiResult SolveCare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                        const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                        const Eigen::MatrixXd& S = {}, const RiccatiOptions& options = {});

// The same equation by the scaled matrix sign function of the Hamiltonian: an independent method,
// used to cross-check SolveCare.
RiccatiResult SolveCareBySign(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                              const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                              const Eigen::MatrixXd& S = {}, const RiccatiOptions& options = {});

// Discrete-time algebraic Riccati equation
//   AᵀXA − X − (AᵀXB + S)(R + BᵀXB)⁻¹(AᵀXB + S)ᵀ + Q = 0,
// stabilising: A − B (R + BᵀXB)⁻¹ (BᵀXA + Sᵀ) has every eigenvalue inside the unit circle.
// Structure-preserving doubling (Chu, Fan, Lin 2005), then Hewer refinement.
RiccatiResult SolveDare(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                        const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R,
                        const Eigen::MatrixXd& S = {}, const RiccatiOptions& options = {});

struct LyapunovResult {
  Eigen::MatrixXd X;
  SolveFailure failure = SolveFailure::kInvalidInput;
  std::string message = "not solved";
  bool ok() const { return failure == SolveFailure::kNone; }
};

// Continuous Lyapunov equation A X + X Aᵀ + Q = 0 by Bartels–Stewart on the complex Schur form.
// The solution is unique when no two eigenvalues of A satisfy λ_i + conj(λ_j) = 0 (A Hurwitz is
// enough); otherwise kIllConditioned. X is symmetrised when Q is symmetric.
LyapunovResult SolveLyapunov(const Eigen::MatrixXd& A, const Eigen::MatrixXd& Q);
// Discrete Lyapunov (Stein) equation A X Aᵀ − X + Q = 0; unique when no λ_i conj(λ_j) = 1 (A Schur
// stable is enough), otherwise kIllConditioned.
LyapunovResult SolveDiscreteLyapunov(const Eigen::MatrixXd& A, const Eigen::MatrixXd& Q);

// Zero-order-hold discretisation of ẋ = A x + B u over a sample period T (Van Loan's block
// exponential): x[k+1] = Ad x[k] + Bd u[k]. Throws std::invalid_argument for null outputs, sizes
// that disagree, non-finite entries or a negative period.
void DiscretiseZoh(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, double period_s,
                   Eigen::MatrixXd* Ad, Eigen::MatrixXd* Bd);

}  // namespace upright::design
