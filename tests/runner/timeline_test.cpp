// The timeline the runner drives itself: drive reference ramps, the commanded path, payload
// shifts, each to the physics step; and the disturbance list settling is judged after.
#include "timeline.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "succeeded.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::runner::internal {
namespace {

Scenario CourierScenario() {
  Scenario s;
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(Succeeded(loaded));
  s.model = loaded.value_or(model::RobotModel{});
  s.dt_s = 0.001;
  s.duration_s = 10;
  return s;
}

TEST(Timeline, DriveRampReachesItsTargetOnTheStepsItNames) {
  Scenario s = CourierScenario();
  s.drives.push_back({/*start_s=*/1.0, /*ramp_s=*/0.5, /*speed_m_s=*/1.0, /*yaw_rate_rad_s=*/0.2});
  s.drives.push_back({/*start_s=*/3.0, /*ramp_s=*/0.0, /*speed_m_s=*/0.0, /*yaw_rate_rad_s=*/0.0});
  Timeline t(s);
  const auto at = [&](long step) {
    t.Advance(step);
    return t.reference();
  };
  EXPECT_EQ(at(0).forward_speed_m_s, 0.0);
  EXPECT_EQ(at(999).forward_speed_m_s, 0.0);  // the step before the change starts
  EXPECT_NEAR(at(1000).forward_speed_m_s, 0.0, 1e-12);
  // Linear ramp: a quarter of the way at 1.125 s, all the way from 1.5 s (exact arithmetic
  // within rounding of the step times).
  EXPECT_NEAR(at(1125).forward_speed_m_s, 0.25, 1e-9);
  EXPECT_NEAR(at(1125).yaw_rate_rad_s, 0.05, 1e-9);
  EXPECT_NEAR(at(1500).forward_speed_m_s, 1.0, 1e-12);
  EXPECT_EQ(at(2999).forward_speed_m_s, 1.0);
  EXPECT_EQ(at(3000).forward_speed_m_s, 0.0);  // a step change lands on its own step
  EXPECT_EQ(at(3000).yaw_rate_rad_s, 0.0);
}

TEST(Timeline, AChangeBetweenStepsStartsOnTheNextStep) {
  Scenario s = CourierScenario();
  s.drives.push_back({/*start_s=*/1.0005, /*ramp_s=*/0.0, /*speed_m_s=*/0.4, 0.0});
  Timeline t(s);
  t.Advance(1000);  // [1.000, 1.001) begins before the change
  EXPECT_EQ(t.reference().forward_speed_m_s, 0.0);
  t.Advance(1001);
  EXPECT_EQ(t.reference().forward_speed_m_s, 0.4);
}

TEST(Timeline, CommandedPathIntegratesTheReference) {
  Scenario s = CourierScenario();
  s.initial.x_m = 2.0;
  s.drives.push_back({0.0, 0.0, 0.5, 0.0});
  Timeline t(s);
  for (long k = 0; k < 4000; ++k) {
    t.Advance(k);
    t.Integrate(s.dt_s);
  }
  // Straight line at 0.5 m/s for 4 s from x = 2 m: x = 4 m (sum of 4000 equal steps).
  EXPECT_NEAR(t.path_x_m(), 4.0, 1e-9);
  EXPECT_NEAR(t.path_y_m(), 0.0, 1e-12);

  // A constant turn: speed v, yaw rate r traces a circle of radius v / r. After a quarter turn
  // (t = π / 2r) the point is at (R, R) from the start (circle geometry); Euler on 1 ms steps
  // is first-order accurate, within v·dt of it.
  Scenario turn = CourierScenario();
  const double v = 0.5, r = 0.5, radius = v / r;
  turn.drives.push_back({0.0, 0.0, v, r});
  Timeline c(turn);
  const long quarter = std::lround(std::numbers::pi / (2 * r) / turn.dt_s);
  for (long k = 0; k < quarter; ++k) {
    c.Advance(k);
    c.Integrate(turn.dt_s);
  }
  EXPECT_NEAR(c.path_x_m(), radius, 2 * v * turn.dt_s);
  EXPECT_NEAR(c.path_y_m(), radius, 2 * v * turn.dt_s);
}

TEST(Timeline, PayloadShiftsAddUpAndRampOverTheirDuration) {
  Scenario s = CourierScenario();
  ASSERT_TRUE(s.model.payload.present);
  const double base = s.model.payload.x_m;
  s.payload_shifts.push_back({/*start_s=*/1.0, /*duration_s=*/0.2, /*distance_m=*/0.1});
  s.payload_shifts.push_back({/*start_s=*/2.0, /*duration_s=*/0.0, /*distance_m=*/-0.04});
  Timeline t(s);
  t.Advance(500);
  EXPECT_EQ(t.payload_target_m(), base);
  EXPECT_FALSE(t.payload_moving());
  t.Advance(1100);
  EXPECT_NEAR(t.payload_target_m(), base + 0.05, 1e-9);
  EXPECT_TRUE(t.payload_moving());
  t.Advance(1500);
  EXPECT_NEAR(t.payload_target_m(), base + 0.1, 1e-12);
  t.Advance(2000);
  EXPECT_NEAR(t.payload_target_m(), base + 0.06, 1e-12);
}

TEST(Timeline, DisturbancesAreTheTimedEventsAndAStartAwayFromRest) {
  Scenario s = CourierScenario();
  EXPECT_TRUE(Timeline::DisturbanceStarts(s).empty());
  s.initial.pitch_rad = 0.05;
  sim::Push push;
  push.start_s = 2.0;
  s.pushes = {push, push};
  s.payload_shifts.push_back({1.0, 0.1, 0.05});
  sim::MotorFault motor;
  motor.start_s = 3.0;
  s.motor_faults.push_back(motor);
  s.drives.push_back({0.5, 1.0, 1.0, 0.0});  // a drive change is a command, not a disturbance
  EXPECT_EQ(Timeline::DisturbanceStarts(s), (std::vector<double>{0.0, 1.0, 2.0, 3.0}));
  const auto marks = Timeline::Marks(s);
  ASSERT_EQ(marks.size(), 5u);
  for (std::size_t i = 1; i < marks.size(); ++i) EXPECT_LE(marks[i - 1].time_s, marks[i].time_s);
  EXPECT_EQ(marks[0].label.rfind("drive", 0), 0u);
  EXPECT_EQ(marks[4].label.rfind("motor fault left", 0), 0u);
}

}  // namespace
}  // namespace upright::runner::internal
