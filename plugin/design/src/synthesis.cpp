#include "upright/design/synthesis.hpp"

#include <cmath>
#include <sstream>

#include "gamma_bisection.hpp"
#include "upright/design/closed_loop.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;
using Gained = Result<MatrixXd, SolveError>;

// The solver's failure, its message prefixed with the design that met it.
tl::unexpected<SolveError> Failed(const SolveError& error, const std::string& design) {
  return Failure(SolveError{error.reason, design + error.message});
}

MatrixXd PushColumn(const LinearModel& plant, double push_scale_N) {
  return plant.E.col(0) * push_scale_N;
}

}  // namespace

Gained LqrGain(const MatrixXd& A, const MatrixXd& B, const MatrixXd& Q, const MatrixXd& R) {
  const auto care = SolveCare(A, B, Q, R);
  if (!care) return Failed(care.error(), "LQR: ");
  return MatrixXd(R.ldlt().solve(B.transpose() * care->X));
}

Gained DiscreteLqrGain(const MatrixXd& Ad, const MatrixXd& Bd, const MatrixXd& Q,
                       const MatrixXd& R) {
  const auto dare = SolveDare(Ad, Bd, Q, R);
  if (!dare) return Failed(dare.error(), "discrete LQR: ");
  const MatrixXd BtX = Bd.transpose() * dare->X;
  return MatrixXd((R + BtX * Bd).ldlt().solve(BtX * Ad));
}

Gained HinfGain(const MatrixXd& A, const MatrixXd& B1, const MatrixXd& B2, const MatrixXd& Q,
                const MatrixXd& R, double gamma) {
  // AᵀX + XA − X [B1 B2] diag(−γ² I, R)⁻¹ [B1 B2]ᵀ X + Q = 0 with X ≥ 0 stabilising (Doyle,
  // Glover, Khargonekar and Francis, IEEE Trans. Automatic Control 34(8), 1989, the
  // full-information central controller; the form SLICOT SB10QD solves); F = −R⁻¹ B2ᵀ X, so
  // K = R⁻¹ B2ᵀ X. Solved as [B1/γ B2] with diag(−I, R), the same equation, so that a small γ
  // does not make the weight look singular.
  if (!(gamma > 0) || !std::isfinite(gamma)) {
    std::ostringstream why;
    why << "H-infinity: gamma = " << gamma << ", must be > 0";
    return Failure(SolveError{SolveFailure::kInvalidInput, why.str()});
  }
  const auto nw = B1.cols(), nu = B2.cols();
  MatrixXd B(A.rows(), nw + nu);
  B << B1 / gamma, B2;
  MatrixXd Rt = MatrixXd::Zero(nw + nu, nw + nu);
  Rt.topLeftCorner(nw, nw) = -MatrixXd::Identity(nw, nw);
  Rt.bottomRightCorner(nu, nu) = R;
  const auto care = SolveCare(A, B, Q, Rt);  // require_psd: X ≥ 0
  if (!care) {
    std::ostringstream why;
    why << "H-infinity at gamma = " << gamma << ": ";
    return Failed(care.error(), why.str());
  }
  return MatrixXd(R.ldlt().solve(B2.transpose() * care->X));
}

Result<GammaSearch, SolveError> OptimalGamma(const MatrixXd& A, const MatrixXd& B1,
                                             const MatrixXd& B2, const MatrixXd& Q,
                                             const MatrixXd& R, double upper_gamma,
                                             double relative_gap) {
  return internal::BisectGamma([&](double gamma) { return HinfGain(A, B1, B2, Q, R, gamma); },
                               upper_gamma, relative_gap);
}

Gained KalmanBucyGain(const MatrixXd& A, const MatrixXd& C, const MatrixXd& Qc, const MatrixXd& Rc,
                      MatrixXd* P) {
  // The filter Riccati equation is the dual of the regulator's: A P + P Aᵀ − P Cᵀ Rc⁻¹ C P + Qc
  // = 0 (Kalman and Bucy, 1961; handbook, from memory).
  const auto care = SolveCare(A.transpose(), C.transpose(), Qc, Rc);
  if (!care) return Failed(care.error(), "Kalman-Bucy filter: ");
  if (P) *P = care->X;
  return MatrixXd(care->X * C.transpose() * Rc.inverse());
}

Gained DiscreteKalmanGain(const MatrixXd& Ad, const MatrixXd& C, const MatrixXd& Qd,
                          const MatrixXd& Rd, MatrixXd* P) {
  // The a-priori covariance solves the dual DARE (Anderson and Moore, Optimal Filtering, 1979,
  // from memory): P = Ad P Adᵀ − Ad P Cᵀ (C P Cᵀ + Rd)⁻¹ C P Adᵀ + Qd.
  const auto dare = SolveDare(Ad.transpose(), C.transpose(), Qd, Rd);
  if (!dare) return Failed(dare.error(), "discrete Kalman filter: ");
  if (P) *P = dare->X;
  const MatrixXd S = C * dare->X * C.transpose() + Rd;
  return MatrixXd(dare->X * C.transpose() * S.inverse());
}

Gained RobotLqr(const LinearModel& plant, const StateMatrix& Q, const Eigen::Matrix2d& R) {
  return LqrGain(plant.A, plant.B, Q, R);
}

Gained RobotDiscreteLqr(const LinearModel& plant, const StateMatrix& Q, const Eigen::Matrix2d& R,
                        double period_s) {
  const Result<ZohSystem, SolveError> sampled = DiscretiseZoh(plant.A, plant.B, period_s);
  if (!sampled) return Failed(sampled.error(), "discrete LQR: ");
  return DiscreteLqrGain(sampled->Ad, sampled->Bd, Q, R);
}

Gained RobotHinf(const LinearModel& plant, const StateMatrix& Q, const Eigen::Matrix2d& R,
                 double push_scale_N, double gamma) {
  return HinfGain(plant.A, PushColumn(plant, push_scale_N), plant.B, Q, R, gamma);
}

Result<GammaSearch, SolveError> RobotOptimalGamma(const LinearModel& plant, const StateMatrix& Q,
                                                  const Eigen::Matrix2d& R, double push_scale_N) {
  const Gained lqr = RobotLqr(plant, Q, R);
  if (!lqr) return Failed(lqr.error(), "gamma search: ");
  // Any stabilising gain bounds γ_opt from above: use the LQR loop's own norm (as far as the
  // analysis got, should it stop short).
  const AnalysisResult<LoopAnalysis> loop =
      AnalyseLoop(plant, FullState(), StateFeedback(*lqr), Performance{Q, R, push_scale_N});
  const double push_norm = loop ? loop->push_norm : loop.error().found.push_norm;
  return OptimalGamma(plant.A, PushColumn(plant, push_scale_N), plant.B, Q, R, 1.01 * push_norm);
}

}  // namespace upright::design
