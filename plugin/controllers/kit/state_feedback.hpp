// State-feedback law (internal to the built-in modules): each tick's state (estimated or true)
// and reference in; the wheel commands u = u_ss − K e on the error from the steady motion the
// reference asks for (integrated position and heading, speed, yaw rate, and the lean its
// acceleration takes), limited to what the drives can carry out at the wheels' speeds, balance
// before heading (command_limit.hpp), and the diagnostics every state-feedback module reports,
// out.
#pragma once

#include <vector>

#include "kit/command_limit.hpp"
#include "kit/config.hpp"
#include "kit/module_context.hpp"
#include "kit/tracking.hpp"
#include "upright/controller_abi.h"
#include "upright/design/linear_model.hpp"
#include "upright/design/synthesis.hpp"

namespace upright::controllers {

// The discrete LQR gain at the module's rate (zero-order hold) from the configured weights, for
// `plant`'s input kind; UPRIGHT_UNSUPPORTED when the design fails.
Result<design::Gain, ModuleError> DiscreteLqrFor(const ModuleContext& context,
                                                 const CommonConfig& config,
                                                 const design::LinearModel& plant);

// The discrete LQR on the plant delayed by the sensors' latency (design::RobotDelayedLqr): its
// gain on the state and then on the module's own past commands; UPRIGHT_UNSUPPORTED when the
// design fails.
Result<Eigen::MatrixXd, ModuleError> DelayedLqrFor(const ModuleContext& context,
                                                   const CommonConfig& config,
                                                   const design::LinearModel& plant);

class StateFeedbackLaw {
 public:
  // The diagnostics Step writes, in order, into the first slots of the output.
  static const std::vector<const char*>& DiagnosticNames();

  // `gain`: u = −K e, for `plant`'s input kind; `limits` the drive's, of that kind; `tracker`
  // as configured, at its reset state. `past_gain` (2 × 2·memory, or empty): the gain on the
  // law's own past commands, each wheel's oldest first (design::RobotDelayedLqr's last columns),
  // u = −K e − K_past (u_past − u_ss). UPRIGHT_UNSUPPORTED when `plant` cannot hold a steady
  // motion (SteadyMotion::Of).
  static Result<StateFeedbackLaw, ModuleError> For(const design::LinearModel& plant,
                                                   const design::Gain& gain,
                                                   const DriveLimits& limits,
                                                   const ReferenceTracker& tracker,
                                                   const Eigen::MatrixXd& past_gain = {});
  void Reset();
  // Writes the commands and the diagnostics; nullptr, or a message in static storage.
  // `wheel_speeds_rad_s`: each wheel's speed relative to the chassis, for the drive's limits.
  const char* Step(const upright_reference& reference, const design::StateVector& state,
                   const Eigen::Vector2d& wheel_speeds_rad_s, upright_step_output* output);
  // The commands of the latest Step (zero before the first).
  const Eigen::Vector2d& command() const { return command_; }

 private:
  StateFeedbackLaw(const design::LinearModel& plant, const design::Gain& gain,
                   const SteadyMotion& steady, const DriveLimits& limits,
                   const ReferenceTracker& tracker, const Eigen::MatrixXd& past_gain);
  // −K_past (u_past − u_ss) from the stored commands, then the stored commands aged by one
  // with `command` the newest. Allocates nothing.
  Eigen::Vector2d PastCorrection(const Eigen::Vector2d& steady_input) const;
  void Remember(const Eigen::Vector2d& command);

  design::Gain gain_;
  SteadyMotion steady_;
  DriveLimits limits_;
  double equilibrium_pitch_rad_;
  ReferenceTracker tracker_;
  design::StateVector error_ = design::StateVector::Zero();
  Eigen::Vector2d command_ = Eigen::Vector2d::Zero();
  Eigen::MatrixXd past_gain_;           // 2 × 2·memory_
  int memory_ = 0;                      // past commands kept per wheel
  Eigen::VectorXd past_;                // the commands, wheel by wheel, oldest first
  mutable Eigen::VectorXd past_error_;  // past_ − u_ss, space for PastCorrection
};

}  // namespace upright::controllers
