// Built-in module `lqg`: the discrete LQR regulator on a steady-state discrete Kalman filter's
// estimate. The sensor sample (mean encoder angle, gyro pitch rate, encoder heading, gyro yaw
// rate, accelerometer tilt) and the reference in each tick; wheel commands u = u_ss − K x̂ (on
// the error from the integrated reference) out. With `state = true` the filter is bypassed and
// the regulator acts on the true state.
#include <cmath>
#include <memory>
#include <sstream>

#include "kit/abi_model.hpp"
#include "kit/config.hpp"
#include "kit/module_adapter.hpp"
#include "kit/state_estimator.hpp"
#include "kit/state_feedback.hpp"
#include "upright/design/lqg_filter.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/conventions.hpp"

namespace upright::controllers {
namespace {

using design::kInputs;
using design::kStates;
constexpr int kMeasurements = design::SensorLinearisation::kMeasurements;
constexpr int kAccelRow = design::SensorLinearisation::kAccelRow;
using MeasurementVector = Eigen::Matrix<double, kMeasurements, 1>;

// The filter at the module's rate (design::DesignLqgFilter, the one `upright design` analyses):
// x⁺ = Ad x + Bd u (+ noise), y = C x + D u (+ noise), and its steady-state update gain L.
struct Filter {
  Eigen::Matrix<double, kStates, kStates> Ad;
  Eigen::Matrix<double, kStates, kInputs> Bd;
  Eigen::Matrix<double, kMeasurements, kStates> C;
  Eigen::Matrix<double, kMeasurements, kInputs> D;
  Eigen::Matrix<double, kStates, kMeasurements> L;
};

Result<Filter, ModuleError> DesignFilter(const ModuleContext& context,
                                         const design::LinearModel& plant) {
  const design::LinearModel torque_plant =
      LinearFromAbi(context.linear_abi, context.robot_abi, design::InputKind::kTorque);
  const Result<design::LqgFilter, design::SolveError> designed =
      design::DesignLqgFilter(context.robot, plant, torque_plant,
                              design::DefaultFilterNoise(context.robot, plant), context.period_s);
  if (!designed) {
    return Failure(ModuleError{UPRIGHT_UNSUPPORTED,
                               "discrete Kalman design failed: " + designed.error().message});
  }
  Filter f;
  f.Ad = designed->Ad;
  f.Bd = designed->Bd;
  f.C = designed->sensors.C;
  f.D = designed->sensors.D;
  f.L = designed->L_discrete;
  return f;
}

class LqgController {
 public:
  static constexpr const char* kName = "lqg";

  static Result<std::unique_ptr<LqgController>, ModuleError> Create(const ModuleContext& context,
                                                                    upright_create_result* result) {
    ConfigReader reader(context.config);
    const CommonConfig config = ReadCommonConfig(&reader, context, /*voltage_allowed=*/true);
    if (auto read = reader.Finish(); !read) return Failure(read.error());
    const design::LinearModel plant =
        LinearFromAbi(context.linear_abi, context.robot_abi, config.input);
    const Result<design::Gain, ModuleError> gain = DiscreteLqrFor(context, config, plant);
    if (!gain) return Failure(gain.error());
    const Result<Filter, ModuleError> filter = DesignFilter(context, plant);
    if (!filter) return Failure(filter.error());
    std::vector<const char*> diagnostics = StateFeedbackLaw::DiagnosticNames();
    diagnostics.push_back("accel_innovation");
    if (auto declared = Declare(config.input, diagnostics, result); !declared) {
      return Failure(declared.error());
    }
    std::ostringstream log;
    log << "lqg: discrete LQR and Kalman filter at " << context.rate_hz << " Hz, K =\n"
        << *gain << "\nL =\n"
        << filter->L;
    context.Log(UPRIGHT_LOG_DEBUG, log.str());
    const EstimatorSettings estimator = SettingsFor(context, config, plant);
    Result<StateFeedbackLaw, ModuleError> law =
        StateFeedbackLaw::For(plant, *gain, DriveLimits(context.robot.motor, config.input),
                              ReferenceTracker(context.period_s, config.max_accel_m_s2));
    if (!law) return Failure(law.error());
    return std::unique_ptr<LqgController>(
        new LqgController(config.state, context.robot, plant.equilibrium_pitch_rad, *filter,
                          StateSource(config.state, estimator), std::move(*law)));
  }

  void Reset() {
    truth_.Reset();
    law_.Reset();
    started_ = false;
    estimate_.setZero();
    innovation_.setZero();
  }

  const char* Step(const upright_step_input& input, upright_step_output* output) {
    const design::StateVector* state = &estimate_;
    if (state_choice_ == StateChoice::kTrue) {
      if (const char* why = truth_.Update(input, &state)) return why;
    } else {
      Estimate(input.sensors);
    }
    const Eigen::Vector2d wheel_speeds = truth_.WheelSpeeds(input);
    if (const char* why = law_.Step(input.reference, *state, wheel_speeds, output)) return why;
    output->diagnostics[diagnostic_slot_] = innovation_(kAccelRow);
    return nullptr;
  }

 private:
  LqgController(StateChoice state_choice, const model::RobotModel& robot,
                double equilibrium_pitch_rad, const Filter& filter, StateSource truth,
                StateFeedbackLaw law)
      : state_choice_(state_choice),
        wheel_radius_m_(robot.wheel.radius_m),
        track_m_(robot.wheel.track_m),
        equilibrium_pitch_rad_(equilibrium_pitch_rad),
        filter_(filter),
        truth_(std::move(truth)),
        law_(std::move(law)) {}

  // LineariseSensors' measurements: the mean encoder angle (from the origin set at the first
  // sample), gyro y, the encoder heading (likewise), gyro z, and f_x / g about the equilibrium
  // pitch (f_x = −g sin θ standing still).
  MeasurementVector Measure(const upright_sensor_sample& s) const {
    const double mean_angle =
        (s.encoder_angle_rad[model::kLeft] + s.encoder_angle_rad[model::kRight]) / 2;
    MeasurementVector y;
    y << mean_angle - angle_origin_rad_, s.gyro_rad_s[1], Heading(s) - heading_origin_rad_,
        s.gyro_rad_s[2],
        s.accel_m_s2[0] / model::kStandardGravity_m_s2 + std::sin(equilibrium_pitch_rad_);
    return y;
  }

  double Heading(const upright_sensor_sample& s) const {
    return wheel_radius_m_ *
           (s.encoder_angle_rad[model::kRight] - s.encoder_angle_rad[model::kLeft]) / track_m_;
  }

  // The first sample starts the estimate (pitch from the accelerometer, rates from the gyro and
  // encoders, x and ψ at zero); each later one predicts with the command held since the
  // last tick, x̂⁻ = Ad x̂ + Bd u, and updates, x̂ = x̂⁻ + L (y − C x̂⁻ − D u).
  void Estimate(const upright_sensor_sample& s) {
    const Eigen::Vector2d& u = law_.command();
    if (!started_) {
      started_ = true;
      const double pitch = AccelerometerPitch(s.accel_m_s2) - equilibrium_pitch_rad_;
      angle_origin_rad_ =
          (s.encoder_angle_rad[model::kLeft] + s.encoder_angle_rad[model::kRight]) / 2 + pitch;
      heading_origin_rad_ = Heading(s);
      const double mean_rate =
          (s.encoder_rate_rad_s[model::kLeft] + s.encoder_rate_rad_s[model::kRight]) / 2;
      estimate_ << 0, wheel_radius_m_ * (mean_rate + s.gyro_rad_s[1]), pitch, s.gyro_rad_s[1], 0,
          s.gyro_rad_s[2];
      innovation_.setZero();
    } else {
      const design::StateVector prior = filter_.Ad * estimate_ + filter_.Bd * u;
      innovation_ = Measure(s) - filter_.C * prior - filter_.D * u;
      estimate_ = prior + filter_.L * innovation_;
    }
  }

  StateChoice state_choice_;
  double wheel_radius_m_, track_m_, equilibrium_pitch_rad_;
  Filter filter_;
  StateSource truth_;  // the true state with state = true; the wheels' speeds either way
  StateFeedbackLaw law_;
  // The accelerometer innovation follows the state-feedback diagnostics.
  const std::size_t diagnostic_slot_ = StateFeedbackLaw::DiagnosticNames().size();
  bool started_ = false;
  double angle_origin_rad_ = 0, heading_origin_rad_ = 0;
  design::StateVector estimate_ = design::StateVector::Zero();
  MeasurementVector innovation_ = MeasurementVector::Zero();
};

}  // namespace
}  // namespace upright::controllers

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return upright::controllers::ModuleAdapter<upright::controllers::LqgController>::Api();
}
