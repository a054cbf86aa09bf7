#include "abi_fill.hpp"

#include "upright/design/linear_model.hpp"

namespace upright::host::internal {
namespace {

// Row-major copy of an Eigen matrix into a C array of rows × cols.
template <typename Matrix>
void CopyRowMajor(const Matrix& m, double* out) {
  for (Eigen::Index i = 0; i < m.rows(); ++i) {
    for (Eigen::Index j = 0; j < m.cols(); ++j) out[i * m.cols() + j] = m(i, j);
  }
}

}  // namespace

upright_robot RobotForModule(const model::RobotModel& m) {
  upright_robot r{};
  r.struct_size = sizeof r;
  r.chassis_mass_kg = m.chassis.mass_kg;
  r.chassis_pitch_inertia_kgm2 = m.chassis.pitch_inertia_kgm2;
  r.chassis_roll_inertia_kgm2 = m.chassis.roll_inertia_kgm2;
  r.chassis_yaw_inertia_kgm2 = m.chassis.yaw_inertia_kgm2;
  r.com_height_m = m.chassis.com_height_m;
  r.com_forward_m = m.chassis.com_forward_m;
  r.wheel_radius_m = m.wheel.radius_m;
  r.wheel_mass_kg = m.wheel.mass_kg;
  r.wheel_spin_inertia_kgm2 = m.wheel.spin_inertia_kgm2;
  r.track_m = m.wheel.track_m;
  r.tyre_friction = m.wheel.friction;
  r.motor_torque_constant_Nm_per_A = m.motor.torque_constant_Nm_per_A;
  r.motor_back_emf_V_s_per_rad = m.motor.back_emf_V_s_per_rad;
  r.motor_resistance_ohm = m.motor.resistance_ohm;
  r.gear_ratio = m.motor.gear_ratio;
  r.gear_efficiency = m.motor.gear_efficiency;
  r.supply_V = m.motor.supply_V;
  r.current_limit_A = m.motor.current_limit_A;
  r.imu_rate_hz = m.sensors.imu_rate_hz;
  r.imu_x_m = m.sensors.imu_x_m;
  r.imu_y_m = m.sensors.imu_y_m;
  r.imu_z_m = m.sensors.imu_z_m;
  r.gyro_noise_rad_s_rthz = m.sensors.gyro_noise_rad_s_rthz;
  r.accel_noise_m_s2_rthz = m.sensors.accel_noise_m_s2_rthz;
  r.encoder_counts_per_rev = m.sensors.encoder_counts_per_rev;
  r.latency_s = m.sensors.latency_s;
  r.payload_mass_kg = m.payload.present ? m.payload.mass_kg : 0.0;
  r.payload_z_m = m.payload.present ? m.payload.z_m : 0.0;
  r.gyro_resolution_rad_s = m.sensors.gyro_resolution_rad_s;
  r.accel_resolution_m_s2 = m.sensors.accel_resolution_m_s2;
  r.outline_front_m = m.chassis.outline_front_m;
  r.outline_rear_m = m.chassis.outline_rear_m;
  r.outline_bottom_m = m.chassis.outline_bottom_m;
  r.outline_top_m = m.chassis.outline_top_m;
  r.outline_width_m = m.chassis.outline_width_m;
  return r;
}

upright_linear_model LinearForModule(const model::RobotModel& model) {
  const design::LinearModel torque = design::Linearise(model, design::InputKind::kTorque);
  const design::LinearModel voltage = design::Linearise(model, design::InputKind::kVoltage);
  upright_linear_model l{};
  l.struct_size = sizeof l;
  CopyRowMajor(torque.A, l.A_torque);
  CopyRowMajor(torque.B, l.B_torque);
  CopyRowMajor(voltage.A, l.A_voltage);
  CopyRowMajor(voltage.B, l.B_voltage);
  CopyRowMajor(torque.E, l.E);
  l.push_height_m = torque.push_height_m;
  l.equilibrium_pitch_rad = torque.equilibrium_pitch_rad;
  return l;
}

}  // namespace upright::host::internal
