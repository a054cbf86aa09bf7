// Reading and setting one robot model field by its file name (element, attribute): the same
// values the loader reads, the same range rules, and clear refusals.
#include "upright/model/model_field.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "upright/model/model_file.hpp"

namespace upright {
namespace {

model::RobotModel Courier() {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(loaded.has_value());
  return loaded.value_or(model::RobotModel{});
}

TEST(ModelField, ReadsWhatTheFileSays) {
  const model::RobotModel model = Courier();
  const Result<double> mass = model::GetModelField(model, "chassis", "mass_kg");
  ASSERT_TRUE(mass.has_value()) << mass.error();
  EXPECT_EQ(*mass, model.chassis.mass_kg);
  const Result<double> bias = model::GetModelField(model, "sensors/gyro", "bias_y_rad_s");
  ASSERT_TRUE(bias.has_value()) << bias.error();
  EXPECT_EQ(*bias, model.sensors.gyro_bias_y_rad_s);
  const Result<double> friction = model::GetModelField(model, "wheels", "friction");
  ASSERT_TRUE(friction.has_value()) << friction.error();
  EXPECT_EQ(*friction, model.wheel.friction);
}

TEST(ModelField, SetsOnlyThatField) {
  model::RobotModel model = Courier();
  const model::RobotModel before = model;
  const Status set = model::SetModelField(&model, "motor", "torque_constant_Nm_per_A", 0.05);
  ASSERT_TRUE(set.has_value()) << set.error();
  EXPECT_EQ(model.motor.torque_constant_Nm_per_A, 0.05);
  EXPECT_EQ(model.motor.back_emf_V_s_per_rad, before.motor.back_emf_V_s_per_rad);
  EXPECT_EQ(model.chassis.mass_kg, before.chassis.mass_kg);
  EXPECT_TRUE(model::ValidateModel(model).has_value());
}

TEST(ModelField, RefusesAValueOutsideTheFieldsRangeAndLeavesTheModel) {
  model::RobotModel model = Courier();
  const Status negative = model::SetModelField(&model, "chassis", "mass_kg", -3);
  ASSERT_FALSE(negative.has_value());
  EXPECT_EQ(negative.error(), "chassis mass_kg = -3: must be in (0, 1000]");
  EXPECT_EQ(model.chassis.mass_kg, Courier().chassis.mass_kg);
  EXPECT_FALSE(
      model::SetModelField(&model, "sensors/encoder", "counts_per_rev", 100.5).has_value());
  EXPECT_FALSE(model::SetModelField(&model, "chassis", "mass_kg", std::nan("")).has_value());
}

TEST(ModelField, NamesTheKnownFieldsForAnUnknownOne) {
  model::RobotModel model = Courier();
  const Status unknown = model::SetModelField(&model, "chassis", "mass_kilograms", 3);
  ASSERT_FALSE(unknown.has_value());
  EXPECT_EQ(unknown.error().rfind(
                "no robot model field chassis.mass_kilograms (fields: chassis.mass_kg, ", 0),
            0u)
      << unknown.error();
  const Result<double> file_only = model::GetModelField(model, "chassis/uniform_block", "length_m");
  ASSERT_FALSE(file_only.has_value());
  EXPECT_NE(file_only.error().find("only shapes other fields"), std::string::npos)
      << file_only.error();
}

TEST(ModelField, RefusesAFieldOfAnElementTheRobotLacks) {
  const auto loaded =
      model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/tabletop.xml");
  ASSERT_TRUE(loaded.has_value());
  model::RobotModel model = *loaded;
  ASSERT_FALSE(model.payload.present);
  const Status lacking = model::SetModelField(&model, "payload", "mass_kg", 1);
  ASSERT_FALSE(lacking.has_value());
  EXPECT_EQ(lacking.error(),
            "robot 'tabletop' has no <payload> element, so payload.mass_kg cannot be set");
}

}  // namespace
}  // namespace upright
