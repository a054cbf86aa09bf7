// What the robot can do, read from its model: the tilt at which the chassis outline meets flat
// ground, and the motor current a wheel input draws on the linear model; and the design weights'
// defaults drawn from them.
#pragma once

#include <Eigen/Dense>

#include "upright/base/result.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::design {

// The tilt from the equilibrium pitch (LinearModel::equilibrium_pitch_rad, passed in) at which a
// corner of the chassis outline first touches flat ground, each way, rad. The wheels stand on the
// ground, so the axle is a wheel radius r above it, and a corner (x, z) of the outline pitched by θ
// is r + z cos θ − x sin θ above it. A way in which no corner ever reaches the ground (each closer
// to the axle than r) counts as 90° (lying flat); 0 when a corner is on or below the ground already
// at the equilibrium pitch.
struct GroundContactTilt {
  double forward_rad = 0;   // leaning forward (+ pitch)
  double backward_rad = 0;  // leaning back
  double smallest_rad() const { return forward_rad < backward_rad ? forward_rad : backward_rad; }
};
GroundContactTilt GroundContact(const model::RobotModel& model, double equilibrium_pitch_rad);

// The default acceptable tilt of the weights, as a share of the smaller ground-contact tilt.
// Bryson's maximum is a typical excursion, not a bound: on the demo robots the linear LQR loop's
// peak tilt under the design push (design_push.hpp) is 2.9–3.9 times it. A fifth keeps that peak
// within 80 % of the ground-contact tilt on both (courier 8.8° of 11.2°, tabletop 11.0–11.1° of
// 18.7°, continuous and sampled at the control rate), the rest left for what the linear model
// leaves out; a quarter leaves the courier 14 %, a third 6 %, and at a half the design push puts
// its chassis on the ground.
inline constexpr double kTiltShareOfGroundContact = 0.2;

// `weights` with the fields left to the robot filled in: max_tilt_deg = 0 becomes
// kTiltShareOfGroundContact × GroundContact(model, equilibrium_pitch_rad).smallest_rad(), in
// degrees. A field set
// (> 0) stays as it is. Fails when the outline touches the ground at the equilibrium pitch
// (there is no tilt to take a share of), naming the field to set instead.
Result<DesignWeights> WeightsForRobot(const DesignWeights& weights, const model::RobotModel& model,
                                      double equilibrium_pitch_rad);

// A wheel motor's current on the linear model, per wheel [left, right]:
// i = per_input · u + per_state · x, A. Torque input (a current-controlled drive):
// i = u / (n η K_t). Voltage input: i = (u − n K_e ω_rel) / R, with ω_rel the wheel's speed
// relative to the chassis, (ẋ ∓ d ψ̇) / r − θ̇ (DC motor equations, as the plant's motor).
struct CurrentMap {
  double per_input = 0;
  Eigen::Matrix<double, kInputs, kStates> per_state =
      Eigen::Matrix<double, kInputs, kStates>::Zero();
};
CurrentMap MotorCurrent(const model::RobotModel& model, InputKind input);

}  // namespace upright::design
