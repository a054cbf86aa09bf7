// The accelerometer's reading moved from the IMU to the axle: against the specific force of a
// known motion written out in the world frame (the IMU point's position differentiated twice by
// hand, then turned into the body frame), the rotation's apparent acceleration cancels exactly,
// and the pitch and the axle's acceleration come back.
#include "kit/imu_kinematics.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "upright/model/conventions.hpp"

namespace upright::controllers {
namespace {

constexpr double kG = model::kStandardGravity_m_s2;

// Pitch θ about body y (conventions.hpp: body x = (cos θ, 0, −sin θ) in the world).
Eigen::Matrix3d Pitch(double theta) {
  return Eigen::AngleAxisd(theta, Eigen::Vector3d::UnitY()).toRotationMatrix();
}

Eigen::Matrix3d Yaw(double psi) {
  return Eigen::AngleAxisd(psi, Eigen::Vector3d::UnitZ()).toRotationMatrix();
}

TEST(SpecificForceAtAxle, CancelsAPitchingChassisOnAnAcceleratingAxle) {
  // Axle accelerating forward at a; chassis at θ, θ̇, θ̈; IMU at r = (d, 0, h) in the body.
  // World: p = x ê_x + R(θ) r, with R(θ) r = (d cos θ + h sin θ, 0, −d sin θ + h cos θ), so
  //   p̈ = a ê_x + θ̈ (−d sin θ + h cos θ, 0, −d cos θ − h sin θ)
  //             + θ̇² (−d cos θ − h sin θ, 0, d sin θ − h cos θ)   (derived by hand),
  // and the IMU reads f = Rᵀ (p̈ + g ê_z). The axle's own reading is Rᵀ (a ê_x + g ê_z).
  const double a = 1.3, theta = 0.21, rate = -0.8, accel = 12.5, d = 0.05, h = 0.25;
  const double c = std::cos(theta), s = std::sin(theta);
  const Eigen::Vector3d p_ddot = Eigen::Vector3d(a, 0, 0) +
                                 accel * Eigen::Vector3d(-d * s + h * c, 0, -d * c - h * s) +
                                 rate * rate * Eigen::Vector3d(-d * c - h * s, 0, d * s - h * c);
  const Eigen::Matrix3d R = Pitch(theta);
  const Eigen::Vector3d imu = R.transpose() * (p_ddot + Eigen::Vector3d(0, 0, kG));
  const Eigen::Vector3d axle = R.transpose() * Eigen::Vector3d(a, 0, kG);
  const Eigen::Vector3d moved = SpecificForceAtAxle(
      imu, Eigen::Vector3d(d, 0, h), Eigen::Vector3d(0, rate, 0), Eigen::Vector3d(0, accel, 0));
  EXPECT_LT((moved - axle).norm(), 1e-12);
  // The rotation's share was large: the check is not passing on a small term.
  EXPECT_GT((imu - axle).norm(), 3.0);
  EXPECT_NEAR(AccelerometerPitch(moved(0), moved(2), a), theta, 1e-14);
  EXPECT_NEAR(HorizontalAcceleration(moved(0), moved(2), theta), a, 1e-13);
}

TEST(SpecificForceAtAxle, CancelsATurnOnTheSpot) {
  // Upright, yawing at ψ̇ with ψ̈, IMU at r = (d, y, h): the IMU point circles the axle midpoint,
  // p = Rz(ψ) r, p̈ = ψ̈ Rz(ψ) (−y, d, 0) − ψ̇² Rz(ψ) (d, y, 0) (derived by hand). The axle
  // midpoint stands still and reads gravity alone.
  const double psi = 0.7, rate = 1.9, accel = -4.0, d = 0.05, y = 0.03, h = 0.25;
  const Eigen::Matrix3d R = Yaw(psi);
  const Eigen::Vector3d p_ddot =
      accel * (R * Eigen::Vector3d(-y, d, 0)) - rate * rate * (R * Eigen::Vector3d(d, y, 0));
  const Eigen::Vector3d imu = R.transpose() * (p_ddot + Eigen::Vector3d(0, 0, kG));
  const Eigen::Vector3d moved = SpecificForceAtAxle(
      imu, Eigen::Vector3d(d, y, h), Eigen::Vector3d(0, 0, rate), Eigen::Vector3d(0, 0, accel));
  EXPECT_LT((moved - Eigen::Vector3d(0, 0, kG)).norm(), 1e-12);
  EXPECT_GT((imu - Eigen::Vector3d(0, 0, kG)).norm(), 0.2);
  EXPECT_NEAR(AccelerometerPitch(moved(0), moved(2)), 0, 1e-15);
}

TEST(AccelerometerPitch, IsExactAtLargeAnglesAndAccelerations) {
  // f = Rᵀ (a ê_x + g ê_z) for θ up to ±1.2 rad and a up to ±5 m/s²: the pitch and the
  // acceleration come back to rounding, with no small-angle step anywhere.
  for (double theta : {-1.2, -0.3, 0.0, 0.4, 1.2}) {
    for (double a : {-5.0, -0.5, 0.0, 2.0, 5.0}) {
      const Eigen::Vector3d f = Pitch(theta).transpose() * Eigen::Vector3d(a, 0, kG);
      EXPECT_NEAR(AccelerometerPitch(f(0), f(2), a), theta, 1e-14) << theta << " " << a;
      EXPECT_NEAR(HorizontalAcceleration(f(0), f(2), theta), a, 1e-13) << theta << " " << a;
    }
  }
}

}  // namespace
}  // namespace upright::controllers
