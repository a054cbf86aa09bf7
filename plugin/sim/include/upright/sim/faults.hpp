// Faults a scenario can inject into the plant: a motor that loses torque (derating, or dead) and
// a sensor channel that goes wrong (a bias step, a dropout to zero, a value stuck where it was).
// The plant applies them from their start time, to the physics step, like pushes.
#pragma once

#include <limits>
#include <string>

#include "upright/base/result.hpp"

namespace upright::sim {

// Faults are on or off for whole physics steps (pushes, by contrast, act with their exact mean
// force over each step they overlap). Step k spans [k dt, (k+1) dt), as for pushes; a fault
// starting at t_s takes effect at the first step k with k dt >= t_s − 1e-9 dt: a start on a step
// boundary (up to round-off) takes effect at that step, one between steps at the next. Returns
// that k (0 for t_s <= 0), or the largest long for a time no run reaches (infinity included).
long FirstStepAtOrAfter(double t_s, double dt_s);

enum class MotorSide { kLeft, kRight, kBoth };

// From start_s on, the motor's electromagnetic torque is multiplied by torque_scale: 1 healthy,
// 0.5 derated to half, 0 dead (an open circuit: no current, no back-EMF braking; the gearbox
// friction remains). A derated motor draws the current of a healthy one (the drive does not see
// the fault) and delivers torque_scale of its n η K_t i (motor.hpp, EvaluateMotor).
// It acts on every physics step from FirstStepAtOrAfter(start_s, dt) on and never ends; of
// several faults on one motor the latest started acts (a later torque_scale = 1 repairs it).
struct MotorFault {
  double start_s = 0;
  MotorSide side = MotorSide::kLeft;
  double torque_scale = 0;  // in [0, 1]
  // The broken rule, naming the field and value; success when there is none.
  Status Validate() const;
};

enum class SensorChannel {
  kGyroX, kGyroY, kGyroZ,     // body-frame rates
  kAccelX, kAccelY, kAccelZ,  // body-frame specific force
  kEncoderLeft, kEncoderRight,
};

enum class SensorFaultKind {
  kBias,     // adds `value` (rad/s, m/s² or rad, the channel's unit) before quantisation
  kDropout,  // the reading is 0
  kStuck,    // the reading stays at the channel's last sample before the fault began
};

// Active for samples taken in [start_s, start_s + duration_s); an infinite duration lasts to the
// end of the run. Exactly: a sample of the state after m physics steps is faulted when
// FirstStepAtOrAfter(start_s, dt) <= m < FirstStepAtOrAfter(start_s + duration_s, dt). The IMU
// samples at its own rate (a fault shorter than its period may miss every sample); encoders are
// sampled every step. A faulted sample reaches the controller the sensors' latency later, like
// any other. Encoder rates follow the faulted angles. Of several faults active on one channel for
// a sample, the latest started acts (the last added among equal starts).
struct SensorFault {
  double start_s = 0;
  double duration_s = std::numeric_limits<double>::infinity();
  SensorChannel channel = SensorChannel::kGyroY;
  SensorFaultKind kind = SensorFaultKind::kBias;
  double value = 0;  // kBias only (must be finite then); other kinds ignore it
  // The broken rule, naming the field and value; success when there is none.
  Status Validate() const;
};

// Names as written in files and tables: "left", "right", "both"; "gyro_x" … "accel_z",
// "encoder_left", "encoder_right"; "bias", "dropout", "stuck". FromString leaves *out untouched
// and returns false for any other text.
const char* ToString(MotorSide side);
const char* ToString(SensorChannel channel);
const char* ToString(SensorFaultKind kind);
bool FromString(const std::string& text, MotorSide* side);
bool FromString(const std::string& text, SensorChannel* channel);
bool FromString(const std::string& text, SensorFaultKind* kind);

}  // namespace upright::sim
