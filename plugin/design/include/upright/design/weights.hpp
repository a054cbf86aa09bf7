// Design weights: how much drift, tilt, yaw and wheel effort the engineer will accept, turned into
// LQR / H-infinity weighting matrices by Bryson's rule (each term divided by its largest
// acceptable value squared). Defaults suit a balancing robot at walking pace.
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
  double max_tilt_deg = 3;            // pitch from the equilibrium
  double max_tilt_rate_deg_s = 30;    // pitch rate
  double max_yaw_deg = 20;            // heading error
  double max_yaw_rate_deg_s = 45;     // yaw-rate error
  double max_input_fraction = 0.3;    // of the per-wheel input limit (InputLimit), in (0, 1]
  // The broken rule ("DesignWeights::max_tilt_deg = 0, must be > 0"); success when there is none.
  Status Validate() const;
};

// The largest per-wheel input: the stall torque at the wheel, n η K_t min(V_supply / R, I_max),
// in N·m, or the supply voltage in V.
double InputLimit(const model::RobotModel& model, InputKind input);

// Bryson's rule: Q = diag(1 / max²) over the states, R = diag(1 / (fraction · limit)²).
StateMatrix StateWeight(const DesignWeights& weights);
Eigen::Matrix2d InputWeight(const DesignWeights& weights, const model::RobotModel& model,
                            InputKind input);

}  // namespace upright::design
