// State estimation (internal to the built-in modules): each tick's sensor sample — or the true
// state, when the module is configured to use it — in, at the module rate; the linear model's
// state [x_m, ẋ_m_s, θ − θ_eq (rad), θ̇_rad_s, ψ_rad, ψ̇_rad_s] out, with x and ψ measured from
// where the robot stood at the first tick.
#pragma once

#include "kit/config.hpp"
#include "kit/module_context.hpp"
#include "upright/controller_abi.h"
#include "upright/design/linear_model.hpp"

namespace upright::controllers {

struct EstimatorSettings {
  double period_s = 0;  // between ticks
  double wheel_radius_m = 0;
  double track_m = 0;                // between the wheel mid-planes
  double imu_height_m = 0;           // IMU above the axle
  double tilt_filter_s = 0.5;        // complementary filter time constant
  double equilibrium_pitch_rad = 0;  // the state's pitch is measured from it
};

// The settings for a module's robot, configuration and linear model.
EstimatorSettings SettingsFor(const ModuleContext& context, const CommonConfig& config,
                              const design::LinearModel& plant);

// The pitch the accelerometer reads, rad. Leaning forward by θ, the body x axis points down by θ,
// so the reaction to gravity reads f_x = −g sin θ, f_z = g cos θ (conventions.hpp), plus the
// IMU's own forward acceleration a on x: θ = atan2(a − f_x, f_z). `accel_m_s2` is body-frame
// [x, y, z]; `forward_accel_m_s2` is a where known (0 standing still).
double AccelerometerPitch(const double* accel_m_s2, double forward_accel_m_s2 = 0);

// From the sensor samples:
//   pitch θ: a complementary filter, θ ← α (θ + ω_y T) + (1 − α) θ_acc, α = exp(−T / τ): the
//     gyro at high frequency, the accelerometer's tilt below 1/τ; a constant tilt seen by the
//     accelerometer alone is approached as 1 − exp(−t/τ), exactly, at the ticks. θ_acc allows
//     for the IMU's forward acceleration, the change over one tick of its speed ẋ + h θ̇ (from the
//     encoders and gyro): otherwise the filter would read every slow acceleration a as a tilt
//     −a/g (on the tabletop robot under LQR, late RMS pitch 1.2° without this, 0.4° with it);
//   pitch rate θ̇ = gyro y;
//   x = r (mean encoder angle + θ), ẋ = r (mean encoder rate + θ̇) — the encoders read the
//     wheels relative to the chassis, so the chassis pitch is added back;
//   ψ = r (φ_R − φ_L) / track, ψ̇ = gyro z.
// The first sample starts the filter at θ_acc and sets the origins of x and ψ.
class ComplementaryEstimator {
 public:
  explicit ComplementaryEstimator(const EstimatorSettings& settings);
  void Reset();  // the next Update starts afresh
  const design::StateVector& Update(const upright_sensor_sample& sample);
  const design::StateVector& state() const { return state_; }
  double pitch_rad() const { return pitch_rad_; }  // from vertical, not from the equilibrium

 private:
  EstimatorSettings settings_;
  double blend_;  // α
  bool started_ = false;
  double pitch_rad_ = 0;
  double x_origin_m_ = 0;
  double yaw_origin_rad_ = 0;
  double imu_speed_m_s_ = 0;  // the last tick's ẋ + h θ̇
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

 private:
  StateChoice choice_;
  ComplementaryEstimator estimator_;
  TrueStateReader truth_;
};

}  // namespace upright::controllers
