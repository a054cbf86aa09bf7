// Pieces shared by the Riccati solvers: problem matrices in, validated and normalised problems,
// residuals, stabilisability and definiteness verdicts and their messages out.
#pragma once

#include <Eigen/Dense>
#include <complex>
#include <limits>
#include <string>

#include "upright/design/riccati.hpp"

namespace upright::design::internal {

// Relative distance from the stability boundary below which an eigenvalue counts as lying on it
// (imaginary axis or unit circle). Rounding moves a defective eigenvalue by about √ε, so the
// threshold sits just above that.
inline constexpr double kBoundaryTolerance = 1e-8;
// A candidate with λ_min(X) < −kPsdTolerance·‖X‖₂ is clearly indefinite.
inline constexpr double kPsdTolerance = 1e-8;
// A basis matrix whose reciprocal condition number is below this cannot be inverted reliably.
inline constexpr double kRcondTolerance = 1e3 * std::numeric_limits<double>::epsilon();

// A Riccati problem after validation: symmetric Q and R, S filled in (zeros when absent), and the
// cross term folded in: Ā = A − B R⁻¹ Sᵀ, G = B R⁻¹ Bᵀ, Q̄ = Q − S R⁻¹ Sᵀ.
struct RiccatiProblem {
  Eigen::MatrixXd A, B, Q, R, S;
  Eigen::MatrixXd A_bar, G, Q_bar;
  Eigen::PartialPivLU<Eigen::MatrixXd> R_lu;  // R may be indefinite (H-infinity form)
};

// Checks sizes, finiteness, the symmetry of Q and R and the invertibility of R, then builds the
// problem; kInvalidInput with a message starting with `equation` ("CARE", "DARE") otherwise.
Result<RiccatiProblem, SolveError> PrepareRiccatiProblem(
    const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, const Eigen::MatrixXd& Q,
    const Eigen::MatrixXd& R, const Eigen::MatrixXd& S, const char* equation);

// PBH test on every eigenvalue of A outside the open stability region (Re λ < 0 when continuous,
// |λ| < 1 when discrete, both with kBoundaryTolerance): kNotStabilisable with a message naming
// the mode when rank [A − λI, B] < n for one of them.
Result<void, SolveError> CheckStabilisable(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                           bool discrete);

// Residual of the continuous equation AᵀX + XA − (XB + S) R⁻¹ (XB + S)ᵀ + Q and its size relative
// to the terms: ‖res‖_F / (‖Q‖_F + ‖AᵀX‖_F + ‖XA‖_F + ‖(XB + S) R⁻¹ (XB + S)ᵀ‖_F).
double CareResidual(const RiccatiProblem& problem, const Eigen::MatrixXd& X,
                    Eigen::MatrixXd* residual);

// Residual of the discrete equation AᵀXA − X − (AᵀXB + S)(R + BᵀXB)⁻¹(AᵀXB + S)ᵀ + Q relative to
// ‖Q‖_F + ‖AᵀXA‖_F + ‖X‖_F + ‖(AᵀXB + S)(R + BᵀXB)⁻¹(AᵀXB + S)ᵀ‖_F. Infinite when R + BᵀXB is
// singular.
double DareResidual(const RiccatiProblem& problem, const Eigen::MatrixXd& X,
                    Eigen::MatrixXd* residual);

// Feedback gain K of u = −K x: R⁻¹(BᵀX + Sᵀ) (continuous) or (R + BᵀXB)⁻¹(BᵀXA + Sᵀ) (discrete).
Eigen::MatrixXd CareGain(const RiccatiProblem& problem, const Eigen::MatrixXd& X);
Eigen::MatrixXd DareGain(const RiccatiProblem& problem, const Eigen::MatrixXd& X);

// The failing side of a solver: `return Fail(SolveFailure::kIllConditioned, "...")`.
tl::unexpected<SolveError> Fail(SolveFailure reason, std::string message);
// A solver's failure passed on by a design, its message prefixed with the design that met it.
inline tl::unexpected<SolveError> Failed(const SolveError& error, const std::string& design) {
  return Fail(error.reason, design + error.message);
}

// kNotPositiveSemidefinite when λ_min(X) < −kPsdTolerance·‖X‖₂, with a message giving both
// numbers.
Result<void, SolveError> CheckSemidefinite(const Eigen::MatrixXd& X);

// The eigenvalue of `matrix` with the largest real part (continuous) or modulus (discrete).
std::complex<double> RightmostEigenvalue(const Eigen::MatrixXd& matrix);
std::complex<double> LargestEigenvalue(const Eigen::MatrixXd& matrix);

}  // namespace upright::design::internal
