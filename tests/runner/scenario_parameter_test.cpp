// Scenario parameters by path: each kind of path reads and sets the number the file means, in the
// file's units; robot fields change only the robot as built; bad paths and values are refused
// with the reason, leaving the scenario as it was.
#include "upright/runner/scenario/scenario_parameter.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

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
  const Result<double> value = GetScenarioParameter(s, path);
  EXPECT_TRUE(value) << path << ": " << value.error();
  return value.value_or(std::nan(""));
}

// Sets the parameter, a test failure when it is refused.
void Set(Scenario* s, const std::string& path, double value) {
  const Status set = SetScenarioParameter(s, path, value);
  ASSERT_TRUE(set) << path << " = " << value << ": " << set.error();
}

// Why setting the parameter is refused; a test failure, and "", when it is accepted.
std::string Refusal(Scenario* s, const std::string& path, double value) {
  const Status set = SetScenarioParameter(s, path, value);
  EXPECT_FALSE(set) << path << " = " << value;
  return set ? "" : set.error();
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
  ASSERT_NO_FATAL_FAILURE(Set(&s, "start.pitch_deg", 4));
  EXPECT_NEAR(s.initial.pitch_rad, 4 * std::numbers::pi / 180, 1e-15);
  ASSERT_NO_FATAL_FAILURE(Set(&s, "timeline/drive[1].yaw_rate_deg_s", 45));
  EXPECT_NEAR(s.drives[0].yaw_rate_rad_s, std::numbers::pi / 4, 1e-15);
  // Moving the first push after the second re-sorts them.
  ASSERT_NO_FATAL_FAILURE(Set(&s, "timeline/push[1].at_s", 5));
  EXPECT_EQ(s.pushes[0].start_s, 3);
  EXPECT_EQ(s.pushes[1].start_s, 5);
  EXPECT_EQ(s.pushes[1].peak_N, 50);
}

TEST(ScenarioParameter, RobotFieldsChangeTheRobotAsBuiltOnly) {
  Scenario s = ScenarioFromText(kScenario);
  ASSERT_NO_FATAL_FAILURE(Set(&s, "robot/wheels.friction", 0.4));
  ASSERT_TRUE(s.plant_model.has_value());
  EXPECT_EQ(s.plant_model->wheel.friction, 0.4);
  EXPECT_EQ(s.model.wheel.friction, 0.8);  // what the controllers are designed for
  EXPECT_EQ(Get(s, "robot/wheels.friction"), 0.4);
  ASSERT_NO_FATAL_FAILURE(Set(&s, "robot/chassis.mass_kg", 26));
  EXPECT_EQ(s.plant_model->wheel.friction, 0.4);  // changes accumulate on the built robot
  EXPECT_EQ(s.plant_model->chassis.mass_kg, 26);
}

TEST(ScenarioParameter, RefusesWhatTheScenarioCannotHoldAndLeavesItUnchanged) {
  const Scenario original = ScenarioFromText(kScenario);
  Scenario s = original;
  EXPECT_EQ(Refusal(&s, "timeline/push[3].peak_N", 1),
            "timeline/push[3].peak_N: the scenario has 2 <push> elements");
  EXPECT_EQ(Refusal(&s, "timeline/push[1].at_s", 6),
            "timeline/push[1].at_s = 6: push at_s = 6: must be in [0, 6)");
  const std::string travel = Refusal(&s, "timeline/payload_shift[1].distance_m", 0.5);
  EXPECT_NE(travel.find("outside the carriage travel [-0.15, 0.15] m"), std::string::npos)
      << travel;
  // Just past the travel, the target is printed exactly, not rounded back onto the limit; exactly
  // on it is accepted.
  EXPECT_EQ(
      Refusal(&s, "timeline/payload_shift[1].distance_m", 0.1500001),
      "timeline/payload_shift[1].distance_m = 0.1500001: the payload target reaches 0.1500001 m "
      "at 2.2 s, outside the carriage travel [-0.15, 0.15] m");
  Scenario on_limit = original;
  EXPECT_NO_FATAL_FAILURE(Set(&on_limit, "timeline/payload_shift[1].distance_m", 0.15));
  EXPECT_NO_FATAL_FAILURE(Set(&on_limit, "timeline/push[1].height_m", 0.65));
  EXPECT_EQ(Refusal(&s, "timeline/push[1].height_m", 0.9),
            "timeline/push[1].height_m = 0.9: push height_m = 0.9: must be within the chassis "
            "outline [-0.1, 0.65] m");
  EXPECT_EQ(Refusal(&s, "robot/chassis.mass_kg", 0),
            "robot/chassis.mass_kg = 0: chassis mass_kg = 0: must be in (0, 1000]");
  const std::string slope = Refusal(&s, "ground.slope_deg", 3);
  EXPECT_NE(slope.find("on a slope"), std::string::npos) << slope;
  EXPECT_EQ(Refusal(&s, "timeline/push[0].peak_N", 1),
            "parameter 'timeline/push[0].peak_N': an index is [1], [2], ... after the last "
            "element");
  // An index beyond any count of elements (past 2^64 - 1) is refused, not thrown (a fuzzed input
  // once aborted the reader this way).
  EXPECT_EQ(Refusal(&s, "timeline/push[99999999999999999999].peak_N", 1),
            "parameter 'timeline/push[99999999999999999999].peak_N': an index is [1], [2], ... "
            "after the last element");
  EXPECT_EQ(Refusal(&s, "timeline/push[18446744073709551615].peak_N", 1),
            "timeline/push[18446744073709551615].peak_N: the scenario has 2 <push> elements");
  EXPECT_EQ(Refusal(&s, "peak_N", 1),
            "parameter 'peak_N': expected element path '.' attribute, as in "
            "timeline/push[1].peak_N");
  const std::string element = Refusal(&s, "timeline/jump[1].at_s", 1);
  EXPECT_NE(element.find("no parameter element 'timeline/jump'"), std::string::npos) << element;
  EXPECT_EQ(s.pushes[0].peak_N, original.pushes[0].peak_N);
  EXPECT_EQ(s.pushes[0].start_s, original.pushes[0].start_s);
  EXPECT_FALSE(s.plant_model.has_value());
}

}  // namespace
}  // namespace upright::runner
