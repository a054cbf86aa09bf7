// RobotModel: the constant description of one two-wheeled robot, in SI units (conventions.hpp).
// Loaded and validated from a model file (model_file.hpp), then shared read-only by every run and
// thread. Nothing here changes during a run; the state of a run lives in the plant.
#pragma once

#include <string>

namespace upright::model {

// The chassis (everything rigidly bolted to the body, without wheels or payload).
struct ChassisModel {
  double mass_kg = 0;
  double pitch_inertia_kgm2 = 0;  // about the COM, body y axis
  double roll_inertia_kgm2 = 0;   // about the COM, body x axis
  double yaw_inertia_kgm2 = 0;    // about the COM, body z axis
  double com_height_m = 0;        // COM above the axle, upright
  double com_forward_m = 0;       // COM ahead of the axle, upright
  // Outline: the box, in the body frame relative to the axle midpoint, whose contact with the
  // ground means the robot has fallen (also its collision shape).
  double outline_front_m = 0;  // x of the front face (> outline_rear_m)
  double outline_rear_m = 0;   // x of the rear face
  double outline_bottom_m = 0; // z of the bottom face, may be negative (below the axle)
  double outline_top_m = 0;    // z of the top face
  double outline_width_m = 0;  // extent along y, centred
  // Field by field, exactly.
  friend bool operator==(const ChassisModel&, const ChassisModel&) = default;
};

// One wheel (both are alike) and the axle.
struct WheelModel {
  double radius_m = 0;
  double width_m = 0;
  double mass_kg = 0;
  double spin_inertia_kgm2 = 0;      // about the axle; default in files ½ m r² (uniform disc)
  double diameter_inertia_kgm2 = 0;  // about a diameter; default in files m(3r² + w²)/12
  double track_m = 0;                // distance between the two wheel mid-planes
  double friction = 0;               // tyre–ground Coulomb coefficient on dry ground
  double rolling_resistance = 0;     // coefficient C_rr: resisting torque C_rr · N · r
  // Field by field, exactly.
  friend bool operator==(const WheelModel&, const WheelModel&) = default;
};

// One DC motor with its gearbox (one per wheel, both alike). Inductance is neglected.
struct MotorModel {
  double torque_constant_Nm_per_A = 0;        // K_t, at the motor shaft
  double back_emf_V_s_per_rad = 0;            // K_e, at the motor shaft
  double resistance_ohm = 0;                  // winding (terminal) resistance R
  double gear_ratio = 1;                      // n = motor speed / wheel speed (≥ 1)
  double gear_efficiency = 1;                 // η, multiplies the torque through the gearbox
  double supply_V = 0;                        // the largest terminal voltage magnitude
  double current_limit_A = 0;                 // the drive's current limit magnitude
  double viscous_friction_Nm_s_per_rad = 0;   // at the wheel, per rad/s relative to the chassis
  double coulomb_friction_Nm = 0;             // at the wheel
  // Field by field, exactly.
  friend bool operator==(const MotorModel&, const MotorModel&) = default;
};

// The inertial measurement unit and the wheel encoders.
struct SensorModel {
  double imu_rate_hz = 0;               // the IMU's own sample rate
  double imu_x_m = 0, imu_y_m = 0, imu_z_m = 0;  // IMU position in the body frame
  double gyro_noise_rad_s_rthz = 0;     // white-noise density, rad/s/√Hz
  double gyro_bias_x_rad_s = 0, gyro_bias_y_rad_s = 0, gyro_bias_z_rad_s = 0;
  double gyro_resolution_rad_s = 0;     // quantisation step, 0 = none
  double accel_noise_m_s2_rthz = 0;     // white-noise density, m/s²/√Hz
  double accel_bias_x_m_s2 = 0, accel_bias_y_m_s2 = 0, accel_bias_z_m_s2 = 0;
  double accel_resolution_m_s2 = 0;     // quantisation step, 0 = none
  double encoder_counts_per_rev = 0;    // counts per wheel revolution (whole number)
  double latency_s = 0;                 // from measurement to the controller's input
  // Field by field, exactly.
  friend bool operator==(const SensorModel&, const SensorModel&) = default;
};

// An optional payload box that slides along the deck (body x) on a driven carriage.
struct PayloadModel {
  bool present = false;
  double mass_kg = 0;
  double length_m = 0, width_m = 0, height_m = 0;  // box size
  double x_m = 0;       // nominal (home) position of its centre, body x
  double z_m = 0;       // height of its centre above the axle
  double min_x_m = 0;   // rear travel limit of its centre
  double max_x_m = 0;   // front travel limit of its centre
  // Field by field, exactly.
  friend bool operator==(const PayloadModel&, const PayloadModel&) = default;
};

struct RobotModel {
  std::string name;
  ChassisModel chassis;
  WheelModel wheel;
  MotorModel motor;
  SensorModel sensors;
  double control_rate_hz = 0;  // the rate the balance controller runs at
  PayloadModel payload;

  // Chassis, both wheels and the payload when present, kg.
  double total_mass_kg() const {
    return chassis.mass_kg + 2 * wheel.mass_kg + (payload.present ? payload.mass_kg : 0.0);
  }
  // Field by field, exactly (the name too).
  friend bool operator==(const RobotModel&, const RobotModel&) = default;
};

}  // namespace upright::model
