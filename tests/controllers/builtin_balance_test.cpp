// The built-in modules on the plant, through the controller host: each balances each demo robot
// from a tilt with noisy sensors; they follow speed and yaw-rate references; the true state and
// voltage commands work too.
#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <tuple>

#include "builtin_run.hpp"

namespace upright::host {
namespace {

using testing::kDeg;
using testing::PrintFigures;
using testing::RunBuiltin;
using testing::RunFigures;
using testing::RunSettings;

using ControllerOnRobot = std::tuple<std::string, std::string>;

std::string Name(const ::testing::TestParamInfo<ControllerOnRobot>& p) {
  return std::get<0>(p.param) + "_" + std::get<1>(p.param);
}

class Balance : public ::testing::TestWithParam<ControllerOnRobot> {};

// Upright: RMS pitch over the last second and the final pitch under 1°. Drift: under 0.5 m. The
// estimate's pitch carries the accelerometer's bias as a tilt b_x / g, which no estimator can
// tell from one with these sensors (the gyro's bias it learns): 0.0051 rad on the courier and
// 0.015 rad on the tabletop (models/*.xml). State feedback comes to rest where its position term
// cancels that tilt, K_x Δx = −K_θ b: with the LQR's K_θ / K_x ≈ 15 m/rad (both robots), 0.08 m
// and 0.23 m. The recovery from 3° and the wheel friction's slow limit cycle move the tabletop
// by about 0.1 m more on the way.
TEST_P(Balance, HoldsTheRobotUprightFromAThreeDegreeTiltWithNoisySensors) {
  const auto& [controller, robot] = GetParam();
  const RunFigures f = RunBuiltin(controller, robot, RunSettings{});
  ASSERT_TRUE(f.ran) << f.error;
  PrintFigures(controller + " on " + robot, f);
  EXPECT_FALSE(f.fell);
  EXPECT_LT(f.rms_pitch_final_rad, 1 * kDeg);
  EXPECT_LT(std::abs(f.final_pitch_rad), 1 * kDeg);
  EXPECT_LT(f.max_abs_x_m, 0.5);
}

INSTANTIATE_TEST_SUITE_P(Builtins, Balance,
                         ::testing::Combine(::testing::Values("lqr", "hinf", "lqg", "pid"),
                                            ::testing::Values("courier", "tabletop")),
                         Name);

TEST(LatencyCompensation, LqrBalancesBothRobotsWithItToo) {
  // The same bounds as Balance, the lqr module designed on the delay-augmented model.
  for (const char* robot : {"courier", "tabletop"}) {
    RunSettings settings;
    settings.config = {{"latency_compensation", "true"}};
    const RunFigures f = RunBuiltin("lqr", robot, settings);
    ASSERT_TRUE(f.ran) << f.error;
    PrintFigures(std::string("lqr (latency compensation) on ") + robot, f);
    EXPECT_FALSE(f.fell) << robot;
    EXPECT_LT(f.rms_pitch_final_rad, 1 * kDeg) << robot;
    EXPECT_LT(std::abs(f.final_pitch_rad), 1 * kDeg) << robot;
    EXPECT_LT(f.max_abs_x_m, 0.5) << robot;
  }
}

TEST(SpeedReference, LqrBringsTheCourierToHalfAMetrePerSecondWithinFiveSeconds) {
  // The reference ramps at g tan(2.23°) = 0.38 m/s² (the default max_accel_m_s2, at the courier's
  // acceptable tilt), so it reaches 0.5 m/s after about 1.3 s; the speed then settles as the
  // position error the ramp left closes.
  RunSettings settings;
  settings.duration_s = 5;
  settings.reference.forward_speed_m_s = 0.5;
  const RunFigures f = RunBuiltin("lqr", "courier", settings);
  ASSERT_TRUE(f.ran) << f.error;
  PrintFigures("lqr on courier at 0.5 m/s", f);
  EXPECT_FALSE(f.fell);
  EXPECT_NEAR(f.mean_final_speed_m_s, 0.5, 0.1 * 0.5);
}

class Turning : public ::testing::TestWithParam<ControllerOnRobot> {};

TEST_P(Turning, FollowsAYawRateReferenceToTheLeft) {
  // 0.5 rad/s for 5 s is 2.5 rad (143°) of heading, positive: turning left (conventions.hpp).
  // State feedback tracks the integrated heading; the PID only the rate, through a PI.
  const auto& [controller, robot] = GetParam();
  RunSettings settings;
  settings.duration_s = 5;
  settings.reference.yaw_rate_rad_s = 0.5;
  const RunFigures f = RunBuiltin(controller, robot, settings);
  ASSERT_TRUE(f.ran) << f.error;
  PrintFigures(controller + " on " + robot + " turning", f);
  EXPECT_FALSE(f.fell);
  EXPECT_NEAR(f.final_yaw_rad, 2.5, 0.15 * 2.5);
}

INSTANTIATE_TEST_SUITE_P(Builtins, Turning,
                         ::testing::Combine(::testing::Values("lqr", "hinf", "lqg", "pid"),
                                            ::testing::Values("courier", "tabletop")),
                         Name);

class TrueState : public ::testing::TestWithParam<ControllerOnRobot> {};

TEST_P(TrueState, BalancesOnTheTrueStateToo) {
  const auto& [controller, robot] = GetParam();
  RunSettings settings;
  settings.true_state = true;
  settings.config = {{"state", "true"}};
  const RunFigures f = RunBuiltin(controller, robot, settings);
  ASSERT_TRUE(f.ran) << f.error;
  PrintFigures(controller + " on " + robot + " (true state)", f);
  EXPECT_FALSE(f.fell);
  EXPECT_LT(f.rms_pitch_final_rad, 1 * kDeg);
  // No estimator bias to hold against: only the recovery from the tilt and the wheels'
  // friction move it.
  EXPECT_LT(f.max_abs_x_m, 0.15);
}

INSTANTIATE_TEST_SUITE_P(Builtins, TrueState,
                         ::testing::Combine(::testing::Values("lqr", "hinf", "lqg", "pid"),
                                            ::testing::Values("courier", "tabletop")),
                         Name);

class VoltageCommands : public ::testing::TestWithParam<ControllerOnRobot> {};

// Balancing on voltage commands, without chatter: the command's change from tick to tick stays
// under 1 V RMS (common practice: a loop chattering at the Nyquist rate, as H-infinity's did on
// the courier with an estimator that took its speed from the one-period encoder difference,
// shows some 20 V here, ±10 V every other tick).
TEST_P(VoltageCommands, BalanceWithVoltageCommands) {
  const auto& [controller, robot] = GetParam();
  RunSettings settings;
  settings.config = {{"input", "voltage"}};
  const RunFigures f = RunBuiltin(controller, robot, settings);
  ASSERT_TRUE(f.ran) << f.error;
  PrintFigures(controller + " on " + robot + " (voltage)", f);
  EXPECT_FALSE(f.fell);
  EXPECT_LT(f.rms_pitch_final_rad, 1 * kDeg);
  EXPECT_LT(f.max_abs_x_m, 0.5);
  EXPECT_LT(f.rms_command_step, 1.0);
}

INSTANTIATE_TEST_SUITE_P(Builtins, VoltageCommands,
                         ::testing::Combine(::testing::Values("lqr", "hinf", "lqg"),
                                            ::testing::Values("courier", "tabletop")),
                         Name);

}  // namespace
}  // namespace upright::host
