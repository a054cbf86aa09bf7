#include "kit/imu_kinematics.hpp"

#include <cmath>

#include "upright/model/conventions.hpp"

namespace upright::controllers {

Eigen::Vector3d SpecificForceAtAxle(const Eigen::Vector3d& imu_specific_force_m_s2,
                                    const Eigen::Vector3d& imu_m, const Eigen::Vector3d& rate_rad_s,
                                    const Eigen::Vector3d& accel_rad_s2) {
  const Eigen::Vector3d tangential = accel_rad_s2.cross(imu_m);
  const Eigen::Vector3d centripetal = rate_rad_s.cross(rate_rad_s.cross(imu_m));
  return imu_specific_force_m_s2 - tangential - centripetal;
}

double AccelerometerPitch(double f_x_m_s2, double f_z_m_s2, double horizontal_accel_m_s2) {
  const double a = horizontal_accel_m_s2, g = model::kStandardGravity_m_s2;
  return std::atan2(a * f_z_m_s2 - g * f_x_m_s2, a * f_x_m_s2 + g * f_z_m_s2);
}

double HorizontalAcceleration(double f_x_m_s2, double f_z_m_s2, double pitch_rad) {
  return f_x_m_s2 * std::cos(pitch_rad) + f_z_m_s2 * std::sin(pitch_rad);
}

}  // namespace upright::controllers
