#include "kit/abi_model.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <sstream>
#include <utility>

#include "kit/module_context.hpp"

namespace upright::controllers {
namespace {

using design::kStates;

// Row-major C array of rows × cols into an Eigen matrix.
template <typename Matrix>
Matrix FromRowMajor(const double* values) {
  Matrix m;
  for (Eigen::Index i = 0; i < m.rows(); ++i) {
    for (Eigen::Index j = 0; j < m.cols(); ++j) m(i, j) = values[i * m.cols() + j];
  }
  return m;
}

// Whether the host's robot struct reaches the IMU resolutions, added later in version 1.
bool HasResolutions(const upright_robot& r) {
  return r.struct_size >= offsetof(upright_robot, accel_resolution_m_s2) + sizeof(double);
}

// Whether it reaches the chassis outline, added after them.
bool HasOutline(const upright_robot& r) {
  return r.struct_size >= offsetof(upright_robot, outline_width_m) + sizeof(double);
}

template <std::size_t N>
bool AllFinite(const double (&values)[N]) {
  return std::all_of(values, values + N, [](double v) { return std::isfinite(v); });
}

}  // namespace

Result<void, ModuleError> CheckAbiModel(const upright_robot& r, const upright_linear_model& l) {
  const std::pair<const char*, double> positive[] = {
      {"chassis_mass_kg", r.chassis_mass_kg},
      {"wheel_radius_m", r.wheel_radius_m},
      {"track_m", r.track_m},
      {"motor_torque_constant_Nm_per_A", r.motor_torque_constant_Nm_per_A},
      {"motor_resistance_ohm", r.motor_resistance_ohm},
      {"gear_ratio", r.gear_ratio},
      {"gear_efficiency", r.gear_efficiency},
      {"supply_V", r.supply_V},
      {"current_limit_A", r.current_limit_A},
      {"imu_rate_hz", r.imu_rate_hz},
      {"encoder_counts_per_rev", r.encoder_counts_per_rev}};
  for (const auto& [name, value] : positive) {
    if (!(value > 0) || !std::isfinite(value)) {
      std::ostringstream why;
      why << "robot " << name << " = " << value << ": must be > 0";
      return Failure(ModuleError{UPRIGHT_UNSUPPORTED, why.str()});
    }
  }
  const std::pair<const char*, double> finite[] = {
      {"com_height_m", r.com_height_m},
      {"com_forward_m", r.com_forward_m},
      {"wheel_mass_kg", r.wheel_mass_kg},
      {"imu_z_m", r.imu_z_m},
      {"gyro_noise_rad_s_rthz", r.gyro_noise_rad_s_rthz},
      {"accel_noise_m_s2_rthz", r.accel_noise_m_s2_rthz},
      {"payload_mass_kg", r.payload_mass_kg},
      {"payload_z_m", r.payload_z_m},
      {"push_height_m", l.push_height_m},
      {"equilibrium_pitch_rad", l.equilibrium_pitch_rad}};
  for (const auto& [name, value] : finite) {
    if (!std::isfinite(value)) {
      std::ostringstream why;
      why << name << " = " << value << ": must be finite";
      return Failure(ModuleError{UPRIGHT_UNSUPPORTED, why.str()});
    }
  }
  if (HasResolutions(r)) {
    for (const auto& [name, value] : {std::pair{"gyro_resolution_rad_s", r.gyro_resolution_rad_s},
                                      std::pair{"accel_resolution_m_s2", r.accel_resolution_m_s2}}) {
      if (!(value >= 0) || !std::isfinite(value)) {
        std::ostringstream why;
        why << "robot " << name << " = " << value << ": must be >= 0 and finite";
        return Failure(ModuleError{UPRIGHT_UNSUPPORTED, why.str()});
      }
    }
  }
  if (HasOutline(r)) {
    const double outline[] = {r.outline_front_m, r.outline_rear_m, r.outline_bottom_m,
                              r.outline_top_m, r.outline_width_m};
    if (!AllFinite(outline) || !(r.outline_front_m > r.outline_rear_m) ||
        !(r.outline_top_m > r.outline_bottom_m) || !(r.outline_width_m > 0)) {
      std::ostringstream why;
      why << "robot outline front_m = " << r.outline_front_m << ", rear_m = " << r.outline_rear_m
          << ", bottom_m = " << r.outline_bottom_m << ", top_m = " << r.outline_top_m
          << ", width_m = " << r.outline_width_m
          << ": must be finite, with front_m > rear_m, top_m > bottom_m and width_m > 0";
      return Failure(ModuleError{UPRIGHT_UNSUPPORTED, why.str()});
    }
  }
  if (!AllFinite(l.A_torque) || !AllFinite(l.B_torque) || !AllFinite(l.A_voltage) ||
      !AllFinite(l.B_voltage) || !AllFinite(l.E)) {
    return Failure(ModuleError{UPRIGHT_UNSUPPORTED, "the linear model has a non-finite entry"});
  }
  return {};
}

model::RobotModel RobotFromAbi(const upright_robot& r, double control_rate_hz) {
  model::RobotModel m;
  m.name = "module";
  m.chassis.mass_kg = r.chassis_mass_kg;
  m.chassis.pitch_inertia_kgm2 = r.chassis_pitch_inertia_kgm2;
  m.chassis.roll_inertia_kgm2 = r.chassis_roll_inertia_kgm2;
  m.chassis.yaw_inertia_kgm2 = r.chassis_yaw_inertia_kgm2;
  m.chassis.com_height_m = r.com_height_m;
  m.chassis.com_forward_m = r.com_forward_m;
  m.wheel.radius_m = r.wheel_radius_m;
  m.wheel.mass_kg = r.wheel_mass_kg;
  m.wheel.spin_inertia_kgm2 = r.wheel_spin_inertia_kgm2;
  m.wheel.track_m = r.track_m;
  m.wheel.friction = r.tyre_friction;
  m.motor.torque_constant_Nm_per_A = r.motor_torque_constant_Nm_per_A;
  m.motor.back_emf_V_s_per_rad = r.motor_back_emf_V_s_per_rad;
  m.motor.resistance_ohm = r.motor_resistance_ohm;
  m.motor.gear_ratio = r.gear_ratio;
  m.motor.gear_efficiency = r.gear_efficiency;
  m.motor.supply_V = r.supply_V;
  m.motor.current_limit_A = r.current_limit_A;
  m.sensors.imu_rate_hz = r.imu_rate_hz;
  m.sensors.imu_x_m = r.imu_x_m;
  m.sensors.imu_y_m = r.imu_y_m;
  m.sensors.imu_z_m = r.imu_z_m;
  m.sensors.gyro_noise_rad_s_rthz = r.gyro_noise_rad_s_rthz;
  m.sensors.accel_noise_m_s2_rthz = r.accel_noise_m_s2_rthz;
  m.sensors.encoder_counts_per_rev = r.encoder_counts_per_rev;
  m.sensors.latency_s = r.latency_s;
  m.control_rate_hz = control_rate_hz;
  m.payload.present = r.payload_mass_kg > 0;
  m.payload.mass_kg = r.payload_mass_kg;
  m.payload.z_m = r.payload_z_m;
  if (HasResolutions(r)) {
    m.sensors.gyro_resolution_rad_s = r.gyro_resolution_rad_s;
    m.sensors.accel_resolution_m_s2 = r.accel_resolution_m_s2;
  }
  if (HasOutline(r)) {
    m.chassis.outline_front_m = r.outline_front_m;
    m.chassis.outline_rear_m = r.outline_rear_m;
    m.chassis.outline_bottom_m = r.outline_bottom_m;
    m.chassis.outline_top_m = r.outline_top_m;
    m.chassis.outline_width_m = r.outline_width_m;
  }
  return m;
}

design::LinearModel LinearFromAbi(const upright_linear_model& l, const upright_robot& r,
                                  design::InputKind input) {
  using design::kInputs;
  design::LinearModel m;
  m.input = input;
  const bool voltage = input == design::InputKind::kVoltage;
  m.A = FromRowMajor<design::StateMatrix>(voltage ? l.A_voltage : l.A_torque);
  m.B = FromRowMajor<design::InputMatrix>(voltage ? l.B_voltage : l.B_torque);
  m.E = FromRowMajor<design::DisturbanceMatrix>(l.E);
  m.push_height_m = l.push_height_m;
  m.equilibrium_pitch_rad = l.equilibrium_pitch_rad;
  m.fall_rate_1_s = std::sqrt(std::max(m.A(design::kPitchRate, design::kPitch), 0.0));
  const double payload_kg = std::max(r.payload_mass_kg, 0.0);
  m.body.mass_kg = r.chassis_mass_kg + payload_kg;
  m.body.com_height_m =
      (r.chassis_mass_kg * r.com_height_m + payload_kg * r.payload_z_m) / m.body.mass_kg;
  m.body.com_forward_m = r.chassis_mass_kg * r.com_forward_m / m.body.mass_kg;
  static_assert(kStates == UPRIGHT_STATES && kInputs == UPRIGHT_INPUTS &&
                design::kDisturbances == UPRIGHT_DISTURBANCES);
  return m;
}

bool HasOutline(const model::RobotModel& robot) {
  return robot.chassis.outline_front_m > robot.chassis.outline_rear_m;
}

double TotalMass(const upright_robot& r) {
  return r.chassis_mass_kg + 2 * r.wheel_mass_kg + std::max(r.payload_mass_kg, 0.0);
}

}  // namespace upright::controllers
