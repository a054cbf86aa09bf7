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
#include "upright/design/riccati.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/conventions.hpp"

namespace upright::controllers {
namespace {

using design::kInputs;
using design::kStates;
constexpr int kMeasurements = design::SensorLinearisation::kMeasurements;
constexpr int kAccelRow = 4;  // LineariseSensors' accelerometer row, f_x / g
using MeasurementVector = Eigen::Matrix<double, kMeasurements, 1>;

// The process noise `upright design` assumes for its LQG (design_set.cpp; common practice): a
// push of 5 % of the robot's weight and a pitch torque of 5 % of the body's gravity torque at
// 10 cm, per control sample.
design::ProcessNoise DefaultProcessNoise(const upright_robot& robot,
                                         const design::LinearModel& plant) {
  design::ProcessNoise noise;
  noise.push_sigma_N = 0.05 * TotalMass(robot) * kStandardGravity_m_s2;
  noise.torque_sigma_Nm = 0.05 * plant.body.mass_kg * kStandardGravity_m_s2 * 0.1;
  return noise;
}

// The filter's sensors: LineariseSensors', with the accelerometer's variance widened by the
// disturbances it feels directly. f_x / g holds (ẍ + h θ̈) / g, into which this sample's push
// and pitch torque w enter at once, y = C x + D u + F w; a filter for y = C x + D u + v does not
// see that term, so its variance F Σ_w Fᵀ joins the row's (neglecting its correlation with the
// process noise). Without it the filter trusts the model's acceleration, and any force the model
// lacks (rolling resistance, wheel friction) pulls its pitch estimate into a friction limit cycle
// at about 1 Hz: RMS pitch 0.81° on the courier robot without this, 0.46° with it.
design::SensorLinearisation FilterSensors(const RobotModel& robot, const design::LinearModel& plant,
                                          const design::ProcessNoise& noise) {
  design::SensorLinearisation s = design::LineariseSensors(robot, plant);
  const double h = robot.sensors.imu_z_m;
  const Eigen::RowVector2d F =
      (plant.E.row(design::kXDot) + h * plant.E.row(design::kPitchRate)) / kStandardGravity_m_s2;
  const Eigen::Vector2d variance(noise.push_sigma_N * noise.push_sigma_N,
                                 noise.torque_sigma_Nm * noise.torque_sigma_Nm);
  s.Rv(kAccelRow, kAccelRow) += F * variance.asDiagonal() * F.transpose();
  return s;
}

// The yaw torque disturbance per control sample: 5 % of the robot's weight at half the track, by
// analogy with the default push and pitch torque (a tuning default; common practice).
double YawTorqueSigma(const upright_robot& robot) {
  return 0.05 * TotalMass(robot) * kStandardGravity_m_s2 * robot.track_m / 2;
}

// The filter at the module's rate: x⁺ = Ad x + Bd u (+ noise), y = C x + D u (+ noise), and its
// steady-state measurement-update gain L.
struct Filter {
  Eigen::Matrix<double, kStates, kStates> Ad;
  Eigen::Matrix<double, kStates, kInputs> Bd;
  Eigen::Matrix<double, kMeasurements, kStates> C;
  Eigen::Matrix<double, kMeasurements, kInputs> D;
  Eigen::Matrix<double, kStates, kMeasurements> L;
};

Filter DesignFilter(const ModuleContext& context, const design::LinearModel& plant) {
  const design::ProcessNoise noise = DefaultProcessNoise(context.robot_abi, plant);
  const design::SensorLinearisation sensors = FilterSensors(context.robot, plant, noise);
  const double T = context.period_s;
  // Process noise: design::RobotDiscreteKalman's (the push and pitch torque of E, the floor on
  // every state) and a yaw torque, ψ̈ = τ / J_yaw with 1 / J_yaw read off the torque model's B
  // as B(ψ̇, right) r / (track / 2). The yaw torque keeps the heading filter listening to the
  // encoders and gyro: without it the only yaw noise is the floor, the filter follows its model,
  // and wheel friction the model lacks stalls the turn (the tabletop robot turned 95° of 143° in
  // 5 s, against 137° with it).
  design::StateVector yaw_torque = design::StateVector::Zero();
  const double yaw_per_wheel_torque =
      context.linear_abi.B_torque[design::kYawRate * kInputs + kRight];
  yaw_torque(design::kYawRate) =
      yaw_per_wheel_torque * context.robot.wheel.radius_m / (context.robot.wheel.track_m / 2);
  Eigen::MatrixXd inputs(kStates, kInputs + design::kDisturbances + 1);
  inputs << plant.B, plant.E, yaw_torque;
  Eigen::MatrixXd Ad, Gd;
  design::DiscretiseZoh(plant.A, inputs, T, &Ad, &Gd);
  const Eigen::MatrixXd Gw = Gd.rightCols(design::kDisturbances + 1);
  const double yaw_sigma = YawTorqueSigma(context.robot_abi);
  const Eigen::Vector3d variance(noise.push_sigma_N * noise.push_sigma_N,
                                 noise.torque_sigma_Nm * noise.torque_sigma_Nm,
                                 yaw_sigma * yaw_sigma);
  const Eigen::MatrixXd Qd = Gw * variance.asDiagonal() * Gw.transpose() +
                             noise.floor * Eigen::MatrixXd::Identity(kStates, kStates);
  const design::GainResult kalman = design::DiscreteKalmanGain(Ad, sensors.C, Qd, sensors.Rv);
  if (!kalman.ok()) {
    throw ModuleError(UPRIGHT_UNSUPPORTED, "discrete Kalman design failed: " + kalman.message);
  }
  Filter f;
  f.Ad = Ad;
  f.Bd = Gd.leftCols<kInputs>();
  f.C = sensors.C;
  f.D = sensors.D;
  f.L = kalman.K;
  return f;
}

class LqgController {
 public:
  static constexpr const char* kName = "lqg";

  static std::unique_ptr<LqgController> Create(const ModuleContext& context,
                                               upright_create_result* result) {
    ConfigReader reader(context.config);
    const CommonConfig config =
        ReadCommonConfig(&reader, context.true_state_available, /*voltage_allowed=*/true);
    reader.Finish();
    const design::LinearModel plant =
        LinearFromAbi(context.linear_abi, context.robot_abi, config.input);
    const design::Gain gain = DiscreteLqrFor(context, config, plant);
    const Filter filter = DesignFilter(context, plant);
    std::vector<const char*> diagnostics = StateFeedbackLaw::DiagnosticNames();
    diagnostics.push_back("accel_innovation");
    Declare(config.input, diagnostics, result);
    std::ostringstream log;
    log << "lqg: discrete LQR and Kalman filter at " << context.rate_hz << " Hz, K =\n"
        << gain << "\nL =\n"
        << filter.L;
    context.Log(UPRIGHT_LOG_DEBUG, log.str());
    const EstimatorSettings estimator = SettingsFor(context, config, plant);
    return std::unique_ptr<LqgController>(new LqgController(
        config.state, context.robot, plant.equilibrium_pitch_rad, filter,
        StateSource(config.state, estimator),
        StateFeedbackLaw(plant, gain, design::InputLimit(context.robot, config.input),
                         ReferenceTracker(context.period_s, config.max_accel_m_s2))));
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
    if (const char* why = law_.Step(input.reference, *state, output)) return why;
    output->diagnostics[diagnostic_slot_] = innovation_(kAccelRow);
    return nullptr;
  }

 private:
  LqgController(StateChoice state_choice, const RobotModel& robot, double equilibrium_pitch_rad,
                const Filter& filter, StateSource truth, StateFeedbackLaw law)
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
    const double mean_angle = (s.encoder_angle_rad[kLeft] + s.encoder_angle_rad[kRight]) / 2;
    MeasurementVector y;
    y << mean_angle - angle_origin_rad_, s.gyro_rad_s[1], Heading(s) - heading_origin_rad_,
        s.gyro_rad_s[2], s.accel_m_s2[0] / kStandardGravity_m_s2 + std::sin(equilibrium_pitch_rad_);
    return y;
  }

  double Heading(const upright_sensor_sample& s) const {
    return wheel_radius_m_ * (s.encoder_angle_rad[kRight] - s.encoder_angle_rad[kLeft]) / track_m_;
  }

  // The first sample starts the estimate (pitch from the accelerometer, rates from the gyro and
  // encoders, x and ψ at zero); each later one predicts with the command held since the
  // last tick, x̂⁻ = Ad x̂ + Bd u, and updates, x̂ = x̂⁻ + L (y − C x̂⁻ − D u).
  void Estimate(const upright_sensor_sample& s) {
    const Eigen::Vector2d& u = law_.command();
    if (!started_) {
      started_ = true;
      const double pitch = AccelerometerPitch(s.accel_m_s2) - equilibrium_pitch_rad_;
      angle_origin_rad_ = (s.encoder_angle_rad[kLeft] + s.encoder_angle_rad[kRight]) / 2 + pitch;
      heading_origin_rad_ = Heading(s);
      const double mean_rate = (s.encoder_rate_rad_s[kLeft] + s.encoder_rate_rad_s[kRight]) / 2;
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
  StateSource truth_;  // used with state = true only
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
