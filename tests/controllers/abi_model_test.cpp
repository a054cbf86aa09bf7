// The robot as a built-in module reads it from the C ABI: fields appended within version 1 (the
// IMU resolutions, the chassis outline) are read only when the host's struct reaches them, and
// checked when it does.
#include "kit/abi_model.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstddef>
#include <string>

#include "kit/module_context.hpp"

namespace upright::controllers {
namespace {

// A robot the checks accept: every size, rate and motor constant positive.
upright_robot ValidRobot() {
  upright_robot r{};
  r.struct_size = sizeof r;
  r.chassis_mass_kg = 10;
  r.wheel_radius_m = 0.1;
  r.track_m = 0.4;
  r.motor_torque_constant_Nm_per_A = 0.05;
  r.motor_resistance_ohm = 1;
  r.gear_ratio = 10;
  r.gear_efficiency = 0.9;
  r.supply_V = 12;
  r.current_limit_A = 5;
  r.imu_rate_hz = 1000;
  r.encoder_counts_per_rev = 4096;
  r.gyro_resolution_rad_s = 1e-3;
  r.accel_resolution_m_s2 = 2e-3;
  r.outline_front_m = 0.2;
  r.outline_rear_m = -0.1;
  r.outline_bottom_m = -0.05;
  r.outline_top_m = 0.5;
  r.outline_width_m = 0.3;
  return r;
}

std::string CheckError(const upright_robot& robot) {
  const upright_linear_model linear{};  // all zero: finite
  const Result<void, ModuleError> usable = CheckAbiModel(robot, linear);
  if (usable) return "";
  EXPECT_EQ(usable.error().status, UPRIGHT_UNSUPPORTED) << usable.error().message;
  return usable.error().message;
}

TEST(AbiModel, ReadsTheResolutionsWhenTheStructCarriesThem) {
  const model::RobotModel m = RobotFromAbi(ValidRobot(), 200);
  EXPECT_EQ(m.sensors.gyro_resolution_rad_s, 1e-3);
  EXPECT_EQ(m.sensors.accel_resolution_m_s2, 2e-3);
  EXPECT_EQ(CheckError(ValidRobot()), "");
}

TEST(AbiModel, AStructFromBeforeTheResolutionsLeavesThemZeroAndUnchecked) {
  // A host built before the fields were appended: struct_size ends at payload_z_m, and whatever
  // lies beyond (here a bad value) is not the module's to read.
  upright_robot r = ValidRobot();
  r.struct_size = offsetof(upright_robot, payload_z_m) + sizeof r.payload_z_m;
  r.gyro_resolution_rad_s = -1;
  const model::RobotModel m = RobotFromAbi(r, 200);
  EXPECT_EQ(m.sensors.gyro_resolution_rad_s, 0);
  EXPECT_EQ(m.sensors.accel_resolution_m_s2, 0);
  EXPECT_EQ(CheckError(r), "");
}

TEST(AbiModel, ReadsTheOutlineWhenTheStructCarriesIt) {
  const model::RobotModel m = RobotFromAbi(ValidRobot(), 200);
  EXPECT_EQ(m.chassis.outline_front_m, 0.2);
  EXPECT_EQ(m.chassis.outline_rear_m, -0.1);
  EXPECT_EQ(m.chassis.outline_bottom_m, -0.05);
  EXPECT_EQ(m.chassis.outline_top_m, 0.5);
  EXPECT_EQ(m.chassis.outline_width_m, 0.3);
  EXPECT_TRUE(HasOutline(m));
}

TEST(AbiModel, AStructFromBeforeTheOutlineLeavesItUnknownAndUnchecked) {
  // A host built after the resolutions but before the outline: whatever lies past
  // accel_resolution_m_s2 (here a box turned inside out) is not the module's to read.
  upright_robot r = ValidRobot();
  r.struct_size = offsetof(upright_robot, accel_resolution_m_s2) + sizeof(double);
  r.outline_front_m = -1;
  const model::RobotModel m = RobotFromAbi(r, 200);
  EXPECT_FALSE(HasOutline(m));
  EXPECT_EQ(m.sensors.accel_resolution_m_s2, 2e-3);
  EXPECT_EQ(CheckError(r), "");
}

TEST(AbiModel, AnOutlineTurnedInsideOutIsRefused) {
  upright_robot r = ValidRobot();
  r.outline_top_m = -0.1;
  EXPECT_EQ(CheckError(r),
            "robot outline front_m = 0.2, rear_m = -0.1, bottom_m = -0.05, top_m = -0.1, width_m "
            "= 0.3: must be finite, with front_m > rear_m, top_m > bottom_m and width_m > 0");
  r = ValidRobot();
  r.outline_width_m = NAN;
  EXPECT_NE(CheckError(r), "");
}

TEST(AbiModel, ANegativeOrNonFiniteResolutionIsRefusedByName) {
  upright_robot r = ValidRobot();
  r.gyro_resolution_rad_s = -1e-3;
  EXPECT_EQ(CheckError(r), "robot gyro_resolution_rad_s = -0.001: must be >= 0 and finite");
  r = ValidRobot();
  r.accel_resolution_m_s2 = 1.0 / 0.0;
  EXPECT_EQ(CheckError(r), "robot accel_resolution_m_s2 = inf: must be >= 0 and finite");
}

}  // namespace
}  // namespace upright::controllers
