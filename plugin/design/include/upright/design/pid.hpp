// PID defaults for a balancing robot, tuned from the linear model: a tilt loop (PD on pitch)
// inside a speed loop (PI on forward speed, giving the tilt reference), and a yaw-rate loop (PI,
// giving the wheel torque difference). The tuning rule (pole placement of the planar loop at a
// tilt pair and a speed pair) is documented in pid.cpp.
#pragma once

#include "upright/design/closed_loop.hpp"
#include "upright/design/linear_model.hpp"

namespace upright::design {

// Per-wheel torque (N·m) from the two loops:
//   θ_ref = speed_kp (v_ref − v) + speed_ki ∫(v_ref − v) dt, clamped to ±max_tilt_ref_rad
//   τ_sum = tilt_kp (θ − θ_ref) + tilt_kd θ̇              (both wheels together)
//   τ_diff = yaw_kp (r_ref − ψ̇) + yaw_ki ∫(r_ref − ψ̇) dt   (right minus left)
//   τ_left = (τ_sum − τ_diff) / 2, τ_right = (τ_sum + τ_diff) / 2
struct PidGains {
  double tilt_kp_Nm_per_rad = 0;
  double tilt_kd_Nm_s_per_rad = 0;
  double speed_kp_rad_per_m_s = 0;
  double speed_ki_rad_per_m = 0;
  double yaw_kp_Nm_s_per_rad = 0;
  double yaw_ki_Nm_per_rad = 0;
  double max_tilt_ref_rad = 0;
  // The natural frequencies the rule places, for the report: the tilt and speed pairs', and the
  // yaw loop's proportional crossover ω_y (its closed loop is a double pole at −ω_y/2).
  double tilt_bandwidth_rad_s = 0, speed_bandwidth_rad_s = 0, yaw_bandwidth_rad_s = 0;
};

// Requires a torque-input linear model.
PidGains TunePid(const LinearModel& torque_plant, double max_tilt_deg);

// The cascade as a linear controller (integrators as its states; the tilt-reference clamp
// ignored) measuring [θ, θ̇, ẋ, ψ̇] from the true state, for closed-loop analysis.
void PidAsLinearController(const PidGains& gains, Measurement* measurement,
                           LinearController* controller);

}  // namespace upright::design
