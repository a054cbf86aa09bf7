#include "upright/design/synthesis.hpp"

#include <cmath>
#include <sstream>

#include "upright/design/closed_loop.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

GainResult Failed(SolveFailure failure, const std::string& message) {
  GainResult r;
  r.failure = failure;
  r.message = message;
  return r;
}

GainResult Succeeded(MatrixXd K) {
  GainResult r;
  r.K = std::move(K);
  r.failure = SolveFailure::kNone;
  r.message = "ok";
  return r;
}

MatrixXd PushColumn(const LinearModel& plant, double push_scale_N) {
  return plant.E.col(0) * push_scale_N;
}

}  // namespace

GainResult LqrGain(const MatrixXd& A, const MatrixXd& B, const MatrixXd& Q, const MatrixXd& R) {
  const RiccatiResult care = SolveCare(A, B, Q, R);
  if (!care.ok()) return Failed(care.failure, "LQR: " + care.message);
  return Succeeded(R.ldlt().solve(B.transpose() * care.X));
}

GainResult DiscreteLqrGain(const MatrixXd& Ad, const MatrixXd& Bd, const MatrixXd& Q,
                           const MatrixXd& R) {
  const RiccatiResult dare = SolveDare(Ad, Bd, Q, R);
  if (!dare.ok()) return Failed(dare.failure, "discrete LQR: " + dare.message);
  const MatrixXd BtX = Bd.transpose() * dare.X;
  return Succeeded((R + BtX * Bd).ldlt().solve(BtX * Ad));
}

GainResult HinfGain(const MatrixXd& A, const MatrixXd& B1, const MatrixXd& B2, const MatrixXd& Q,
                    const MatrixXd& R, double gamma) {
  // AᵀX + XA − X [B1 B2] diag(−γ² I, R)⁻¹ [B1 B2]ᵀ X + Q = 0 with X ≥ 0 stabilising (Doyle,
  // Glover, Khargonekar and Francis, IEEE Trans. Automatic Control 34(8), 1989, the
  // full-information central controller; the form SLICOT SB10QD solves); F = −R⁻¹ B2ᵀ X, so
  // K = R⁻¹ B2ᵀ X.
  if (!(gamma > 0) || !std::isfinite(gamma)) {
    std::ostringstream why;
    why << "H-infinity: gamma = " << gamma << ", must be > 0";
    return Failed(SolveFailure::kInvalidInput, why.str());
  }
  const auto nw = B1.cols(), nu = B2.cols();
  MatrixXd B(A.rows(), nw + nu);
  B << B1, B2;
  MatrixXd Rt = MatrixXd::Zero(nw + nu, nw + nu);
  Rt.topLeftCorner(nw, nw) = -gamma * gamma * MatrixXd::Identity(nw, nw);
  Rt.bottomRightCorner(nu, nu) = R;
  const RiccatiResult care = SolveCare(A, B, Q, Rt);  // require_psd: X ≥ 0
  if (!care.ok()) {
    std::ostringstream why;
    why << "H-infinity at gamma = " << gamma << ": " << care.message;
    return Failed(care.failure, why.str());
  }
  return Succeeded(R.ldlt().solve(B2.transpose() * care.X));
}

GammaSearch OptimalGamma(const MatrixXd& A, const MatrixXd& B1, const MatrixXd& B2,
                         const MatrixXd& Q, const MatrixXd& R, double upper_gamma,
                         double relative_gap) {
  GammaSearch out;
  double hi = upper_gamma;
  if (!HinfGain(A, B1, B2, Q, R, hi).ok()) {
    out.failure = SolveFailure::kNoStabilisingSolution;
    std::ostringstream why;
    why << "gamma search: the upper bound gamma = " << hi << " is infeasible";
    out.message = why.str();
    return out;
  }
  // Feasibility is monotone in γ; with no feedthrough from w to z the infimum is > 0, and a
  // lower bound a million times smaller is infeasible for any loop worth designing.
  double lo = 1e-6 * hi;
  while (hi / lo > 1 + relative_gap && out.iterations < 200) {
    const double mid = std::sqrt(lo * hi);
    (HinfGain(A, B1, B2, Q, R, mid).ok() ? hi : lo) = mid;
    ++out.iterations;
  }
  out.gamma_opt = hi;
  out.failure = SolveFailure::kNone;
  out.message = "ok";
  return out;
}

GainResult KalmanBucyGain(const MatrixXd& A, const MatrixXd& C, const MatrixXd& Qc,
                          const MatrixXd& Rc, MatrixXd* P) {
  // The filter Riccati equation is the dual of the regulator's: A P + P Aᵀ − P Cᵀ Rc⁻¹ C P + Qc
  // = 0 (Kalman and Bucy, 1961; handbook, from memory).
  const RiccatiResult care = SolveCare(A.transpose(), C.transpose(), Qc, Rc);
  if (!care.ok()) return Failed(care.failure, "Kalman-Bucy filter: " + care.message);
  if (P) *P = care.X;
  return Succeeded(care.X * C.transpose() * Rc.inverse());
}

GainResult DiscreteKalmanGain(const MatrixXd& Ad, const MatrixXd& C, const MatrixXd& Qd,
                              const MatrixXd& Rd, MatrixXd* P) {
  // The a-priori covariance solves the dual DARE (Anderson and Moore, Optimal Filtering, 1979,
  // from memory): P = Ad P Adᵀ − Ad P Cᵀ (C P Cᵀ + Rd)⁻¹ C P Adᵀ + Qd.
  const RiccatiResult dare = SolveDare(Ad.transpose(), C.transpose(), Qd, Rd);
  if (!dare.ok()) return Failed(dare.failure, "discrete Kalman filter: " + dare.message);
  if (P) *P = dare.X;
  const MatrixXd S = C * dare.X * C.transpose() + Rd;
  return Succeeded(dare.X * C.transpose() * S.inverse());
}

GainResult RobotLqr(const LinearModel& plant, const StateMatrix& Q, const Eigen::Matrix2d& R) {
  return LqrGain(plant.A, plant.B, Q, R);
}

GainResult RobotDiscreteLqr(const LinearModel& plant, const StateMatrix& Q,
                            const Eigen::Matrix2d& R, double period_s) {
  MatrixXd Ad, Bd;
  DiscretiseZoh(plant.A, plant.B, period_s, &Ad, &Bd);
  return DiscreteLqrGain(Ad, Bd, Q, R);
}

GainResult RobotHinf(const LinearModel& plant, const StateMatrix& Q, const Eigen::Matrix2d& R,
                     double push_scale_N, double gamma) {
  return HinfGain(plant.A, PushColumn(plant, push_scale_N), plant.B, Q, R, gamma);
}

GammaSearch RobotOptimalGamma(const LinearModel& plant, const StateMatrix& Q,
                              const Eigen::Matrix2d& R, double push_scale_N) {
  const GainResult lqr = RobotLqr(plant, Q, R);
  if (!lqr.ok()) {
    GammaSearch out;
    out.failure = lqr.failure;
    out.message = "gamma search: " + lqr.message;
    return out;
  }
  // Any stabilising gain bounds γ_opt from above: use the LQR loop's own norm.
  const LoopAnalysis loop =
      AnalyseLoop(plant, FullState(), StateFeedback(lqr.K), Performance{Q, R, push_scale_N});
  return OptimalGamma(plant.A, PushColumn(plant, push_scale_N), plant.B, Q, R,
                      1.01 * loop.push_norm);
}

}  // namespace upright::design
