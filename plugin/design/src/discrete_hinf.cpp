// Discrete-time H-infinity state feedback on the indefinite DARE, its γ search, and the robot
// sampled with its push held like its input.
#include "upright/design/discrete_hinf.hpp"

#include <cmath>
#include <complex>
#include <string>

#include "gamma_bisection.hpp"
#include "riccati_common.hpp"
#include "upright/base/number_text.hpp"
#include "upright/design/discrete_norm.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;
using Gained = Result<MatrixXd, SolveError>;

tl::unexpected<SolveError> Failed(const SolveError& error, const std::string& design) {
  return Failure(SolveError{error.reason, design + error.message});
}

// The robot's input and push, sampled together.
struct SampledRobot {
  MatrixXd Ad, Bd_input, Bd_push;
};

Result<SampledRobot, SolveError> Sample(const LinearModel& plant, double push_scale_N,
                                        double period_s) {
  MatrixXd inputs(kStates, kInputs + 1);
  inputs << plant.B, plant.E.col(0) * push_scale_N;
  const Result<ZohSystem, SolveError> zoh = DiscretiseZoh(plant.A, inputs, period_s);
  if (!zoh) return Failure(zoh.error());
  return SampledRobot{zoh->Ad, zoh->Bd.leftCols(kInputs), zoh->Bd.rightCols(1)};
}

// The symmetric square root of a symmetric positive semidefinite weight.
MatrixXd SquareRoot(const MatrixXd& weight) {
  return Eigen::SelfAdjointEigenSolver<MatrixXd>(weight).operatorSqrt();
}

}  // namespace

Gained DiscreteHinfGain(const MatrixXd& A, const MatrixXd& B1, const MatrixXd& B2,
                        const MatrixXd& Q, const MatrixXd& R, double gamma, MatrixXd* X_out) {
  if (!(gamma > 0) || !std::isfinite(gamma)) {
    return internal::Fail(
        SolveFailure::kInvalidInput,
        "discrete H-infinity: gamma = " + SignificantText(gamma, 6) + ", must be finite and > 0");
  }
  const std::string design = "discrete H-infinity at gamma = " + SignificantText(gamma, 6) + ": ";
  const Eigen::Index n = A.rows(), nw = B1.cols(), nu = B2.cols();
  if (B1.rows() != n || B2.rows() != n || R.rows() != nu || R.cols() != nu) {
    return internal::Fail(SolveFailure::kInvalidInput, design + "B1, B2 and R do not fit A (" +
                                                           std::to_string(n) + " states) and B2 (" +
                                                           std::to_string(nu) + " inputs)");
  }
  if (!R.allFinite() || Eigen::LLT<MatrixXd>(R).info() != Eigen::Success) {
    return internal::Fail(SolveFailure::kInvalidInput, design + "R is not positive definite");
  }
  // The game's equation with B1/γ and diag(−I, R): the same X and gain, without a weight that
  // looks singular for a small γ.
  MatrixXd B(n, nw + nu);
  B << B1 / gamma, B2;
  MatrixXd Rt = MatrixXd::Zero(nw + nu, nw + nu);
  Rt.topLeftCorner(nw, nw) = -MatrixXd::Identity(nw, nw);
  Rt.bottomRightCorner(nu, nu) = R;
  RiccatiOptions options;
  options.require_psd = false;  // R̃ + B̃ᵀXB̃ is indefinite here; the checks below are the game's
  const Result<RiccatiSolution, SolveError> dare = SolveDare(A, B, Q, Rt, {}, options);
  if (!dare) return Failed(dare.error(), design);
  const MatrixXd& X = dare->X;
  if (auto semidefinite = internal::CheckSemidefinite(X); !semidefinite) {
    return Failed(semidefinite.error(), design);
  }
  // γ² I − B1ᵀX B1 > 0, divided by γ²: the step's worst push is bounded.
  const MatrixXd b1 = B.leftCols(nw);
  const double concavity =
      Eigen::SelfAdjointEigenSolver<MatrixXd>(MatrixXd::Identity(nw, nw) - b1.transpose() * X * b1,
                                              Eigen::EigenvaluesOnly)
          .eigenvalues()
          .minCoeff();
  if (!(concavity > 0)) {
    return internal::Fail(SolveFailure::kNotPositiveSemidefinite,
                          design +
                              "gamma² I − B1ᵀX B1 is not positive definite (smallest "
                              "eigenvalue of I − B1ᵀX B1 / gamma²: " +
                              SignificantText(concavity, 6) + ")");
  }
  const MatrixXd middle = Rt + B.transpose() * X * B;
  const MatrixXd saddle = middle.fullPivLu().solve(B.transpose() * X * A);
  MatrixXd K = saddle.bottomRows(nu);
  const std::complex<double> largest = internal::LargestEigenvalue(A - B2 * K);
  if (!(std::abs(largest) < 1)) {
    return internal::Fail(SolveFailure::kNoStabilisingSolution,
                          design + "the loop A − B2 K has the eigenvalue " +
                              ComplexText(largest, 6) + ", not inside the unit circle");
  }
  if (X_out) *X_out = X;
  return K;
}

Result<GammaSearch, SolveError> DiscreteOptimalGamma(const MatrixXd& A, const MatrixXd& B1,
                                                     const MatrixXd& B2, const MatrixXd& Q,
                                                     const MatrixXd& R, double upper_gamma,
                                                     double relative_gap) {
  const Result<GammaSearch, SolveError> search =
      internal::BisectGamma([&](double gamma) { return DiscreteHinfGain(A, B1, B2, Q, R, gamma); },
                            upper_gamma, relative_gap);
  if (!search) return Failed(search.error(), "discrete H-infinity ");
  return search;
}

Gained RobotDiscreteHinf(const LinearModel& plant, const StateMatrix& Q, const Eigen::Matrix2d& R,
                         double push_scale_N, double gamma, double period_s) {
  const Result<SampledRobot, SolveError> sampled = Sample(plant, push_scale_N, period_s);
  if (!sampled) return Failed(sampled.error(), "discrete H-infinity: ");
  return DiscreteHinfGain(sampled->Ad, sampled->Bd_push, sampled->Bd_input, Q, R, gamma);
}

Result<GammaSearch, SolveError> RobotDiscreteOptimalGamma(const LinearModel& plant,
                                                          const StateMatrix& Q,
                                                          const Eigen::Matrix2d& R,
                                                          double push_scale_N, double period_s) {
  const Result<SampledRobot, SolveError> sampled = Sample(plant, push_scale_N, period_s);
  if (!sampled) return Failed(sampled.error(), "discrete H-infinity gamma search: ");
  const Gained lqr = DiscreteLqrGain(sampled->Ad, sampled->Bd_input, Q, R);
  if (!lqr) return Failed(lqr.error(), "discrete H-infinity gamma search: ");
  // Any stabilising gain bounds γ_opt from above: the discrete LQR loop's own norm (as far as
  // the analysis got, should it stop short).
  const AnalysisResult<NormPeak> norm =
      SampledPushNorm(plant, *lqr, Performance{Q, R, push_scale_N}, period_s);
  const double upper = norm ? norm->norm : norm.error().found.norm;
  return DiscreteOptimalGamma(sampled->Ad, sampled->Bd_push, sampled->Bd_input, Q, R, 1.01 * upper);
}

AnalysisResult<NormPeak> SampledPushNorm(const LinearModel& plant, const Gain& K,
                                         const Performance& performance, double period_s) {
  const Result<SampledRobot, SolveError> sampled =
      Sample(plant, performance.push_scale_N, period_s);
  if (!sampled) {
    return Failure(AnalysisFailure<NormPeak>{sampled.error().message, NormPeak{}});
  }
  StateSpace loop;
  loop.A = sampled->Ad - sampled->Bd_input * K;
  loop.B = sampled->Bd_push;
  loop.C = MatrixXd(kStates + kInputs, kStates);
  loop.C << SquareRoot(performance.Q), -SquareRoot(performance.R) * K;
  loop.D = MatrixXd::Zero(kStates + kInputs, 1);
  return DiscreteHinfNorm(loop, period_s);
}

}  // namespace upright::design
