#include "kit/state_feedback.hpp"

#include <utility>

#include "upright/design/weights.hpp"

namespace upright::controllers {

Result<design::Gain, ModuleError> DiscreteLqrFor(const ModuleContext& context,
                                                 const CommonConfig& config,
                                                 const design::LinearModel& plant) {
  const Result<Eigen::MatrixXd, design::SolveError> lqr = design::RobotDiscreteLqr(
      plant, design::StateWeight(config.weights),
      design::InputWeight(config.weights, context.robot, config.input), context.period_s);
  if (!lqr) {
    return Failure(
        ModuleError{UPRIGHT_UNSUPPORTED, "discrete LQR design failed: " + lqr.error().message});
  }
  return design::Gain(*lqr);
}

const std::vector<const char*>& StateFeedbackLaw::DiagnosticNames() {
  static const std::vector<const char*> kNames = {"pitch_est_rad", "pitch_rate_est_rad_s",
                                                  "x_est_m",       "speed_est_m_s",
                                                  "yaw_est_rad",   "x_error_m"};
  return kNames;
}

Result<StateFeedbackLaw, ModuleError> StateFeedbackLaw::For(const design::LinearModel& plant,
                                                            const design::Gain& gain,
                                                            const DriveLimits& limits,
                                                            const ReferenceTracker& tracker) {
  Result<SteadyMotion, ModuleError> steady = SteadyMotion::Of(plant);
  if (!steady) return Failure(std::move(steady.error()));
  return StateFeedbackLaw(plant, gain, *steady, limits, tracker);
}

StateFeedbackLaw::StateFeedbackLaw(const design::LinearModel& plant, const design::Gain& gain,
                                   const SteadyMotion& steady, const DriveLimits& limits,
                                   const ReferenceTracker& tracker)
    : gain_(gain),
      steady_(steady),
      limits_(limits),
      equilibrium_pitch_rad_(plant.equilibrium_pitch_rad),
      tracker_(tracker) {}

void StateFeedbackLaw::Reset() {
  tracker_.Reset();
  error_.setZero();
  command_.setZero();
}

const char* StateFeedbackLaw::Step(const upright_reference& reference,
                                   const design::StateVector& state,
                                   const Eigen::Vector2d& wheel_speeds_rad_s,
                                   upright_step_output* output) {
  if (const char* why = tracker_.Follow(reference)) return why;
  double lean_rad = 0;
  Eigen::Vector2d steady_input;
  steady_.For(tracker_.speed_m_s(), tracker_.accel_m_s2(), tracker_.yaw_rate_rad_s(), &lean_rad,
              &steady_input);
  tracker_.Error(state, &error_);
  error_(design::kPitch) -= lean_rad;
  command_ =
      LimitWithPitchPriority(steady_input - gain_ * error_, limits_.At(wheel_speeds_rad_s(0)),
                             limits_.At(wheel_speeds_rad_s(1)))
          .command;
  output->command[0] = command_(0);
  output->command[1] = command_(1);
  double* d = output->diagnostics;
  d[0] = state(design::kPitch) + equilibrium_pitch_rad_;
  d[1] = state(design::kPitchRate);
  d[2] = state(design::kX);
  d[3] = state(design::kXDot);
  d[4] = state(design::kYaw);
  d[5] = error_(design::kX);
  return nullptr;
}

}  // namespace upright::controllers
