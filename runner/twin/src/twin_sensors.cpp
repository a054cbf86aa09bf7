#include "upright/runner/twin/twin_sensors.hpp"

#include <cmath>

#include "upright/model/conventions.hpp"

namespace upright::runner {

TwinSensorGeometry SensorGeometry(const model::RobotModel& model, double equilibrium_pitch_rad,
                                  double start_tilt_rad) {
  TwinSensorGeometry g;
  g.wheel_radius_m = model.wheel.radius_m;
  g.half_track_m = model.wheel.track_m / 2;
  g.imu_x_m = model.sensors.imu_x_m;
  g.imu_y_m = model.sensors.imu_y_m;
  g.imu_z_m = model.sensors.imu_z_m;
  g.equilibrium_pitch_rad = equilibrium_pitch_rad;
  g.start_tilt_rad = start_tilt_rad;
  return g;
}

sim::SensorSample IdealSensors(const TwinSensorGeometry& geometry, double time_s,
                               const design::StateVector& x, const design::StateVector& dx) {
  using design::kPitch, design::kPitchRate, design::kX, design::kXDot, design::kYaw,
      design::kYawRate;
  const double g = model::kStandardGravity_m_s2;
  const double pitch_rad = geometry.equilibrium_pitch_rad + x(kPitch);
  const double x_acc = dx(kXDot), pitch_acc = dx(kPitchRate), yaw_acc = dx(kYawRate);
  const double r = geometry.wheel_radius_m, d = geometry.half_track_m;
  sim::SensorSample s;
  s.time_s = time_s;
  s.gyro_rad_s = {0, x(kPitchRate), x(kYawRate)};
  s.accel_m_s2 = {
      x_acc + geometry.imu_z_m * pitch_acc - geometry.imu_y_m * yaw_acc - g * std::sin(pitch_rad),
      geometry.imu_x_m * yaw_acc, g * std::cos(pitch_rad) - geometry.imu_x_m * pitch_acc};
  const double pitch_moved_rad = x(kPitch) - geometry.start_tilt_rad;
  s.encoder_angle_rad = {(x(kX) - d * x(kYaw)) / r - pitch_moved_rad,
                         (x(kX) + d * x(kYaw)) / r - pitch_moved_rad};
  s.encoder_rate_rad_s = {(x(kXDot) - d * x(kYawRate)) / r - x(kPitchRate),
                          (x(kXDot) + d * x(kYawRate)) / r - x(kPitchRate)};
  return s;
}

}  // namespace upright::runner
