// DC motor and gearbox of one wheel: a command (terminal voltage, or wheel torque through a
// current-limited drive), the wheel's speed relative to the chassis and a fault's torque scale →
// current and wheel torque. Armature inductance is neglected (electrical time constant ≪ the step).
#pragma once

#include <cmath>
#include <string>

#include "upright/model/robot_model.hpp"

namespace upright::sim {

enum class DriveMode {
  kVoltage,  // command = motor terminal voltage, V; the drive still limits current
  kTorque,   // command = wheel torque, N·m; the drive sets current, up to the supply voltage
};

// A value counts as at its limit when |value| >= (1 − kLimitTolerance) · limit: a command clamped
// at exactly a limit, or a current that reaches it up to rounding, is at the limit.
inline constexpr double kLimitTolerance = 1e-6;

// True when |value| is at or beyond `limit` (> 0) within kLimitTolerance of it.
inline bool AtOrBeyondLimit(double value, double limit) {
  return std::abs(value) >= (1 - kLimitTolerance) * limit;
}

struct MotorOutput {
  double voltage_V = 0;        // terminal voltage applied
  double current_A = 0;        // armature current
  double wheel_torque_Nm = 0;  // on the wheel (and −this on the chassis), friction included
  // The voltage asked for (the command, or what a torque command needs) at or beyond the supply.
  bool voltage_saturated = false;
  // The current asked for, or the current that flows, at or beyond the drive's current limit.
  bool current_saturated = false;
  double power_W() const { return voltage_V * current_A; }  // electrical power drawn
};

// One evaluation of the motor equations:
//   i = (V − K_e n ω_rel) / R, |V| ≤ supply, |i| ≤ current limit (each "saturated" when at its
//   limit within kLimitTolerance),
//   τ_wheel = s · n η K_t i − b ω_rel − c · sat(ω_rel / coulomb_band)
// ω_rel: wheel speed relative to the chassis, rad/s. coulomb_band_rad_s > 0 smooths the Coulomb
// friction's sign near zero speed (see MotorCoulombBand). s = torque_scale in [0, 1] is a motor
// fault (faults.hpp): for s > 0 voltage and current are those of a healthy motor and only the
// electromagnetic torque is scaled; s = 0 is an open circuit: V = 0, i = 0 (so no back-EMF
// braking and no power drawn), no saturation, and only the friction terms remain.
MotorOutput EvaluateMotor(const model::MotorModel& motor, DriveMode mode, double command,
                          double rel_speed_rad_s, double coulomb_band_rad_s,
                          double torque_scale = 1.0);

// The speed band over which Coulomb friction ramps linearly from −c to +c: wide enough that the
// explicit friction term stays stable at step dt_s on a wheel of spin inertia I, narrow enough
// (≥ 1e-3 rad/s) to look like a sharp Coulomb law.
double MotorCoulombBand(const model::MotorModel& motor, double spin_inertia_kgm2, double dt_s);

const char* ToString(DriveMode mode);
bool FromString(const std::string& text, DriveMode* mode);

}  // namespace upright::sim
