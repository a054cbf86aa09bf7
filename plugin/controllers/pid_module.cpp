// Built-in module `pid`: the PID cascade of design/pid.hpp with its tuned gains — a tilt PD inside
// a forward-speed PI (which gives the tilt reference), and a yaw-rate PI. The state (estimated
// from the sensors, or true) and the reference in each tick; wheel torques out. Discrete
// integrators at the module's rate, with anti-windup on the speed loop.
#include <algorithm>
#include <cmath>
#include <memory>
#include <sstream>

#include "kit/abi_model.hpp"
#include "kit/config.hpp"
#include "kit/module_adapter.hpp"
#include "kit/state_estimator.hpp"
#include "kit/tracking.hpp"
#include "upright/design/pid.hpp"
#include "upright/design/weights.hpp"

namespace upright::controllers {
namespace {

class PidController {
 public:
  static constexpr const char* kName = "pid";

  static Result<std::unique_ptr<PidController>, ModuleError> Create(const ModuleContext& context,
                                                                    upright_create_result* result) {
    ConfigReader reader(context.config);
    const CommonConfig config = ReadCommonConfig(&reader, context, /*voltage_allowed=*/false);
    if (auto read = reader.Finish(); !read) return Failure(read.error());
    const design::LinearModel plant =
        LinearFromAbi(context.linear_abi, context.robot_abi, design::InputKind::kTorque);
    const design::PidGains gains = design::TunePid(plant, config.weights.max_tilt_deg);
    const double all[] = {gains.tilt_kp_Nm_per_rad,   gains.tilt_kd_Nm_s_per_rad,
                          gains.speed_kp_rad_per_m_s, gains.speed_ki_rad_per_m,
                          gains.yaw_kp_Nm_s_per_rad,  gains.yaw_ki_Nm_per_rad};
    for (double g : all) {
      if (!std::isfinite(g)) {
        return Failure(ModuleError{UPRIGHT_UNSUPPORTED,
                                   "PID tuning gave a non-finite gain (is the robot's upright "
                                   "unstable and its pitch controllable from the wheels?)"});
      }
    }
    if (auto declared =
            Declare(design::InputKind::kTorque,
                    {"pitch_est_rad", "pitch_rate_est_rad_s", "speed_est_m_s", "yaw_rate_est_rad_s",
                     "tilt_ref_rad", "speed_integral_m", "yaw_integral_rad"},
                    result);
        !declared) {
      return Failure(declared.error());
    }
    std::ostringstream log;
    log << "pid: tilt kp " << gains.tilt_kp_Nm_per_rad << " kd " << gains.tilt_kd_Nm_s_per_rad
        << ", speed kp " << gains.speed_kp_rad_per_m_s << " ki " << gains.speed_ki_rad_per_m
        << ", yaw kp " << gains.yaw_kp_Nm_s_per_rad << " ki " << gains.yaw_ki_Nm_per_rad;
    context.Log(UPRIGHT_LOG_DEBUG, log.str());
    const EstimatorSettings estimator = SettingsFor(context, config, plant);
    return std::unique_ptr<PidController>(new PidController(
        gains, StateSource(config.state, estimator),
        ReferenceTracker(context.period_s, config.max_accel_m_s2), context.period_s,
        design::InputLimit(context.robot, design::InputKind::kTorque),
        plant.equilibrium_pitch_rad));
  }

  void Reset() {
    source_.Reset();
    tracker_.Reset();
    speed_integral_m_ = yaw_integral_rad_ = 0;
  }

  // The cascade of pid.hpp, on the speed reference as limited in acceleration:
  //   θ_ref = speed_kp e_v + speed_ki ∫e_v, e_v = v_ref − v, clamped to ±max_tilt_ref_rad;
  //   τ_sum = tilt_kp (θ − θ_ref) + tilt_kd θ̇;
  //   τ_diff = yaw_kp e_r + yaw_ki ∫e_r, e_r = r_ref − ψ̇;
  //   τ_left = (τ_sum − τ_diff) / 2, τ_right = (τ_sum + τ_diff) / 2.
  // Anti-windup by conditional integration: while θ_ref is clamped, the speed integral does not
  // take a step that would drive it further into the clamp.
  const char* Step(const upright_step_input& input, upright_step_output* output) {
    if (const char* why = tracker_.Follow(input.reference)) return why;
    const double v_ref = tracker_.speed_m_s(), r_ref = tracker_.yaw_rate_rad_s();
    const design::StateVector* state = nullptr;
    if (const char* why = source_.Update(input, &state)) return why;
    const design::StateVector& x = *state;
    const design::PidGains& g = gains_;
    const double e_v = v_ref - x(design::kXDot);
    const double next_integral = speed_integral_m_ + e_v * period_s_;
    const double wanted = g.speed_kp_rad_per_m_s * e_v + g.speed_ki_rad_per_m * next_integral;
    const double tilt_ref = std::clamp(wanted, -g.max_tilt_ref_rad, g.max_tilt_ref_rad);
    const bool winding_up = tilt_ref != wanted && g.speed_ki_rad_per_m * e_v * wanted > 0;
    if (!winding_up) speed_integral_m_ = next_integral;
    const double tau_sum = g.tilt_kp_Nm_per_rad * (x(design::kPitch) - tilt_ref) +
                           g.tilt_kd_Nm_s_per_rad * x(design::kPitchRate);
    const double e_r = r_ref - x(design::kYawRate);
    yaw_integral_rad_ += e_r * period_s_;
    const double tau_diff = g.yaw_kp_Nm_s_per_rad * e_r + g.yaw_ki_Nm_per_rad * yaw_integral_rad_;
    const Eigen::Vector2d command =
        Clamped(Eigen::Vector2d((tau_sum - tau_diff) / 2, (tau_sum + tau_diff) / 2), limit_Nm_);
    output->command[0] = command(0);
    output->command[1] = command(1);
    double* d = output->diagnostics;
    d[0] = x(design::kPitch) + equilibrium_pitch_rad_;
    d[1] = x(design::kPitchRate);
    d[2] = x(design::kXDot);
    d[3] = x(design::kYawRate);
    d[4] = tilt_ref;
    d[5] = speed_integral_m_;
    d[6] = yaw_integral_rad_;
    return nullptr;
  }

 private:
  PidController(const design::PidGains& gains, StateSource source, ReferenceTracker tracker,
                double period_s, double limit_Nm, double equilibrium_pitch_rad)
      : gains_(gains),
        source_(std::move(source)),
        tracker_(tracker),
        period_s_(period_s),
        limit_Nm_(limit_Nm),
        equilibrium_pitch_rad_(equilibrium_pitch_rad) {}

  design::PidGains gains_;
  StateSource source_;
  ReferenceTracker tracker_;  // the speed reference, limited in acceleration
  double period_s_, limit_Nm_, equilibrium_pitch_rad_;
  double speed_integral_m_ = 0;  // ∫(v_ref − v) dt
  double yaw_integral_rad_ = 0;  // ∫(r_ref − ψ̇) dt
};

}  // namespace
}  // namespace upright::controllers

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return upright::controllers::ModuleAdapter<upright::controllers::PidController>::Api();
}
