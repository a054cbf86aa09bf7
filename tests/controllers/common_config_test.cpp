// The keys every built-in reads: weights not given are left to the robot (the acceptable tilt
// from its outline) and so is the reference's acceleration; a host whose robot struct carries no
// outline is refused unless the tilt is given.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <string>

#include "kit/config.hpp"
#include "succeeded.hpp"
#include "upright/design/robot_limits.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::controllers {
namespace {

ModuleContext CourierContext(const ConfigEntries& config) {
  ModuleContext context;
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(Succeeded(loaded));
  context.robot = loaded.value_or(model::RobotModel{});
  context.config = config;
  return context;
}

Result<CommonConfig, ModuleError> Read(const ModuleContext& context) {
  ConfigReader reader(context.config);
  const CommonConfig config = ReadCommonConfig(&reader, context, /*voltage_allowed=*/true);
  if (auto read = reader.Finish(); !read) return Failure(read.error());
  return config;
}

TEST(CommonConfig, LeavesTheTiltAndTheAccelerationToTheRobot) {
  const ModuleContext context = CourierContext({});
  const auto config = Read(context);
  ASSERT_TRUE(Succeeded(config));
  const double tilt_deg =
      0.2 * design::GroundContact(context.robot, 0).smallest_rad() * 180 / std::numbers::pi;
  EXPECT_NEAR(config->weights.max_tilt_deg, tilt_deg, 1e-12);
  // The steady lean of an acceleration a is atan(a / g) (statics, derived by hand): the
  // reference accelerates at most at the lean the weights accept.
  EXPECT_NEAR(config->max_accel_m_s2,
              model::kStandardGravity_m_s2 * std::tan(tilt_deg * std::numbers::pi / 180), 1e-12);
}

TEST(CommonConfig, AGivenTiltWins) {
  const auto config = Read(CourierContext({{"max_tilt_deg", "4"}}));
  ASSERT_TRUE(Succeeded(config));
  EXPECT_EQ(config->weights.max_tilt_deg, 4);
}

TEST(CommonConfig, AHostWithoutTheOutlineNeedsTheTiltGiven) {
  ModuleContext context = CourierContext({});
  context.robot.chassis.outline_front_m = context.robot.chassis.outline_rear_m = 0;  // none
  const auto refused = Read(context);
  ASSERT_FALSE(refused);
  EXPECT_EQ(refused.error().status, UPRIGHT_BAD_CONFIG);
  EXPECT_NE(refused.error().message.find("no chassis outline"), std::string::npos)
      << refused.error().message;
  context.config = {{"max_tilt_deg", "2.5"}};
  const auto given = Read(context);
  ASSERT_TRUE(Succeeded(given));
  EXPECT_EQ(given->weights.max_tilt_deg, 2.5);
}

}  // namespace
}  // namespace upright::controllers
