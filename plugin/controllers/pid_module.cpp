// Built-in module `pid`: the PID cascade of design/pid.hpp with its tuned gains — a tilt PD inside
// a forward-speed PI (which gives the tilt reference), and a yaw-rate PI. The state (estimated
// from the sensors, or true) and the reference in each tick; wheel torques out, limited to what the
// drives can carry out at the wheels' speeds, balance before heading (command_limit.hpp).
// Discrete integrators at the module's rate, with anti-windup on both.
#include <algorithm>
#include <cmath>
#include <memory>
#include <sstream>
#include <string>

#include "kit/abi_model.hpp"
#include "kit/command_limit.hpp"
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
    const design::PidPoles poles = ReadPoles(&reader);
    if (auto read = reader.Finish(); !read) return Failure(read.error());
    const design::LinearModel plant =
        LinearFromAbi(context.linear_abi, context.robot_abi, design::InputKind::kTorque);
    const design::PidGains gains = design::TunePid(plant, poles, config.weights.max_tilt_deg);
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
        DriveLimits(context.robot.motor, design::InputKind::kTorque), plant.equilibrium_pitch_rad));
  }

  void Reset() {
    source_.Reset();
    tracker_.Reset();
    speed_integral_m_ = yaw_integral_rad_ = 0;
  }

  // The pole choices of the tuning rule (design::PidPoles), each key its field, defaults the
  // rule's; a set PidPoles::Validate refuses goes to the reader in the keys' terms
  // ("speed_pole_factor = 1: must be at most half of tilt_pole_factor = 1 (...)").
  static design::PidPoles ReadPoles(ConfigReader* reader) {
    design::PidPoles poles;
    reader->Number("tilt_pole_factor", NumberRule::kPositive, &poles.tilt_pole_factor);
    reader->Number("tilt_damping", NumberRule::kPositive, &poles.tilt_damping);
    reader->Number("speed_pole_factor", NumberRule::kPositive, &poles.speed_pole_factor);
    reader->Number("speed_damping", NumberRule::kPositive, &poles.speed_damping);
    reader->Number("yaw_pole_factor", NumberRule::kPositive, &poles.yaw_pole_factor);
    if (Status valid = poles.Validate(); !valid) {
      std::string why = valid.error();
      const std::string prefix = "PidPoles::";
      if (why.rfind(prefix, 0) == 0) why.erase(0, prefix.size());
      if (const auto comma = why.find(", must"); comma != std::string::npos) {
        why.replace(comma, 1, ":");
      }
      reader->Refuse(why);
    }
    return poles;
  }

  // The cascade of pid.hpp, on the speed reference as limited in acceleration:
  //   θ_ref = speed_kp e_v + speed_ki ∫e_v, e_v = v_ref − v, clamped to ±max_tilt_ref_rad;
  //   τ_sum = tilt_kp (θ − θ_ref) + tilt_kd θ̇;
  //   τ_diff = yaw_kp e_r + yaw_ki ∫e_r, e_r = r_ref − ψ̇;
  //   τ_left = (τ_sum − τ_diff) / 2, τ_right = (τ_sum + τ_diff) / 2, then limited with balance
  //   first: the common mode τ_sum / 2 kept within what the drives can carry, the differential
  //   τ_diff / 2 scaled into what is left.
  // Anti-windup by conditional integration (K. J. Åström and T. Hägglund, "Advanced PID
  // Control", ISA, 2006, the section on integrator windup; from memory): an integrator does not
  // take a step that would drive its output further into a limit it is already held at — the
  // speed integral while θ_ref is clamped or while the common mode is cut at the drives' limit in
  // the direction the step would push it, the yaw integral while the differential is cut so. The
  // commands then come from the integrals as kept.
  const char* Step(const upright_step_input& input, upright_step_output* output) {
    if (const char* why = tracker_.Follow(input.reference)) return why;
    const double v_ref = tracker_.speed_m_s(), r_ref = tracker_.yaw_rate_rad_s();
    const design::StateVector* state = nullptr;
    if (const char* why = source_.Update(input, &state)) return why;
    const design::StateVector& x = *state;
    const design::PidGains& g = gains_;
    const Eigen::Vector2d speeds = source_.WheelSpeeds(input);
    const CommandRange left = limits_.At(speeds(0)), right = limits_.At(speeds(1));
    const double e_v = v_ref - x(design::kXDot);
    const double e_r = r_ref - x(design::kYawRate);
    const double speed_step = e_v * period_s_, yaw_step = e_r * period_s_;
    Output out = Evaluate(x, e_v, e_r, speed_integral_m_ + speed_step, yaw_integral_rad_ + yaw_step,
                          left, right);
    // The sign of each step's push on its output: the speed integral raises θ_ref by
    // speed_ki · step, which moves the common mode by −tilt_kp / 2 times that; the yaw integral
    // moves the differential by yaw_ki / 2 · step.
    const double speed_push = -g.tilt_kp_Nm_per_rad * g.speed_ki_rad_per_m * speed_step;
    const double yaw_push = g.yaw_ki_Nm_per_rad * yaw_step;
    const bool speed_winds_up =
        (out.tilt_ref_clamped && g.speed_ki_rad_per_m * speed_step * out.tilt_ref_wanted > 0) ||
        Into(out.limited.common_cut, speed_push);
    const bool yaw_winds_up = Into(out.limited.differential_cut, yaw_push);
    if (!speed_winds_up) speed_integral_m_ += speed_step;
    if (!yaw_winds_up) yaw_integral_rad_ += yaw_step;
    if (speed_winds_up || yaw_winds_up) {
      out = Evaluate(x, e_v, e_r, speed_integral_m_, yaw_integral_rad_, left, right);
    }
    output->command[0] = out.limited.command(0);
    output->command[1] = out.limited.command(1);
    double* d = output->diagnostics;
    d[0] = x(design::kPitch) + equilibrium_pitch_rad_;
    d[1] = x(design::kPitchRate);
    d[2] = x(design::kXDot);
    d[3] = x(design::kYawRate);
    d[4] = out.tilt_ref;
    d[5] = speed_integral_m_;
    d[6] = yaw_integral_rad_;
    return nullptr;
  }

 private:
  PidController(const design::PidGains& gains, StateSource source, ReferenceTracker tracker,
                double period_s, const DriveLimits& limits, double equilibrium_pitch_rad)
      : gains_(gains),
        source_(std::move(source)),
        tracker_(tracker),
        period_s_(period_s),
        limits_(limits),
        equilibrium_pitch_rad_(equilibrium_pitch_rad) {}

  struct Output {
    double tilt_ref_wanted = 0, tilt_ref = 0;
    bool tilt_ref_clamped = false;
    LimitedCommand limited;
  };

  // The cascade's commands for the given integrals.
  Output Evaluate(const design::StateVector& x, double e_v, double e_r, double speed_integral_m,
                  double yaw_integral_rad, const CommandRange& left,
                  const CommandRange& right) const {
    const design::PidGains& g = gains_;
    Output out;
    out.tilt_ref_wanted = g.speed_kp_rad_per_m_s * e_v + g.speed_ki_rad_per_m * speed_integral_m;
    out.tilt_ref = std::clamp(out.tilt_ref_wanted, -g.max_tilt_ref_rad, g.max_tilt_ref_rad);
    out.tilt_ref_clamped = out.tilt_ref != out.tilt_ref_wanted;
    const double tau_sum = g.tilt_kp_Nm_per_rad * (x(design::kPitch) - out.tilt_ref) +
                           g.tilt_kd_Nm_s_per_rad * x(design::kPitchRate);
    const double tau_diff = g.yaw_kp_Nm_s_per_rad * e_r + g.yaw_ki_Nm_per_rad * yaw_integral_rad;
    out.limited = LimitWithPitchPriority(
        Eigen::Vector2d((tau_sum - tau_diff) / 2, (tau_sum + tau_diff) / 2), left, right);
    return out;
  }

  // Whether a push of sign `push` drives an output further into the limit it was cut at.
  static bool Into(int cut, double push) { return cut != 0 && cut * push > 0; }

  design::PidGains gains_;
  StateSource source_;
  ReferenceTracker tracker_;  // the speed reference, limited in acceleration
  double period_s_;
  DriveLimits limits_;
  double equilibrium_pitch_rad_;
  double speed_integral_m_ = 0;  // ∫(v_ref − v) dt
  double yaw_integral_rad_ = 0;  // ∫(r_ref − ψ̇) dt
};

}  // namespace
}  // namespace upright::controllers

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return upright::controllers::ModuleAdapter<upright::controllers::PidController>::Api();
}
