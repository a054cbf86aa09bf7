#include "kit/state_feedback.hpp"

#include <utility>

#include "upright/design/delay_augmented.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/check.hpp"

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

Result<Eigen::MatrixXd, ModuleError> DelayedLqrFor(const ModuleContext& context,
                                                   const CommonConfig& config,
                                                   const design::LinearModel& plant) {
  const Result<Eigen::MatrixXd, design::SolveError> lqr =
      design::RobotDelayedLqr(plant, design::StateWeight(config.weights),
                              design::InputWeight(config.weights, context.robot, config.input),
                              context.period_s, context.robot.sensors.latency_s);
  if (!lqr) {
    return Failure(ModuleError{UPRIGHT_UNSUPPORTED,
                               "delay-compensated LQR design failed: " + lqr.error().message});
  }
  return *lqr;
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
                                                            const ReferenceTracker& tracker,
                                                            const Eigen::MatrixXd& past_gain) {
  Result<SteadyMotion, ModuleError> steady = SteadyMotion::Of(plant);
  if (!steady) return Failure(std::move(steady.error()));
  UPRIGHT_CHECK(past_gain.size() == 0 || (past_gain.rows() == design::kInputs &&
                                          past_gain.cols() % design::kInputs == 0),
                "past-command gain is %dx%d", static_cast<int>(past_gain.rows()),
                static_cast<int>(past_gain.cols()));
  return StateFeedbackLaw(plant, gain, *steady, limits, tracker, past_gain);
}

StateFeedbackLaw::StateFeedbackLaw(const design::LinearModel& plant, const design::Gain& gain,
                                   const SteadyMotion& steady, const DriveLimits& limits,
                                   const ReferenceTracker& tracker,
                                   const Eigen::MatrixXd& past_gain)
    : gain_(gain),
      steady_(steady),
      limits_(limits),
      equilibrium_pitch_rad_(plant.equilibrium_pitch_rad),
      tracker_(tracker),
      past_gain_(past_gain.size() > 0 ? past_gain : Eigen::MatrixXd::Zero(design::kInputs, 0)),
      memory_(static_cast<int>(past_gain_.cols()) / design::kInputs),
      past_(Eigen::VectorXd::Zero(past_gain_.cols())),
      past_error_(Eigen::VectorXd::Zero(past_gain_.cols())) {}

void StateFeedbackLaw::Reset() {
  tracker_.Reset();
  error_.setZero();
  command_.setZero();
  past_.setZero();
}

Eigen::Vector2d StateFeedbackLaw::PastCorrection(const Eigen::Vector2d& steady_input) const {
  Eigen::Vector2d correction = Eigen::Vector2d::Zero();
  if (memory_ == 0) return correction;
  for (int j = 0; j < design::kInputs; ++j) {
    past_error_.segment(j * memory_, memory_) =
        past_.segment(j * memory_, memory_).array() - steady_input(j);
  }
  correction.noalias() = past_gain_ * past_error_;  // into the fixed-size vector: no temporary
  return -correction;
}

void StateFeedbackLaw::Remember(const Eigen::Vector2d& command) {
  for (int j = 0; j < design::kInputs; ++j) {
    // Oldest first: each value moves one place towards the start, the newest goes last.
    for (int i = j * memory_; i + 1 < (j + 1) * memory_; ++i) past_(i) = past_(i + 1);
    if (memory_ > 0) past_((j + 1) * memory_ - 1) = command(j);
  }
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
  Eigen::Vector2d wanted = steady_input - gain_ * error_;
  if (memory_ > 0) wanted += PastCorrection(steady_input);
  command_ = LimitWithPitchPriority(wanted, limits_.At(wheel_speeds_rad_s(0)),
                                    limits_.At(wheel_speeds_rad_s(1)))
                 .command;
  Remember(command_);
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
