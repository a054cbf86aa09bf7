// The one place that states upright's frames, signs and units; every other file refers here.
// Nothing flows through this header at run time: it is constants and documentation.
#pragma once

namespace upright::model {

// Units: SI everywhere inside the program (m, kg, s, rad, N, N·m, V, A). File fields and table
// columns carry their unit in their name where it is not obvious (`max_tilt_deg`, `mass_kg`).
// π is std::numbers::pi.
//
// World frame: x forward (the robot's initial heading), y left, z up; right-handed; gravity −z.
// Body frame: fixed to the chassis, origin at the axle midpoint, same axes as the world frame when
// the robot stands upright at zero yaw.
//
// Pitch θ: rotation about body +y. θ > 0 when the chassis leans forward (its top moves toward +x,
//   its centre of mass ahead of the axle).
// Yaw ψ: rotation about +z. ψ > 0 turns left. Roll: rotation about +x; > 0 raises the left side.
// Wheel angle φ: rotation of a wheel about body +y. φ̇ > 0 rolls the robot forward. Encoders
//   measure the angle of the wheel RELATIVE to the chassis, φ_rel = φ_abs − θ; the ground
//   position of a rolling wheel is x = r (φ_rel + θ).
// Wheel torque τ: applied by the motor about +y, +τ on the wheel and −τ on the chassis; a
//   positive torque drives forward and pitches the chassis back.
// Left wheel at y = +track/2, right wheel at y = −track/2. Arrays of two are [left, right].
// Gyro: body-frame angular rate (rad/s); a forward lean rate reads +y.
// Accelerometer: body-frame specific force f = Rᵀ(a − g), m/s²; a robot at rest reads +9.81 on z,
//   and one standing still tilted forward by θ reads −g sin θ on x (tilt = atan2(−f_x, f_z)).

inline constexpr double kStandardGravity_m_s2 = 9.80665;  // CGPM 1901 standard gravity
inline constexpr int kLeft = 0;
inline constexpr int kRight = 1;

}  // namespace upright::model
