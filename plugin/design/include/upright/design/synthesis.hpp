// Controller synthesis on the linear robot: LQR (continuous, and discrete at the control rate with
// zero-order hold), H-infinity state feedback against a push with γ-iteration, and steady-state
// Kalman filters from the model's sensor noise. Each returns gains or a typed reason for failure.
#pragma once

#include <Eigen/Dense>

#include <string>

#include "upright/design/linear_model.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {

using Gain = Eigen::Matrix<double, kInputs, kStates>;  // the robot's u = −K x

// Each design below returns a gain (u = −K x, or a filter gain) or the typed reason there is none.

// Continuous LQR on any (A, B): minimises ∫ xᵀQx + uᵀRu dt; K = R⁻¹ BᵀX.
Result<Eigen::MatrixXd, SolveError> LqrGain(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                            const Eigen::MatrixXd& Q, const Eigen::MatrixXd& R);
// Discrete LQR on (Ad, Bd): minimises Σ xᵀQx + uᵀRu; K = (R + BᵀXB)⁻¹ BᵀXA.
Result<Eigen::MatrixXd, SolveError> DiscreteLqrGain(const Eigen::MatrixXd& Ad,
                                                    const Eigen::MatrixXd& Bd,
                                                    const Eigen::MatrixXd& Q,
                                                    const Eigen::MatrixXd& R);
// H-infinity state feedback for ẋ = A x + B1 w + B2 u, z = [Q½ x; R½ u]: the central controller
// with ‖T_zw‖∞ < γ (Doyle, Glover, Khargonekar and Francis, IEEE TAC 34(8), 1989), K = R⁻¹ B2ᵀX,
// from the Riccati equation in LQR form with the indefinite weight diag(−γ² I, R).
Result<Eigen::MatrixXd, SolveError> HinfGain(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B1,
                                             const Eigen::MatrixXd& B2, const Eigen::MatrixXd& Q,
                                             const Eigen::MatrixXd& R, double gamma);

// γ_opt by geometric bisection on the feasibility of HinfGain, from `upper_gamma` (which must be
// feasible, e.g. 1.01 × the norm of any stabilising loop) down to a relative gap; the lower end,
// 1e-6 × upper_gamma, is checked to be infeasible (a failure otherwise: γ_opt lies below it).
struct GammaSearch {
  double gamma_opt = 0;
  int iterations = 0;
};
Result<GammaSearch, SolveError> OptimalGamma(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B1,
                                             const Eigen::MatrixXd& B2, const Eigen::MatrixXd& Q,
                                             const Eigen::MatrixXd& R, double upper_gamma,
                                             double relative_gap = 1e-4);

// Steady-state Kalman gains. Continuous (Kalman–Bucy): ẋ = A x + w, y = C x + v with
// intensities Qc, Rc; L = P Cᵀ Rc⁻¹. Discrete: x⁺ = Ad x + w, y = C x + v with covariances
// Qd, Rd; L = P⁻ Cᵀ (C P⁻ Cᵀ + Rd)⁻¹ is the measurement-update gain, P⁻ the a-priori
// covariance. Each returns L, and P in *P when asked for.
Result<Eigen::MatrixXd, SolveError> KalmanBucyGain(const Eigen::MatrixXd& A,
                                                   const Eigen::MatrixXd& C,
                                                   const Eigen::MatrixXd& Qc,
                                                   const Eigen::MatrixXd& Rc,
                                                   Eigen::MatrixXd* P = nullptr);
Result<Eigen::MatrixXd, SolveError> DiscreteKalmanGain(const Eigen::MatrixXd& Ad,
                                                       const Eigen::MatrixXd& C,
                                                       const Eigen::MatrixXd& Qd,
                                                       const Eigen::MatrixXd& Rd,
                                                       Eigen::MatrixXd* P = nullptr);

// The robot: the same designs on its linear model. The H-infinity disturbance is the push
// (E's first column) scaled by push_scale_N; discrete designs use a zero-order hold at period_s
// with the continuous weights per sample.
Result<Eigen::MatrixXd, SolveError> RobotLqr(const LinearModel& plant, const StateMatrix& Q,
                                             const Eigen::Matrix2d& R);
Result<Eigen::MatrixXd, SolveError> RobotDiscreteLqr(const LinearModel& plant, const StateMatrix& Q,
                                                     const Eigen::Matrix2d& R, double period_s);
Result<Eigen::MatrixXd, SolveError> RobotHinf(const LinearModel& plant, const StateMatrix& Q,
                                              const Eigen::Matrix2d& R, double push_scale_N,
                                              double gamma);
// Searches from 1.01 × the LQR loop's push norm.
Result<GammaSearch, SolveError> RobotOptimalGamma(const LinearModel& plant, const StateMatrix& Q,
                                                  const Eigen::Matrix2d& R, double push_scale_N);

// The sensors an estimator uses, linearised: y = C x + D u with white noise of covariance Rv
// (per sample at the control rate). Rows: mean encoder angle (x/r − θ), gyro pitch rate, heading
// from the encoder difference, gyro yaw rate, accelerometer along x (f_x / g ≈ −θ + (ẍ + h θ̈)/g).
struct SensorLinearisation {
  Eigen::MatrixXd C, D, Rv;
  static constexpr int kMeasurements = 5;
  static constexpr int kAccelRow = 4;  // the accelerometer's row, f_x / g
};
SensorLinearisation LineariseSensors(const model::RobotModel& model, const LinearModel& plant);

// The filter itself, its noise and its sensors' widened accelerometer row: lqg_filter.hpp.

}  // namespace upright::design
