// Built-in module `hinf`: H-infinity state feedback against a push. The state (estimated from the
// sensors, or true) and the reference in each tick; wheel commands u = u_ss − K e out, K the
// central discrete-time H-infinity gain at the module's own rate (zero-order hold, the push held
// over each period like the input; design::RobotDiscreteHinf), designed at create at
// γ = factor × γ_opt, where γ_opt is the discrete problem's at that rate, not the continuous
// one's, and the factor the design-push rule's (design::ChooseGamma on this discrete design, as
// `upright design` chooses it), or the `gamma_factor` given; or at the `gamma` given.
#include <memory>
#include <sstream>

#include "kit/abi_model.hpp"
#include "kit/config.hpp"
#include "kit/module_adapter.hpp"
#include "kit/state_estimator.hpp"
#include "kit/state_feedback.hpp"
#include "upright/design/discrete_hinf.hpp"
#include "upright/design/gamma_choice.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/conventions.hpp"

namespace upright::controllers {
namespace {

class HinfController {
 public:
  static constexpr const char* kName = "hinf";

  static Result<std::unique_ptr<HinfController>, ModuleError> Create(
      const ModuleContext& context, upright_create_result* result) {
    ConfigReader reader(context.config);
    const CommonConfig config = ReadCommonConfig(&reader, context, /*voltage_allowed=*/true);
    double gamma = 0;
    double gamma_factor = 0;  // 0: the rule's factor, as `upright design` chooses it
    reader.Number("gamma", NumberRule::kPositive, &gamma);
    reader.Number("gamma_factor", NumberRule::kAboveOne, &gamma_factor);
    if (reader.Has("gamma") && reader.Has("gamma_factor")) {
      reader.Refuse("gamma and gamma_factor: give one of them, not both");
    }
    if (auto read = reader.Finish(); !read) return Failure(read.error());
    const design::LinearModel plant =
        LinearFromAbi(context.linear_abi, context.robot_abi, config.input);
    const design::StateMatrix Q = design::StateWeight(config.weights);
    const Eigen::Matrix2d R = design::InputWeight(config.weights, context.robot, config.input);
    // The disturbance w = 1 is a push of 10 % of the robot's weight, as in `upright design`.
    const double push_scale_N = 0.1 * TotalMass(context.robot_abi) * model::kStandardGravity_m_s2;
    const Result<design::GammaSearch, design::SolveError> search =
        design::RobotDiscreteOptimalGamma(plant, Q, R, push_scale_N, context.period_s);
    if (!search) {
      return Failure(ModuleError{UPRIGHT_UNSUPPORTED,
                                 "H-infinity gamma search failed: " + search.error().message});
    }
    if (gamma == 0 && gamma_factor > 0) {
      gamma = gamma_factor * search->gamma_opt;
    } else if (gamma == 0) {
      const Result<design::GammaChoice> choice =
          design::ChooseGamma(plant, design::Performance{Q, R, push_scale_N}, search->gamma_opt,
                              context.robot, context.period_s);
      if (!choice) {
        return Failure(ModuleError{UPRIGHT_UNSUPPORTED, "H-infinity " + choice.error()});
      }
      gamma = choice->gamma;
    } else if (!(gamma > search->gamma_opt)) {
      std::ostringstream why;
      why << "gamma = " << gamma << ": must be > gamma_opt = " << search->gamma_opt
          << " for this robot, these weights and the rate " << context.rate_hz << " Hz";
      return Failure(ModuleError{UPRIGHT_BAD_CONFIG, why.str()});
    }
    // The design includes the hold but not the sensors' latency or the state estimator, as
    // `upright design`'s sampled loop does not.
    const Result<Eigen::MatrixXd, design::SolveError> hinf =
        design::RobotDiscreteHinf(plant, Q, R, push_scale_N, gamma, context.period_s);
    if (!hinf) {
      std::ostringstream why;
      why << "H-infinity design at gamma = " << gamma << " failed: " << hinf.error().message;
      return Failure(ModuleError{UPRIGHT_UNSUPPORTED, why.str()});
    }
    std::vector<const char*> diagnostics = StateFeedbackLaw::DiagnosticNames();
    diagnostics.push_back("gamma");
    if (auto declared = Declare(config.input, diagnostics, result); !declared) {
      return Failure(declared.error());
    }
    std::ostringstream log;
    log << "hinf: discrete H-infinity at " << context.rate_hz << " Hz, gamma = " << gamma
        << " (gamma_opt = " << search->gamma_opt << "), K =\n"
        << *hinf;
    context.Log(UPRIGHT_LOG_DEBUG, log.str());
    const EstimatorSettings estimator = SettingsFor(context, config, plant);
    Result<StateFeedbackLaw, ModuleError> law =
        StateFeedbackLaw::For(plant, *hinf, DriveLimits(context.robot.motor, config.input),
                              ReferenceTracker(context.period_s, config.max_accel_m_s2));
    if (!law) return Failure(law.error());
    return std::unique_ptr<HinfController>(
        new HinfController(StateSource(config.state, estimator), std::move(*law), gamma));
  }

  void Reset() {
    source_.Reset();
    law_.Reset();
  }

  const char* Step(const upright_step_input& input, upright_step_output* output) {
    const design::StateVector* state = nullptr;
    if (const char* why = source_.Update(input, &state)) return why;
    const Eigen::Vector2d wheel_speeds = source_.WheelSpeeds(input);
    if (const char* why = law_.Step(input.reference, *state, wheel_speeds, output)) return why;
    output->diagnostics[gamma_slot_] = gamma_;
    return nullptr;
  }

 private:
  HinfController(StateSource source, StateFeedbackLaw law, double gamma)
      : source_(std::move(source)), law_(std::move(law)), gamma_(gamma) {}

  // The gamma diagnostic follows the state-feedback ones.
  const std::size_t gamma_slot_ = StateFeedbackLaw::DiagnosticNames().size();

  StateSource source_;
  StateFeedbackLaw law_;
  double gamma_;
};

}  // namespace
}  // namespace upright::controllers

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return upright::controllers::ModuleAdapter<upright::controllers::HinfController>::Api();
}
