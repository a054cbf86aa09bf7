// Ideal sensors on the linear robot: what the gyro, accelerometer and encoders would read with no
// noise, bias, quantisation or latency — the linear state (and its derivative) in, a
// sim::SensorSample out, by the linearised kinematics of conventions.hpp.
#pragma once

#include "upright/design/linear_model.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/plant.hpp"

namespace upright::runner {

// What the readings depend on besides the state.
struct TwinSensorGeometry {
  double wheel_radius_m = 0;
  double half_track_m = 0;
  double imu_x_m = 0, imu_y_m = 0, imu_z_m = 0;  // IMU in the body frame, from the axle midpoint
  double equilibrium_pitch_rad = 0;              // the linear pitch state is measured from it
  double start_tilt_rad = 0;  // the pitch state at t = 0, when the encoders read zero
};

TwinSensorGeometry SensorGeometry(const model::RobotModel& model, double equilibrium_pitch_rad,
                                  double start_tilt_rad);

// The readings at `time_s` for the linear state x (kX and kYaw measured from the start, kPitch the
// tilt from the equilibrium pitch) and its derivative dx (for the accelerometer). With
// θ = θ_eq + tilt, the IMU at body (a, b, h) and d half the track:
//   gyro  = (0, θ̇, ψ̇);
//   accel = (ẍ + h θ̈ − b ψ̈ − g sin θ,  a ψ̈,  g cos θ − a θ̈)   (specific force, body frame);
//   encoder angle (relative to the chassis, zero at the start) = (x ∓ d ψ)/r − (tilt − tilt₀),
//   encoder rate = (ẋ ∓ d ψ̇)/r − θ̇, left with −, right with +.
// The mean encoder angle and the accelerometer's x reading agree with design::LineariseSensors.
sim::SensorSample IdealSensors(const TwinSensorGeometry& geometry, double time_s,
                               const design::StateVector& x, const design::StateVector& dx);

}  // namespace upright::runner
