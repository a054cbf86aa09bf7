// Reading and setting one robot model field by its file name (element, attribute): the same
// values the loader reads, the same range rules, and clear refusals.
#include "upright/model/model_field.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "upright/model/model_file.hpp"

namespace upright {
namespace {

RobotModel Courier() {
  const auto loaded = LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(loaded.ok());
  return loaded.model;
}

TEST(ModelField, ReadsWhatTheFileSays) {
  const RobotModel model = Courier();
  double value = 0;
  std::string error;
  ASSERT_TRUE(GetModelField(model, "chassis", "mass_kg", &value, &error)) << error;
  EXPECT_EQ(value, model.chassis.mass_kg);
  ASSERT_TRUE(GetModelField(model, "sensors/gyro", "bias_y_rad_s", &value, &error)) << error;
  EXPECT_EQ(value, model.sensors.gyro_bias_y_rad_s);
  ASSERT_TRUE(GetModelField(model, "wheels", "friction", &value, &error)) << error;
  EXPECT_EQ(value, model.wheel.friction);
}

TEST(ModelField, SetsOnlyThatField) {
  RobotModel model = Courier();
  const RobotModel before = model;
  std::string error;
  ASSERT_TRUE(SetModelField(&model, "motor", "torque_constant_Nm_per_A", 0.05, &error)) << error;
  EXPECT_EQ(model.motor.torque_constant_Nm_per_A, 0.05);
  EXPECT_EQ(model.motor.back_emf_V_s_per_rad, before.motor.back_emf_V_s_per_rad);
  EXPECT_EQ(model.chassis.mass_kg, before.chassis.mass_kg);
  EXPECT_TRUE(ValidateModel(model).empty());
}

TEST(ModelField, RefusesAValueOutsideTheFieldsRangeAndLeavesTheModel) {
  RobotModel model = Courier();
  std::string error;
  EXPECT_FALSE(SetModelField(&model, "chassis", "mass_kg", -3, &error));
  EXPECT_EQ(error, "chassis mass_kg = -3: must be in (0, 1000]");
  EXPECT_EQ(model.chassis.mass_kg, Courier().chassis.mass_kg);
  EXPECT_FALSE(SetModelField(&model, "sensors/encoder", "counts_per_rev", 100.5, &error));
  EXPECT_FALSE(SetModelField(&model, "chassis", "mass_kg", std::nan(""), &error));
}

TEST(ModelField, NamesTheKnownFieldsForAnUnknownOne) {
  RobotModel model = Courier();
  std::string error;
  EXPECT_FALSE(SetModelField(&model, "chassis", "mass_kilograms", 3, &error));
  EXPECT_EQ(
      error.rfind("no robot model field chassis.mass_kilograms (fields: chassis.mass_kg, ", 0), 0u)
      << error;
  double value = 0;
  EXPECT_FALSE(GetModelField(model, "chassis/uniform_block", "length_m", &value, &error));
  EXPECT_NE(error.find("only shapes other fields"), std::string::npos) << error;
}

TEST(ModelField, RefusesAFieldOfAnElementTheRobotLacks) {
  const auto loaded = LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/tabletop.xml");
  ASSERT_TRUE(loaded.ok());
  RobotModel model = loaded.model;
  ASSERT_FALSE(model.payload.present);
  std::string error;
  EXPECT_FALSE(SetModelField(&model, "payload", "mass_kg", 1, &error));
  EXPECT_EQ(error, "robot 'tabletop' has no <payload> element, so payload.mass_kg cannot be set");
}

}  // namespace
}  // namespace upright
