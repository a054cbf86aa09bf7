// Ideal sensors on the linear robot: the signs of conventions.hpp, and agreement with the
// sensor linearisation the estimators are designed with.
#include "upright/runner/twin/twin_sensors.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "succeeded.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::runner {
namespace {

using design::kPitch, design::kPitchRate, design::kX, design::kXDot, design::kYaw, design::kYawRate;

model::RobotModel Courier() {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(Succeeded(loaded));
  return loaded.value_or(model::RobotModel{});
}

TEST(TwinSensors, ReadTheSignsOfTheConventions) {
  const model::RobotModel model = Courier();
  const TwinSensorGeometry geometry = SensorGeometry(model, 0, 0);
  const double g = model::kStandardGravity_m_s2;
  // Standing still, tilted forward by 0.1 rad: −g sin θ on x, g cos θ on z (conventions.hpp).
  design::StateVector x = design::StateVector::Zero();
  x(kPitch) = 0.1;
  const sim::SensorSample tilted = IdealSensors(geometry, 0.5, x, design::StateVector::Zero());
  EXPECT_DOUBLE_EQ(tilted.time_s, 0.5);
  EXPECT_NEAR(tilted.accel_m_s2[0], -g * std::sin(0.1), 1e-12);
  EXPECT_NEAR(tilted.accel_m_s2[2], g * std::cos(0.1), 1e-12);
  // The chassis tilted forward in place: each wheel turned back by as much relative to it.
  EXPECT_NEAR(tilted.encoder_angle_rad[model::kLeft], -0.1, 1e-15);
  EXPECT_NEAR(tilted.encoder_angle_rad[model::kRight], -0.1, 1e-15);

  // Rolling forward 0.16 m upright: both wheels +1 rad. Leaning forward: the gyro reads +y.
  // Turning left: the right wheel runs ahead, the gyro reads +z.
  x.setZero();
  x(kX) = model.wheel.radius_m;
  x(kYaw) = 0.2;
  x(kPitchRate) = 0.3;
  x(kYawRate) = 0.4;
  const sim::SensorSample moving = IdealSensors(geometry, 0, x, design::StateVector::Zero());
  const double turn = model.wheel.track_m / 2 * 0.2 / model.wheel.radius_m;
  EXPECT_NEAR(moving.encoder_angle_rad[model::kLeft], 1 - turn, 1e-12);
  EXPECT_NEAR(moving.encoder_angle_rad[model::kRight], 1 + turn, 1e-12);
  EXPECT_EQ(moving.gyro_rad_s[1], 0.3);
  EXPECT_EQ(moving.gyro_rad_s[2], 0.4);
  EXPECT_LT(moving.encoder_rate_rad_s[model::kLeft], moving.encoder_rate_rad_s[model::kRight]);
}

TEST(TwinSensors, AgreeWithTheSensorLinearisationTheEstimatorsUse) {
  const model::RobotModel model = Courier();
  ASSERT_EQ(model.sensors.imu_y_m, 0);  // LineariseSensors' accelerometer row assumes it
  const design::LinearModel linear = design::Linearise(model, design::InputKind::kTorque);
  ASSERT_EQ(linear.equilibrium_pitch_rad, 0);
  const design::SensorLinearisation lin = design::LineariseSensors(model, linear);
  const TwinSensorGeometry geometry = SensorGeometry(model, 0, 0);
  design::StateVector x;
  x << 0.3, -0.2, 1e-3, 0.05, 0.01, -0.02;  // a small tilt, so sin θ ≈ θ to 2e-10
  const Eigen::Vector2d u(1.5, 0.5);
  const design::StateVector dx = linear.A * x + linear.B * u;
  const sim::SensorSample s = IdealSensors(geometry, 0, x, dx);
  const Eigen::VectorXd y = lin.C * x + lin.D * u;
  const double g = model::kStandardGravity_m_s2;
  EXPECT_NEAR((s.encoder_angle_rad[model::kLeft] + s.encoder_angle_rad[model::kRight]) / 2, y(0),
              1e-12);
  EXPECT_NEAR(s.gyro_rad_s[1], y(1), 1e-15);
  EXPECT_NEAR(model.wheel.radius_m *
                  (s.encoder_angle_rad[model::kRight] - s.encoder_angle_rad[model::kLeft]) /
                  model.wheel.track_m,
              y(2), 1e-12);
  EXPECT_NEAR(s.gyro_rad_s[2], y(3), 1e-15);
  EXPECT_NEAR(s.accel_m_s2[0] / g, y(4), 1e-9);
}

TEST(TwinSensors, EncodersReadZeroAtTheStartOfATiltedRun) {
  const model::RobotModel model = Courier();
  const TwinSensorGeometry geometry = SensorGeometry(model, 0, 0.05);
  design::StateVector x = design::StateVector::Zero();
  x(kPitch) = 0.05;
  const sim::SensorSample start = IdealSensors(geometry, 0, x, design::StateVector::Zero());
  EXPECT_EQ(start.encoder_angle_rad[model::kLeft], 0);
  EXPECT_EQ(start.encoder_angle_rad[model::kRight], 0);
  // Rolling r·0.1 forward while straightening to upright: 0.1 rad of roll plus 0.05 rad of the
  // chassis turning back relative to the wheels.
  x(kPitch) = 0;
  x(kX) = 0.1 * model.wheel.radius_m;
  const sim::SensorSample later = IdealSensors(geometry, 1, x, design::StateVector::Zero());
  EXPECT_NEAR(later.encoder_angle_rad[model::kLeft], 0.15, 1e-12);
}

}  // namespace
}  // namespace upright::runner
