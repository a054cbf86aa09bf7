// IMU kinematics (internal to the built-in modules): what the accelerometer reads at its mounting
// point, moved to the axle midpoint by rigid-body kinematics; and the chassis pitch and the axle's
// horizontal acceleration read from the specific force there.
#pragma once

#include <Eigen/Dense>

namespace upright::controllers {

// The specific force at the axle midpoint from the one the IMU reads at `imu_m` (body frame,
// from the axle midpoint), given the body-frame angular rate ω and angular acceleration α. Two
// points of one rigid body differ in acceleration by α × r + ω × (ω × r) (the relative-
// acceleration equation of rigid-body kinematics, in J. L. Meriam and L. G. Kraige, "Engineering
// Mechanics: Dynamics", its chapters on the relative motion of rigid bodies; from memory), and
// gravity is the same at both, so
//   f_axle = f_imu − α × r − ω × (ω × r).
// In the pitch plane, r = (d, 0, h), ω = θ̇ ŷ, α = θ̈ ŷ, this is f_x − h θ̈ + d θ̇² and
// f_z + d θ̈ + h θ̇²: the tangential terms r θ̈ and the centripetal terms r θ̇².
Eigen::Vector3d SpecificForceAtAxle(const Eigen::Vector3d& imu_specific_force_m_s2,
                                    const Eigen::Vector3d& imu_m, const Eigen::Vector3d& rate_rad_s,
                                    const Eigen::Vector3d& accel_rad_s2);

// The pitch, rad, of a chassis whose axle accelerates horizontally at `horizontal_accel_m_s2`,
// from the body-frame specific force (f_x, f_z) at the axle. f = Rᵀ(a − g) (conventions.hpp)
// gives f_x = a cos θ − g sin θ and f_z = a sin θ + g cos θ: (f_x, f_z) is (a, g) turned by θ,
// so θ = atan2(a f_z − g f_x, a f_x + g f_z), exactly; standing still, atan2(−f_x, f_z).
double AccelerometerPitch(double f_x_m_s2, double f_z_m_s2, double horizontal_accel_m_s2 = 0);

// The axle's horizontal acceleration from the same relation, given the pitch:
// a = f_x cos θ + f_z sin θ. A tilt estimate off by δ puts about g δ into it.
double HorizontalAcceleration(double f_x_m_s2, double f_z_m_s2, double pitch_rad);

}  // namespace upright::controllers
