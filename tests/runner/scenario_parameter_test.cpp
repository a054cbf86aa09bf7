// Scenario parameters by path: each kind of path reads and sets the number the file means, in the
// file's units; robot fields change only the robot as built; bad paths and values are refused
// with the reason, leaving the scenario as it was.
#include "upright/runner/scenario_parameter.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "run_test_support.hpp"
#include "upright/model/conventions.hpp"

namespace upright::runner {
namespace {

using testing::ScenarioFromText;

const char* kScenario = R"(<scenario name="params" schema="1" duration_s="6">
  <description>Test: one of each event.</description>
  <robot file="../models/courier.xml"/>
  <ground kind="flat">
    <friction start_x_m="2" end_x_m="3" friction="0.3"/>
  </ground>
  <start pitch_deg="2"/>
  <timeline>
    <push at_s="3" shape="half-sine" peak_N="90" duration_s="0.2"/>
    <push at_s="1" shape="impulse" peak_N="50" duration_s="0.1"/>
    <payload_shift at_s="2" distance_m="0.05" duration_s="0.2"/>
    <drive at_s="0.5" speed_m_s="0.4" yaw_rate_deg_s="10" ramp_s="1"/>
    <motor_fault at_s="4" side="left" torque_scale="0.5"/>
    <sensor_fault at_s="4.5" channel="gyro_y" kind="bias" value="0.01"/>
  </timeline>
  <controllers>
    <controller name="lqr" builtin="lqr"/>
  </controllers>
</scenario>)";

double Get(const Scenario& s, const std::string& path) {
  double value = std::nan("");
  std::string error;
  EXPECT_TRUE(GetScenarioParameter(s, path, &value, &error)) << path << ": " << error;
  return value;
}

TEST(ScenarioParameter, ReadsEveryKindInTheFilesUnits) {
  const Scenario s = ScenarioFromText(kScenario);
  EXPECT_DOUBLE_EQ(Get(s, "start.pitch_deg"), 2);
  EXPECT_EQ(Get(s, "ground/friction[1].friction"), 0.3);
  // Pushes are numbered in start-time order: the impulse at 1 s is the first.
  EXPECT_EQ(Get(s, "timeline/push[1].peak_N"), 50);
  EXPECT_EQ(Get(s, "timeline/push[2].peak_N"), 90);
  EXPECT_EQ(Get(s, "timeline/push.peak_N"), 50);  // no index: the first
  EXPECT_EQ(Get(s, "timeline/payload_shift[1].distance_m"), 0.05);
  EXPECT_DOUBLE_EQ(Get(s, "timeline/drive[1].yaw_rate_deg_s"), 10);
  EXPECT_EQ(Get(s, "timeline/motor_fault[1].torque_scale"), 0.5);
  EXPECT_EQ(Get(s, "timeline/sensor_fault[1].value"), 0.01);
  EXPECT_EQ(Get(s, "robot/chassis.mass_kg"), 24);
}

TEST(ScenarioParameter, SetsInTheFilesUnitsAndKeepsTheTimelineInOrder) {
  Scenario s = ScenarioFromText(kScenario);
  std::string error;
  ASSERT_TRUE(SetScenarioParameter(&s, "start.pitch_deg", 4, &error)) << error;
  EXPECT_NEAR(s.initial.pitch_rad, 4 * kPi / 180, 1e-15);
  ASSERT_TRUE(SetScenarioParameter(&s, "timeline/drive[1].yaw_rate_deg_s", 45, &error)) << error;
  EXPECT_NEAR(s.drives[0].yaw_rate_rad_s, kPi / 4, 1e-15);
  // Moving the first push after the second re-sorts them.
  ASSERT_TRUE(SetScenarioParameter(&s, "timeline/push[1].at_s", 5, &error)) << error;
  EXPECT_EQ(s.pushes[0].start_s, 3);
  EXPECT_EQ(s.pushes[1].start_s, 5);
  EXPECT_EQ(s.pushes[1].peak_N, 50);
}

TEST(ScenarioParameter, RobotFieldsChangeTheRobotAsBuiltOnly) {
  Scenario s = ScenarioFromText(kScenario);
  std::string error;
  ASSERT_TRUE(SetScenarioParameter(&s, "robot/wheels.friction", 0.4, &error)) << error;
  ASSERT_TRUE(s.plant_model.has_value());
  EXPECT_EQ(s.plant_model->wheel.friction, 0.4);
  EXPECT_EQ(s.model.wheel.friction, 0.8);  // what the controllers are designed for
  EXPECT_EQ(Get(s, "robot/wheels.friction"), 0.4);
  ASSERT_TRUE(SetScenarioParameter(&s, "robot/chassis.mass_kg", 26, &error)) << error;
  EXPECT_EQ(s.plant_model->wheel.friction, 0.4);  // changes accumulate on the built robot
  EXPECT_EQ(s.plant_model->chassis.mass_kg, 26);
}

TEST(ScenarioParameter, RefusesWhatTheScenarioCannotHoldAndLeavesItUnchanged) {
  const Scenario original = ScenarioFromText(kScenario);
  Scenario s = original;
  std::string error;
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/push[3].peak_N", 1, &error));
  EXPECT_EQ(error, "timeline/push[3].peak_N: the scenario has 2 <push> elements");
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/push[1].at_s", 6, &error));
  EXPECT_EQ(error, "timeline/push[1].at_s = 6: push at_s = 6: must be in [0, 6)");
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/payload_shift[1].distance_m", 0.5, &error));
  EXPECT_NE(error.find("outside the carriage travel [-0.15, 0.15] m"), std::string::npos) << error;
  // Just past the travel, the target is printed exactly, not rounded back onto the limit; exactly
  // on it is accepted.
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/payload_shift[1].distance_m", 0.1500001, &error));
  EXPECT_EQ(
      error,
      "timeline/payload_shift[1].distance_m = 0.1500001: the payload target reaches 0.1500001 m "
      "at 2.2 s, outside the carriage travel [-0.15, 0.15] m");
  Scenario on_limit = original;
  EXPECT_TRUE(SetScenarioParameter(&on_limit, "timeline/payload_shift[1].distance_m", 0.15, &error))
      << error;
  EXPECT_TRUE(SetScenarioParameter(&on_limit, "timeline/push[1].height_m", 0.65, &error)) << error;
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/push[1].height_m", 0.9, &error));
  EXPECT_EQ(error,
            "timeline/push[1].height_m = 0.9: push height_m = 0.9: must be within the chassis "
            "outline [-0.1, 0.65] m");
  EXPECT_FALSE(SetScenarioParameter(&s, "robot/chassis.mass_kg", 0, &error));
  EXPECT_EQ(error, "robot/chassis.mass_kg = 0: chassis mass_kg = 0: must be in (0, 1000]");
  EXPECT_FALSE(SetScenarioParameter(&s, "ground.slope_deg", 3, &error));
  EXPECT_NE(error.find("on a slope"), std::string::npos) << error;
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/push[0].peak_N", 1, &error));
  EXPECT_FALSE(SetScenarioParameter(&s, "peak_N", 1, &error));
  EXPECT_FALSE(SetScenarioParameter(&s, "timeline/jump[1].at_s", 1, &error));
  EXPECT_NE(error.find("no parameter element 'timeline/jump'"), std::string::npos) << error;
  EXPECT_EQ(s.pushes[0].peak_N, original.pushes[0].peak_N);
  EXPECT_EQ(s.pushes[0].start_s, original.pushes[0].start_s);
  EXPECT_FALSE(s.plant_model.has_value());
}

}  // namespace
}  // namespace upright::runner
