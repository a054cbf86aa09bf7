// LqgFilter: the steady-state Kalman filter of the built-in LQG controller, designed here once so
// that the `lqg` module runs and `upright design` analyses the same filter.
#pragma once

#include <Eigen/Dense>

#include <string>

#include "upright/design/linear_model.hpp"
#include "upright/design/riccati.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::design {

// Disturbances the filter expects, standard deviations per control sample, held over the sample.
struct FilterNoise {
  double push_sigma_N = 0;         // horizontal push on the chassis (E's first column)
  double torque_sigma_Nm = 0;      // pitch torque on the chassis (E's second column)
  double yaw_torque_sigma_Nm = 0;  // yaw torque on the robot
  double floor = 1e-8;             // on every state, so the filter never stops learning
};

// Tuning defaults (common practice): a push of 5 % of the robot's weight, a pitch torque of 5 %
// of the body's weight at 10 cm, a yaw torque of 5 % of the robot's weight at half the track.
FilterNoise DefaultFilterNoise(const model::RobotModel& model, const LinearModel& plant);

struct LqgFilter {
  SensorLinearisation sensors;  // y = C x + D u + v; Rv with the accelerometer row widened
  Eigen::MatrixXd Ad, Bd;       // the plant at the sample period (zero-order hold)
  Eigen::MatrixXd Qd;           // process noise covariance per sample
  Eigen::MatrixXd L_discrete;   // measurement update x̂ ← x̂⁻ + L (y − C x̂⁻ − D u)
  Eigen::MatrixXd P_discrete;   // its a-priori error covariance
  Eigen::MatrixXd L;            // continuous Kalman–Bucy gain for the same noise (the analysis)
};

// The filter's sensors: LineariseSensors with the accelerometer's variance widened by the
// disturbances it feels directly (see lqg_filter.cpp).
SensorLinearisation FilterSensors(const model::RobotModel& model, const LinearModel& plant,
                                  const FilterNoise& noise);

// The filter at period_s on `plant` (torque or voltage input), or why the Kalman designs failed.
// `torque_plant` is the same robot with torque input: its yaw row turns the yaw torque into yaw
// acceleration.
Result<LqgFilter, SolveError> DesignLqgFilter(const model::RobotModel& model,
                                              const LinearModel& plant,
                                              const LinearModel& torque_plant,
                                              const FilterNoise& noise, double period_s);

}  // namespace upright::design
