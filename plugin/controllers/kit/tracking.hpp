// Reference tracking (internal to the built-in modules): each tick's reference (forward speed,
// yaw rate) and state in; the reference limited in acceleration and integrated into position
// and heading, the error state the state-feedback modules act on, and the steady lean and inputs a
// reference motion takes, out.
#pragma once

#include <Eigen/Dense>

#include "kit/module_context.hpp"
#include "upright/controller_abi.h"
#include "upright/design/linear_model.hpp"

namespace upright::controllers {

// Follows the reference: the speed reference moves toward the one asked for at no more than a
// set acceleration (a step in speed asks for an impossible lean; ramped, it asks for about a / g),
// the yaw rate is taken as asked; both integrate into position and heading references from zero
// at the first tick.
class ReferenceTracker {
 public:
  ReferenceTracker(double period_s, double max_accel_m_s2);
  void Reset();
  // Takes this tick's reference. x_ref and ψ_ref advance by the previous tick's references over
  // one period. Returns nullptr, or a message in static storage when the reference is not finite.
  const char* Follow(const upright_reference& reference);
  // *error = [x − x_ref, ẋ − v_ref, θ, θ̇, ψ − ψ_ref, ψ̇ − r_ref] for the latest Follow.
  void Error(const design::StateVector& state, design::StateVector* error) const;
  double speed_m_s() const { return speed_m_s_; }    // v_ref, as limited
  double accel_m_s2() const { return accel_m_s2_; }  // its change over the last tick, per s
  double yaw_rate_rad_s() const { return yaw_rate_rad_s_; }
  double x_ref_m() const { return x_ref_m_; }
  double yaw_ref_rad() const { return yaw_ref_rad_; }

 private:
  double period_s_, max_step_m_s_;
  double speed_m_s_ = 0, accel_m_s2_ = 0, yaw_rate_rad_s_ = 0;
  double x_ref_m_ = 0, yaw_ref_rad_ = 0;
};

// The pitch and inputs that hold the linear robot in a steady motion — forward speed v, forward
// acceleration a, yaw rate r, pitch constant — found from ẍ = a, θ̈ = 0, ψ̈ = 0 with x_ss =
// [0, v, θ_ss, 0, 0, r]: three equations in θ_ss and the two inputs. On the torque model the
// inputs are zero at constant speed and the lean is about a / g while accelerating; the voltage
// model adds the back-EMF voltage of the speed.
class SteadyMotion {
 public:
  // The steady motions of `plant`; UPRIGHT_UNSUPPORTED when the equations have no unique solution
  // (the wheels cannot hold the robot at a lean).
  static Result<SteadyMotion, ModuleError> Of(const design::LinearModel& plant);
  void For(double speed_m_s, double accel_m_s2, double yaw_rate_rad_s, double* pitch_rad,
           Eigen::Vector2d* input) const;

 private:
  SteadyMotion() = default;

  Eigen::Matrix3d solve_;  // [θ_ss, u_L, u_R] = solve_ ([a, 0, 0] − speed_terms_ [v, r])
  Eigen::Matrix<double, 3, 2> speed_terms_;
};

}  // namespace upright::controllers
