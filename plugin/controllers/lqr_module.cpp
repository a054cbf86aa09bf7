// Built-in module `lqr`: discrete LQR state feedback. The state (estimated from the sensors, or
// true) and the reference in each tick; wheel commands u = u_ss − K e out, K designed at create
// for the module's own rate (zero-order hold) from the design weights. With
// `latency_compensation = true` the design is on the plant delayed by the sensors' latency
// (design::RobotDelayedLqr) and the law also feeds back the module's own past commands.
#include <memory>
#include <sstream>

#include "kit/abi_model.hpp"
#include "kit/config.hpp"
#include "kit/module_adapter.hpp"
#include "kit/state_estimator.hpp"
#include "kit/state_feedback.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"

namespace upright::controllers {
namespace {

class LqrController {
 public:
  static constexpr const char* kName = "lqr";

  static Result<std::unique_ptr<LqrController>, ModuleError> Create(const ModuleContext& context,
                                                                    upright_create_result* result) {
    ConfigReader reader(context.config);
    const CommonConfig config = ReadCommonConfig(&reader, context, /*voltage_allowed=*/true);
    int compensation = 0;
    reader.Choice("latency_compensation", {"false", "true"}, &compensation);
    if (auto read = reader.Finish(); !read) return Failure(read.error());
    const design::LinearModel plant =
        LinearFromAbi(context.linear_abi, context.robot_abi, config.input);
    Eigen::MatrixXd past_gain;  // empty: the plain discrete LQR
    const Result<design::Gain, ModuleError> gain = [&]() -> Result<design::Gain, ModuleError> {
      if (compensation == 0) return DiscreteLqrFor(context, config, plant);
      const Result<Eigen::MatrixXd, ModuleError> delayed = DelayedLqrFor(context, config, plant);
      if (!delayed) return Failure(delayed.error());
      past_gain = delayed->rightCols(delayed->cols() - design::kStates);
      return design::Gain(delayed->leftCols(design::kStates));
    }();
    if (!gain) return Failure(gain.error());
    if (auto declared = Declare(config.input, StateFeedbackLaw::DiagnosticNames(), result);
        !declared) {
      return Failure(declared.error());
    }
    std::ostringstream log;
    log << "lqr: discrete LQR at " << context.rate_hz << " Hz, K =\n" << *gain;
    if (past_gain.size() > 0)
      log << "\non the past commands, each wheel's oldest first:\n" << past_gain;
    context.Log(UPRIGHT_LOG_DEBUG, log.str());
    const EstimatorSettings estimator = SettingsFor(context, config, plant);
    Result<StateFeedbackLaw, ModuleError> law =
        StateFeedbackLaw::For(plant, *gain, DriveLimits(context.robot.motor, config.input),
                              ReferenceTracker(context.period_s, config.max_accel_m_s2), past_gain);
    if (!law) return Failure(law.error());
    return std::unique_ptr<LqrController>(
        new LqrController(StateSource(config.state, estimator), std::move(*law)));
  }

  void Reset() {
    source_.Reset();
    law_.Reset();
  }

  const char* Step(const upright_step_input& input, upright_step_output* output) {
    const design::StateVector* state = nullptr;
    if (const char* why = source_.Update(input, &state)) return why;
    return law_.Step(input.reference, *state, source_.WheelSpeeds(input), output);
  }

 private:
  LqrController(StateSource source, StateFeedbackLaw law)
      : source_(std::move(source)), law_(std::move(law)) {}

  StateSource source_;
  StateFeedbackLaw law_;
};

}  // namespace
}  // namespace upright::controllers

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return upright::controllers::ModuleAdapter<upright::controllers::LqrController>::Api();
}
