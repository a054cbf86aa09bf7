#include "upright/sim/motor.hpp"

#include <algorithm>
#include <cmath>

#include "upright/model/check.hpp"

namespace upright::sim {

MotorOutput EvaluateMotor(const model::MotorModel& m, DriveMode mode, double command,
                          double rel_speed_rad_s, double coulomb_band_rad_s, double torque_scale) {
  UPRIGHT_CHECK(torque_scale >= 0 && torque_scale <= 1, "torque_scale = %g", torque_scale);
  const double coulomb_Nm =
      m.coulomb_friction_Nm * std::clamp(rel_speed_rad_s / coulomb_band_rad_s, -1.0, 1.0);
  const double viscous_Nm = m.viscous_friction_Nm_s_per_rad * rel_speed_rad_s;
  MotorOutput out;
  if (torque_scale == 0) {  // open circuit: nothing flows, only the gearbox drags
    out.wheel_torque_Nm = -viscous_Nm - coulomb_Nm;
    return out;
  }
  const double back_emf_V = m.back_emf_V_s_per_rad * m.gear_ratio * rel_speed_rad_s;
  const double limit_A = m.current_limit_A;
  if (mode == DriveMode::kVoltage) {
    out.voltage_saturated = AtOrBeyondLimit(command, m.supply_V);
    out.voltage_V = std::clamp(command, -m.supply_V, m.supply_V);
    out.current_A = (out.voltage_V - back_emf_V) / m.resistance_ohm;
  } else {
    // Current-limited torque drive: the current that gives the commanded wheel torque, if the
    // supply can push it against the back-EMF.
    const double torque_per_A = m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A;
    out.current_A = command / torque_per_A;
    out.current_saturated = AtOrBeyondLimit(out.current_A, limit_A);
    out.current_A = std::clamp(out.current_A, -limit_A, limit_A);
    out.voltage_V = m.resistance_ohm * out.current_A + back_emf_V;
    out.voltage_saturated = AtOrBeyondLimit(out.voltage_V, m.supply_V);
    if (std::abs(out.voltage_V) > m.supply_V) {
      out.voltage_V = std::clamp(out.voltage_V, -m.supply_V, m.supply_V);
      out.current_A = (out.voltage_V - back_emf_V) / m.resistance_ohm;
    }
  }
  // The drive's current limit holds in both modes (it lowers the terminal voltage to do so).
  if (std::abs(out.current_A) > limit_A) {
    out.current_A = std::clamp(out.current_A, -limit_A, limit_A);
    out.voltage_V = m.resistance_ohm * out.current_A + back_emf_V;
  }
  out.current_saturated = out.current_saturated || AtOrBeyondLimit(out.current_A, limit_A);
  out.wheel_torque_Nm = torque_scale * m.gear_ratio * m.gear_efficiency *
                            m.torque_constant_Nm_per_A * out.current_A -
                        viscous_Nm - coulomb_Nm;
  return out;
}

double MotorCoulombBand(const model::MotorModel& m, double spin_inertia_kgm2, double dt_s) {
  // Inside the band the friction acts as a damper of slope c / band; an explicit step stays well
  // inside its stability limit (slope · dt / I < 2) when slope · dt / I ≤ 0.5.
  const double stable_band = 2.0 * m.coulomb_friction_Nm * dt_s / spin_inertia_kgm2;
  return std::max(1e-3, stable_band);
}

const char* ToString(DriveMode mode) {
  return mode == DriveMode::kVoltage ? "voltage" : "torque";
}

bool FromString(const std::string& text, DriveMode* mode) {
  if (text == "voltage") *mode = DriveMode::kVoltage;
  else if (text == "torque") *mode = DriveMode::kTorque;
  else return false;
  return true;
}

}  // namespace upright::sim
