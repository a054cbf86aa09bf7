// Plant: one run's physics — a fresh headless Bullet world holding the robot (chassis, two wheels,
// optional payload), the terrain, motors and sensors. Wheel commands and pushes go in; the true
// state, sampled sensors, motor and contact readouts come out, one fixed physics step at a time.
// Motor and sensor faults go in like pushes, timed to the step (faults.hpp).
#pragma once

#include <array>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/faults.hpp"
#include "upright/sim/motor.hpp"
#include "upright/sim/push.hpp"
#include "upright/sim/terrain.hpp"

namespace upright::sim {

// Where and how the robot starts. The wheels rest on the ground below the axle.
struct InitialState {
  double x_m = 0;          // axle midpoint, world x
  double pitch_rad = 0;    // chassis tilt from vertical, + = forward
  double speed_m_s = 0;    // forward speed of the axle, wheels rolling without slip
};

struct PlantOptions {
  double dt_s = 0.001;            // fixed physics step
  int solver_iterations = 10;     // Bullet constraint-solver iterations per step
  Terrain terrain;                // flat ground by default
  InitialState initial;
  DriveMode drive = DriveMode::kVoltage;  // what WheelCommand values mean
  std::uint64_t seed = 1;         // sensor noise stream
  bool sensor_noise = true;       // false: sensors are exact but still quantised and delayed
  bool fixed_chassis = false;     // test stand: chassis held in the air, wheels spin freely
  double fixed_height_m = 1.0;    // fixed_chassis: axle height above the ground
  double chassis_friction = 0.5;  // chassis and payload against the ground (after a fall)
  // The first broken rule ("PlantOptions::dt_s = -0.001, must be in (0, 0.01]"); success when
  // there is none.
  Status Validate() const;
};

// The exact state of the robot (the "perfect sensing" view), world frame unless stated.
struct TrueState {
  double time_s = 0;
  double x_m = 0, y_m = 0, z_m = 0;  // axle midpoint
  double pitch_rad = 0, roll_rad = 0, yaw_rad = 0;  // Z-Y-X Euler angles of the chassis
  double pitch_rate_rad_s = 0, roll_rate_rad_s = 0, yaw_rate_rad_s = 0;  // Euler-angle rates
  double forward_speed_m_s = 0;  // axle midpoint velocity along the heading
  double vertical_speed_m_s = 0;
  std::array<double, 2> wheel_angle_rad{};      // relative to the chassis, [left, right]
  std::array<double, 2> wheel_rate_rad_s{};     // relative to the chassis, [left, right]
  double payload_x_m = 0;  // payload centre along the deck (body x), when present
};

// What the sensors deliver, as a controller sees it: sampled, noisy, biased, quantised, delayed.
struct SensorSample {
  double time_s = 0;                           // when the controller reads it
  std::array<double, 3> gyro_rad_s{};          // body-frame angular rate, [x, y, z]
  std::array<double, 3> accel_m_s2{};          // body-frame specific force, [x, y, z]
  std::array<double, 2> encoder_angle_rad{};   // quantised, relative to the chassis, [left, right]
  std::array<double, 2> encoder_rate_rad_s{};  // count difference over one control period
};

struct WheelContact {
  bool touching = false;
  double normal_N = 0;      // normal load from the ground
  double traction_N = 0;    // friction force along the heading, + pushes the robot forward
  double lateral_N = 0;     // friction force across the heading, + toward the left
  double friction = 0;      // the friction coefficient in effect at the contact
  double slip_ratio = 0;    // (ω r − v) / max(|ω r|, |v|, 1e-3): + spinning, − skidding
  double friction_use = 0;  // |friction force| / (μ N): 1 means sliding
};

struct ContactState {
  std::array<WheelContact, 2> wheels;  // [left, right]
  bool chassis_on_ground = false;      // chassis or payload touches the ground: a fall
};

// Per wheel, as last evaluated; [left, right].
using MotorState = std::array<MotorOutput, 2>;

namespace internal {
class PlantImpl;
}

class Plant {
 public:
  // Builds the world; a failure naming the broken rule when the model or options are invalid.
  static Result<std::unique_ptr<Plant>> Create(const model::RobotModel& model,
                                               const PlantOptions& options);
  ~Plant();
  Plant(const Plant&) = delete;
  Plant& operator=(const Plant&) = delete;

  // Wheel commands, [left, right], in volts or newton-metres (PlantOptions::drive); held until
  // changed (zero-order hold).
  void SetCommand(double left, double right);
  // A push, evaluated at every step it overlaps. A failure when the push is invalid.
  Status AddPush(const Push& push);
  // A motor fault, acting on every step from FirstStepAtOrAfter(start_s, dt_s) on; motors()
  // reports the faulted current, torque and power. A failure when it is invalid.
  Status AddMotorFault(const MotorFault& fault);
  // A sensor fault on the samples of the states in its window (faults.hpp), seen through Sense()
  // after the latency; one starting at 0 added before the first Step() covers the initial sample
  // too. A failure when it is invalid.
  Status AddSensorFault(const SensorFault& fault);
  // Payload carriage target along the deck, body x (m); clamped to the travel limits.
  void SetPayloadTarget(double x_m);
  // Advances one physics step of PlantOptions::dt_s.
  void Step();

  double time_s() const;
  long step_count() const;
  const TrueState& truth() const;
  // The latest sensor sample as the controller sees it now (latency applied).
  SensorSample Sense() const;
  const MotorState& motors() const;
  const ContactState& contact() const;
  const model::RobotModel& model() const;
  const PlantOptions& options() const;
  // True once the physics state has become non-finite (a numeric failure); stepping stops.
  bool diverged() const;

 private:
  explicit Plant(std::unique_ptr<internal::PlantImpl> impl);
  std::unique_ptr<internal::PlantImpl> impl_;
};

}  // namespace upright::sim
