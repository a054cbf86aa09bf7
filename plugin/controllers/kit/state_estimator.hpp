// State estimation (internal to the built-in modules): each tick's sensor sample — or the true
// state, when the module is configured to use it — in, at the module rate; the linear model's
// state [x_m, ẋ_m_s, θ − θ_eq (rad), θ̇_rad_s, ψ_rad, ψ̇_rad_s] out, with x and ψ measured from
// where the robot stood at the first tick.
#pragma once

#include <Eigen/Dense>

#include "kit/config.hpp"
#include "kit/module_context.hpp"
#include "kit/speed_filter.hpp"
#include "kit/tilt_filter.hpp"
#include "upright/controller_abi.h"
#include "upright/design/linear_model.hpp"

namespace upright::controllers {

struct EstimatorSettings {
  double period_s = 0;  // between ticks
  double wheel_radius_m = 0;
  double track_m = 0;                               // between the wheel mid-planes
  Eigen::Vector3d imu_m = Eigen::Vector3d::Zero();  // IMU position, body frame, from the axle
  double tilt_filter_s = 0.5;                       // the tilt filter's τ (tilt_filter.hpp)
  double bias_filter_s = 2;                         // its τ_b, the gyro bias's
  // The tilt filter's gate (tilt_filter.hpp). 0.2 rad is g · 0.2 ≈ 2 m/s² of acceleration the
  // IMU and the encoders disagree on; common practice, set well above what ordinary running
  // gives (on the demo robots, 99 % of ticks within 0.1 rad of the prediction, 0.17 on the
  // tabletop's cable cover) and well below a knock or a spinning wheel (1 rad and more).
  double accel_gate_rad = 0.2;
  double equilibrium_pitch_rad = 0;  // the state's pitch is measured from it
  SpeedGains speed_gains = SpeedGains::ForTrackingIndex(0.1);  // the speed filter's
};

// The speed filter's gains for a robot: Δ the ground travel of one encoder count (2π r / counts;
// the two encoders of a robot driving straight read nearly the same angle, so their errors move
// together and their mean is taken as one quantiser, σ_z² = Δ²/12), and the acceleration input's
// error per tick σ_a² = the accelerometer's white noise per sample (density² × IMU rate) + its
// quantisation (step²/12) + (g · 1 mrad)², an allowance for the tilt estimate's error. The
// tracking index is capped at 1 (α = 0.75, β = 0.5): toward its limit (α = 1, β = 2) the filter
// would follow each count and its error dynamics reach a pole at −1.
SpeedGains SpeedGainsFor(const model::RobotModel& robot, double period_s);

// The settings for a module's robot, configuration and linear model.
EstimatorSettings SettingsFor(const ModuleContext& context, const CommonConfig& config,
                              const design::LinearModel& plant);

// The pitch the accelerometer reads standing still, rad: atan2(−f_x, f_z) of the body-frame
// specific force `accel_m_s2` = [x, y, z] (conventions.hpp; imu_kinematics.hpp for the general
// case).
double AccelerometerPitch(const double* accel_m_s2);

// From the sensor samples, each tick:
//   the specific force moved from the IMU to the axle (imu_kinematics.hpp), with the gyro's rates
//     (the pitch rate less the estimated bias) and their change over the tick;
//   ẋ: the speed filter (speed_filter.hpp) on the encoders' travel r (mean encoder angle + θ),
//     θ here the gyro's integral alone (the tilt filter's corrections, a small step each tick,
//     would reach the speed as r times their rate), and the axle's horizontal acceleration from
//     that specific force: the IMU measures the acceleration, the encoders correct its slow
//     error, and neither the half period of lag nor the count quantisation of an encoder
//     difference reaches the speed;
//   pitch θ and the pitch gyro's bias b: the tilt filter (tilt_filter.hpp) on the gyro's mean
//     rate over the tick (of its last two readings) and the accelerometer's pitch, read allowing
//     for the axle's horizontal acceleration as the speed filter just saw it (its input and its
//     correction). Read as a tilt, every slow acceleration would pull the estimate by −ẍ / g.
//     That acceleration is the IMU's own plus what the encoders' travel corrected in it,
//     so the tilt is corrected by what the accelerometer and the encoders disagree on (a pitch
//     off by δ integrates to a travel g δ t² / 2 the encoders do not see): the structure of an
//     odometry-aided inertial estimator, without the encoders' quantisation differenced twice
//     (about ±0.2 rad of accelerometer pitch per tick on the tabletop robot). While a wheel slips
//     or the chassis takes a knock the two disagree by more than a tilt could change in a tick,
//     and the tilt filter's gate drops that correction;
//   pitch rate θ̇ = gyro y − b;
//   x = r (mean encoder angle + θ): the encoders read the wheels relative to the chassis, so the
//     chassis pitch is added back;
//   ψ = r (φ_R − φ_L) / track, ψ̇ = gyro z, as they read (a wheel that slips turns the encoders'
//     heading, and the yaw gyro's bias stays in ψ̇).
// The first sample starts the filters (the pitch from the accelerometer, the speed from the
// encoders' rates, no bias) and sets the origins of x and ψ.
class ComplementaryEstimator {
 public:
  explicit ComplementaryEstimator(const EstimatorSettings& settings);
  void Reset();  // the next Update starts afresh
  const design::StateVector& Update(const upright_sensor_sample& sample);
  const design::StateVector& state() const { return state_; }
  double pitch_rad() const { return tilt_.pitch_rad(); }  // from vertical, not the equilibrium
  double gyro_bias_rad_s() const { return tilt_.bias_rad_s(); }  // the pitch gyro's

 private:
  EstimatorSettings settings_;
  TiltFilter tilt_;
  SpeedFilter speed_;
  bool started_ = false;
  double x_origin_m_ = 0;
  double yaw_origin_rad_ = 0;
  double gyro_pitch_rad_ = 0;  // the first tick's pitch, then the gyro's alone
  Eigen::Vector3d last_gyro_rad_s_ = Eigen::Vector3d::Zero();
  design::StateVector state_ = design::StateVector::Zero();
};

// From the true state: x is the distance travelled along the heading (the sum of each tick's
// displacement projected on the yaw), ẋ the forward speed, θ and θ̇ the chassis pitch and its
// rate, ψ the yaw made continuous across ±π, ψ̇ its rate.
class TrueStateReader {
 public:
  explicit TrueStateReader(double equilibrium_pitch_rad);
  void Reset();
  const design::StateVector& Update(const upright_true_state& truth);
  const design::StateVector& state() const { return state_; }

 private:
  double equilibrium_pitch_rad_;
  bool started_ = false;
  double last_x_m_ = 0, last_y_m_ = 0, last_yaw_rad_ = 0;
  double travelled_m_ = 0, yaw_rad_ = 0;
  design::StateVector state_ = design::StateVector::Zero();
};

// One of the two above, as configured.
class StateSource {
 public:
  StateSource(StateChoice choice, const EstimatorSettings& settings);
  void Reset();
  // This tick's state into *state; returns nullptr, or a message in static storage when the
  // input lacks what the source needs (the true state).
  const char* Update(const upright_step_input& input, const design::StateVector** state);
  // The wheels' speeds relative to the chassis, rad/s, [left, right]: the true ones when the
  // source reads the true state (and the input carries it), else the encoders' rates.
  Eigen::Vector2d WheelSpeeds(const upright_step_input& input) const;

 private:
  StateChoice choice_;
  ComplementaryEstimator estimator_;
  TrueStateReader truth_;
};

}  // namespace upright::controllers
