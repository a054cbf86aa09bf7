#include "kit/state_estimator.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "kit/imu_kinematics.hpp"
#include "upright/model/conventions.hpp"

namespace upright::controllers {

using design::kPitch;
using design::kPitchRate;
using design::kX;
using design::kXDot;
using design::kYaw;
using design::kYawRate;

SpeedGains SpeedGainsFor(const model::RobotModel& robot, double period_s) {
  const model::SensorModel& s = robot.sensors;
  const double count_m = 2 * std::numbers::pi * robot.wheel.radius_m / s.encoder_counts_per_rev;
  const double travel_sigma_m = count_m / std::sqrt(12.0);
  const double tilt_allowance_m_s2 = model::kStandardGravity_m_s2 * 1e-3;
  const double accel_sigma_m_s2 =
      std::sqrt(s.accel_noise_m_s2_rthz * s.accel_noise_m_s2_rthz * s.imu_rate_hz +
                s.accel_resolution_m_s2 * s.accel_resolution_m_s2 / 12 +
                tilt_allowance_m_s2 * tilt_allowance_m_s2);
  const double lambda = accel_sigma_m_s2 * period_s * period_s / travel_sigma_m;
  return SpeedGains::ForTrackingIndex(std::min(lambda, 1.0));
}

EstimatorSettings SettingsFor(const ModuleContext& context, const CommonConfig& config,
                              const design::LinearModel& plant) {
  EstimatorSettings s;
  s.period_s = context.period_s;
  s.wheel_radius_m = context.robot.wheel.radius_m;
  s.track_m = context.robot.wheel.track_m;
  const model::SensorModel& sensors = context.robot.sensors;
  s.imu_m = Eigen::Vector3d(sensors.imu_x_m, sensors.imu_y_m, sensors.imu_z_m);
  s.tilt_filter_s = config.tilt_filter_s;
  s.bias_filter_s = config.bias_filter_s;
  s.equilibrium_pitch_rad = plant.equilibrium_pitch_rad;
  s.speed_gains = SpeedGainsFor(context.robot, context.period_s);
  return s;
}

double AccelerometerPitch(const double* accel_m_s2) {
  return AccelerometerPitch(accel_m_s2[0], accel_m_s2[2]);
}

ComplementaryEstimator::ComplementaryEstimator(const EstimatorSettings& settings)
    : settings_(settings),
      tilt_(settings.period_s, settings.tilt_filter_s, settings.bias_filter_s,
            settings.accel_gate_rad),
      speed_(settings.period_s, settings.speed_gains) {}

void ComplementaryEstimator::Reset() {
  started_ = false;
  tilt_.Start(0);
  speed_.Start(0, 0, 0);
  x_origin_m_ = yaw_origin_rad_ = gyro_pitch_rad_ = 0;
  last_gyro_rad_s_.setZero();
  state_.setZero();
}

const design::StateVector& ComplementaryEstimator::Update(const upright_sensor_sample& s) {
  const double r = settings_.wheel_radius_m, T = settings_.period_s;
  const Eigen::Vector3d gyro(s.gyro_rad_s[0], s.gyro_rad_s[1], s.gyro_rad_s[2]);
  const Eigen::Vector3d imu_force(s.accel_m_s2[0], s.accel_m_s2[1], s.accel_m_s2[2]);
  const double mean_angle =
      (s.encoder_angle_rad[model::kLeft] + s.encoder_angle_rad[model::kRight]) / 2;
  const double heading = r *
                         (s.encoder_angle_rad[model::kRight] - s.encoder_angle_rad[model::kLeft]) /
                         settings_.track_m;
  // The body's rates, the pitch gyro's bias as estimated so far taken off, and their change over
  // the tick (a constant bias cancels in it).
  const Eigen::Vector3d rate = gyro - Eigen::Vector3d(0, tilt_.bias_rad_s(), 0);
  const Eigen::Vector3d last_gyro = started_ ? last_gyro_rad_s_ : gyro;
  const Eigen::Vector3d angular_accel = (gyro - last_gyro) / T;
  last_gyro_rad_s_ = gyro;
  const Eigen::Vector3d force =
      SpecificForceAtAxle(imu_force, settings_.imu_m, rate, angular_accel);
  if (!started_) {
    started_ = true;
    tilt_.Start(AccelerometerPitch(force(0), force(2)));
    gyro_pitch_rad_ = tilt_.pitch_rad();
    x_origin_m_ = r * (mean_angle + gyro_pitch_rad_);
    yaw_origin_rad_ = heading;
    const double wheel_rate =
        (s.encoder_rate_rad_s[model::kLeft] + s.encoder_rate_rad_s[model::kRight]) / 2;
    speed_.Start(x_origin_m_, r * (wheel_rate + rate(1)),
                 HorizontalAcceleration(force(0), force(2), gyro_pitch_rad_));
  } else {
    // The speed filter's travel takes the chassis pitch from the gyro alone: the tilt filter's
    // corrections, a small step each tick, would reach the speed as r times their rate.
    // Over the tick the pitch turns by T times the mean of the two readings (exact for a rate
    // that changes linearly).
    const double tick_rate = (last_gyro(1) + gyro(1)) / 2;
    const double predicted_pitch = tilt_.pitch_rad() + T * (tick_rate - tilt_.bias_rad_s());
    gyro_pitch_rad_ += T * (tick_rate - tilt_.bias_rad_s());
    speed_.Update(r * (mean_angle + gyro_pitch_rad_),
                  HorizontalAcceleration(force(0), force(2), predicted_pitch));
    tilt_.Update(tick_rate, AccelerometerPitch(force(0), force(2), speed_.accel_m_s2()));
  }
  const double pitch = tilt_.pitch_rad();
  state_(kX) = r * (mean_angle + pitch) - x_origin_m_;
  state_(kXDot) = speed_.speed_m_s();
  state_(kPitch) = pitch - settings_.equilibrium_pitch_rad;
  state_(kPitchRate) = gyro(1) - tilt_.bias_rad_s();
  state_(kYaw) = heading - yaw_origin_rad_;
  state_(kYawRate) = gyro(2);
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

Eigen::Vector2d StateSource::WheelSpeeds(const upright_step_input& input) const {
  if (choice_ == StateChoice::kTrue && input.truth &&
      input.truth->struct_size >= sizeof(upright_true_state)) {
    return {input.truth->wheel_rate_rad_s[model::kLeft],
            input.truth->wheel_rate_rad_s[model::kRight]};
  }
  return {input.sensors.encoder_rate_rad_s[model::kLeft],
          input.sensors.encoder_rate_rad_s[model::kRight]};
}

}  // namespace upright::controllers
