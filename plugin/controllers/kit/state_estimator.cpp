#include "kit/state_estimator.hpp"

#include <cmath>
#include <numbers>

#include "upright/model/conventions.hpp"

namespace upright::controllers {

using design::kPitch;
using design::kPitchRate;
using design::kX;
using design::kXDot;
using design::kYaw;
using design::kYawRate;

EstimatorSettings SettingsFor(const ModuleContext& context, const CommonConfig& config,
                              const design::LinearModel& plant) {
  EstimatorSettings s;
  s.period_s = context.period_s;
  s.wheel_radius_m = context.robot.wheel.radius_m;
  s.track_m = context.robot.wheel.track_m;
  s.imu_height_m = context.robot.sensors.imu_z_m;
  s.tilt_filter_s = config.tilt_filter_s;
  s.equilibrium_pitch_rad = plant.equilibrium_pitch_rad;
  return s;
}

double AccelerometerPitch(const double* accel_m_s2, double forward_accel_m_s2) {
  return std::atan2(forward_accel_m_s2 - accel_m_s2[0], accel_m_s2[2]);
}

ComplementaryEstimator::ComplementaryEstimator(const EstimatorSettings& settings)
    : settings_(settings), blend_(std::exp(-settings.period_s / settings.tilt_filter_s)) {}

void ComplementaryEstimator::Reset() {
  started_ = false;
  pitch_rad_ = 0;
  x_origin_m_ = yaw_origin_rad_ = 0;
  imu_speed_m_s_ = 0;
  state_.setZero();
}

const design::StateVector& ComplementaryEstimator::Update(const upright_sensor_sample& s) {
  const double r = settings_.wheel_radius_m;
  const double pitch_rate = s.gyro_rad_s[1];
  const double mean_angle =
      (s.encoder_angle_rad[model::kLeft] + s.encoder_angle_rad[model::kRight]) / 2;
  const double mean_rate =
      (s.encoder_rate_rad_s[model::kLeft] + s.encoder_rate_rad_s[model::kRight]) / 2;
  const double heading = r *
                         (s.encoder_angle_rad[model::kRight] - s.encoder_angle_rad[model::kLeft]) /
                         settings_.track_m;
  const double speed = r * (mean_rate + pitch_rate);
  const double imu_speed = speed + settings_.imu_height_m * pitch_rate;
  const double imu_accel = started_ ? (imu_speed - imu_speed_m_s_) / settings_.period_s : 0.0;
  imu_speed_m_s_ = imu_speed;
  const double accel_pitch = AccelerometerPitch(s.accel_m_s2, imu_accel);
  if (!started_) {
    started_ = true;
    pitch_rad_ = accel_pitch;
    x_origin_m_ = r * (mean_angle + pitch_rad_);
    yaw_origin_rad_ = heading;
  } else {
    pitch_rad_ =
        blend_ * (pitch_rad_ + pitch_rate * settings_.period_s) + (1 - blend_) * accel_pitch;
  }
  state_(kX) = r * (mean_angle + pitch_rad_) - x_origin_m_;
  state_(kXDot) = speed;
  state_(kPitch) = pitch_rad_ - settings_.equilibrium_pitch_rad;
  state_(kPitchRate) = pitch_rate;
  state_(kYaw) = heading - yaw_origin_rad_;
  state_(kYawRate) = s.gyro_rad_s[2];
  return state_;
}

TrueStateReader::TrueStateReader(double equilibrium_pitch_rad)
    : equilibrium_pitch_rad_(equilibrium_pitch_rad) {}

void TrueStateReader::Reset() {
  started_ = false;
  travelled_m_ = yaw_rad_ = 0;
  state_.setZero();
}

const design::StateVector& TrueStateReader::Update(const upright_true_state& t) {
  if (!started_) {
    started_ = true;
    travelled_m_ = 0;
    yaw_rad_ = 0;
  } else {
    // The yaw change since the last tick, taken the short way round.
    yaw_rad_ += std::remainder(t.yaw_rad - last_yaw_rad_, 2 * std::numbers::pi);
    const double yaw = t.yaw_rad;
    travelled_m_ += std::cos(yaw) * (t.x_m - last_x_m_) + std::sin(yaw) * (t.y_m - last_y_m_);
  }
  last_x_m_ = t.x_m;
  last_y_m_ = t.y_m;
  last_yaw_rad_ = t.yaw_rad;
  state_(kX) = travelled_m_;
  state_(kXDot) = t.forward_speed_m_s;
  state_(kPitch) = t.pitch_rad - equilibrium_pitch_rad_;
  state_(kPitchRate) = t.pitch_rate_rad_s;
  state_(kYaw) = yaw_rad_;
  state_(kYawRate) = t.yaw_rate_rad_s;
  return state_;
}

StateSource::StateSource(StateChoice choice, const EstimatorSettings& settings)
    : choice_(choice), estimator_(settings), truth_(settings.equilibrium_pitch_rad) {}

void StateSource::Reset() {
  estimator_.Reset();
  truth_.Reset();
}

const char* StateSource::Update(const upright_step_input& input,
                                const design::StateVector** state) {
  if (choice_ == StateChoice::kEstimated) {
    *state = &estimator_.Update(input.sensors);
    return nullptr;
  }
  if (!input.truth || input.truth->struct_size < sizeof(upright_true_state)) {
    return "configured with state = true, but the step input carries no true state";
  }
  *state = &truth_.Update(*input.truth);
  return nullptr;
}

}  // namespace upright::controllers
