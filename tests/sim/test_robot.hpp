// A small, valid robot built in code for the plant tests: round numbers, so that every expected
// value in a test follows from a handbook formula and these inputs. Invented test data, not a
// real robot; tests change the few fields they need on a copy.
#pragma once

#include <gtest/gtest.h>

#include <bit>
#include <cstdint>
#include <memory>
#include <string>

#include "succeeded.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/plant.hpp"

namespace upright::sim::testing {

// Chassis 10 kg with its COM 0.2 m straight above the axle; two 2 kg disc wheels of radius 0.1 m
// (spin inertia ½ m r² = 0.01 kg·m²); motors with n η K_t / R = 10 × 0.8 × 0.05 / 2.5 =
// 0.16 N·m/V at the wheel and electrical damping n² η K_t K_e / R = 0.08 N·m·s/rad; ideal
// sensors at 1 kHz; controller at 100 Hz; no payload.
inline model::RobotModel MakeTestRobot() {
  model::RobotModel m;
  m.name = "test-robot";
  model::ChassisModel& c = m.chassis;
  c.mass_kg = 10;
  c.pitch_inertia_kgm2 = 0.4;
  c.roll_inertia_kgm2 = 0.4;
  c.yaw_inertia_kgm2 = 0.2;
  c.com_height_m = 0.2;
  c.com_forward_m = 0;
  c.outline_front_m = 0.15;
  c.outline_rear_m = -0.15;
  c.outline_bottom_m = -0.05;
  c.outline_top_m = 0.5;
  c.outline_width_m = 0.3;
  model::WheelModel& w = m.wheel;
  w.radius_m = 0.1;
  w.width_m = 0.04;
  w.mass_kg = 2;
  w.spin_inertia_kgm2 = 0.01;  // ½ m r², uniform disc (handbook, from memory)
  // Uniform cylinder about a diameter, m (3 r² + w²) / 12 (handbook, from memory).
  w.diameter_inertia_kgm2 = 2.0 * (3 * 0.1 * 0.1 + 0.04 * 0.04) / 12;
  w.track_m = 0.4;
  w.friction = 1.0;
  w.rolling_resistance = 0;
  model::MotorModel& mo = m.motor;
  mo.torque_constant_Nm_per_A = 0.05;
  mo.back_emf_V_s_per_rad = 0.05;
  mo.resistance_ohm = 2.5;
  mo.gear_ratio = 10;
  mo.gear_efficiency = 0.8;
  mo.supply_V = 12;
  mo.current_limit_A = 4;
  mo.viscous_friction_Nm_s_per_rad = 0.02;
  mo.coulomb_friction_Nm = 0.01;
  model::SensorModel& s = m.sensors;
  s.imu_rate_hz = 1000;
  s.imu_x_m = 0;
  s.imu_y_m = 0;
  s.imu_z_m = 0.2;  // at the chassis COM
  s.encoder_counts_per_rev = 4096;
  s.latency_s = 0;
  m.control_rate_hz = 100;
  return m;
}

// The test robot with the motor's mechanical friction removed (pure electrical motor).
inline model::RobotModel MakeFrictionlessTestRobot() {
  model::RobotModel m = MakeTestRobot();
  m.motor.viscous_friction_Nm_s_per_rad = 0;
  m.motor.coulomb_friction_Nm = 0;
  return m;
}

// A plant for the test, or a test failure naming why it could not be built.
inline std::unique_ptr<Plant> MakePlant(const model::RobotModel& model,
                                        const PlantOptions& options) {
  auto plant = Plant::Create(model, options);
  EXPECT_TRUE(Succeeded(plant));
  return plant ? std::move(*plant) : nullptr;
}

// Unpowered: a torque drive commanded to zero lets the wheels turn freely (no back-EMF braking).
inline PlantOptions Unpowered() {
  PlantOptions options;
  options.drive = DriveMode::kTorque;
  options.sensor_noise = false;
  return options;
}

// Total mass that rolls on the wheels: chassis plus both wheels (kg).
inline double RollingMass(const model::RobotModel& m) {
  return m.chassis.mass_kg + 2 * m.wheel.mass_kg;
}

// FNV-1a over the bit patterns of doubles: equal hashes mean bit-identical sequences
// (FNV-1a 64-bit offset basis and prime, from memory).
class TraceHash {
 public:
  void Add(double value) {
    const auto bits = std::bit_cast<std::uint64_t>(value);
    for (int i = 0; i < 8; ++i) {
      hash_ ^= (bits >> (8 * i)) & 0xffu;
      hash_ *= 0x100000001b3ULL;
    }
  }
  std::uint64_t value() const { return hash_; }

 private:
  std::uint64_t hash_ = 0xcbf29ce484222325ULL;
};

// Adds everything the physics decides after a step: the true state, each wheel's contact and
// motor readout, and whether the chassis touches the ground.
inline void AddPhysics(const Plant& plant, TraceHash* hash) {
  const TrueState& t = plant.truth();
  for (double v : {t.time_s, t.x_m, t.y_m, t.z_m, t.pitch_rad, t.roll_rad, t.yaw_rad,
                   t.pitch_rate_rad_s, t.roll_rate_rad_s, t.yaw_rate_rad_s, t.forward_speed_m_s,
                   t.vertical_speed_m_s, t.payload_x_m}) {
    hash->Add(v);
  }
  for (int i : {model::kLeft, model::kRight}) {
    hash->Add(t.wheel_angle_rad[i]);
    hash->Add(t.wheel_rate_rad_s[i]);
    const WheelContact& c = plant.contact().wheels[i];
    for (double v :
         {c.normal_N, c.traction_N, c.lateral_N, c.friction, c.slip_ratio, c.friction_use}) {
      hash->Add(v);
    }
    const MotorOutput& m = plant.motors()[i];
    for (double v : {m.voltage_V, m.current_A, m.wheel_torque_Nm}) hash->Add(v);
  }
  hash->Add(plant.contact().chassis_on_ground ? 1 : 0);
}

// Adds the sensor sample the controller would read now.
inline void AddSensors(const Plant& plant, TraceHash* hash) {
  const SensorSample s = plant.Sense();
  hash->Add(s.time_s);
  for (double v : s.gyro_rad_s) hash->Add(v);
  for (double v : s.accel_m_s2) hash->Add(v);
  for (double v : s.encoder_angle_rad) hash->Add(v);
  for (double v : s.encoder_rate_rad_s) hash->Add(v);
}

}  // namespace upright::sim::testing
