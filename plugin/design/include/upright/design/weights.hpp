// Design weights: how much drift, tilt, yaw and wheel effort the engineer will accept, turned into
// LQR / H-infinity weighting matrices by Bryson's rule (each term divided by its largest
// acceptable value squared). Defaults suit a balancing robot at walking pace; the acceptable tilt
// comes from the robot's outline (robot_limits.hpp: WeightsForRobot).
#pragma once

#include <Eigen/Dense>

#include <string>

#include "upright/base/result.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::design {

struct DesignWeights {
  double max_drift_m = 0.5;           // position error that costs as much as the others' maxima
  double max_speed_m_s = 0.5;         // speed error
  // Pitch from the equilibrium; 0 = a fifth of the robot's ground-contact tilt (WeightsForRobot).
  double max_tilt_deg = 0;
  double max_tilt_rate_deg_s = 30;    // pitch rate
  double max_yaw_deg = 20;            // heading error
  double max_yaw_rate_deg_s = 45;     // yaw-rate error
  // Of the per-wheel input limit (InputLimit: the stall torque, or the supply voltage), in (0, 1].
  // Not the whole limit: with the full stall torque as Bryson's maximum the loops' fastest poles
  // run 2.7–4.3 times faster and the sampled loops tolerate about half the delay (the tabletop's
  // discrete LQR at 100 Hz 10.5 ms instead of 18.1 ms, against 5 ms of sensor latency); the rest
  // of the limit is the headroom that peaks draw on.
  double max_input_fraction = 0.3;
  // The broken rule ("DesignWeights::max_tilt_deg = -1, must be > 0 (or 0 for ...)"); success
  // when there is none. max_tilt_deg may be 0 (left to the robot).
  Status Validate() const;
};

// The largest per-wheel input: the stall torque at the wheel, n η K_t min(V_supply / R, I_max),
// in N·m, or the supply voltage in V.
double InputLimit(const model::RobotModel& model, InputKind input);

// Bryson's rule: Q = diag(1 / max²) over the states, R = diag(1 / (fraction · limit)²). The
// weights must be resolved for the robot first (max_tilt_deg > 0: an UPRIGHT_CHECK).
StateMatrix StateWeight(const DesignWeights& weights);
Eigen::Matrix2d InputWeight(const DesignWeights& weights, const model::RobotModel& model,
                            InputKind input);

}  // namespace upright::design
