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
// estimate's pitch carries the IMU's biases — the accelerometer's b_x / g and the gyro's b_y τ,
// 0.0046 rad on the courier and 0.011 rad on the tabletop (models/*.xml) — and state feedback
// comes to rest where its position term cancels that tilt, K_x Δx = −K_θ b: with the LQR's
// K_θ / K_x ≈ 15 m/rad (both robots), 0.07 m and 0.17 m. The recovery from 3° and the wheel
// friction's slow limit cycle add up to about 0.2 m more on the tabletop.
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

// The H-infinity module is left out: on voltage commands with the complementary-filter estimate
// its high gains on ẋ and θ̇ set up a chatter at the Nyquist rate on the courier (±10 V at
// 100 Hz) while it still balances; a passing balance test would hide that.
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
}

INSTANTIATE_TEST_SUITE_P(Builtins, VoltageCommands,
                         ::testing::Combine(::testing::Values("lqr", "lqg"),
                                            ::testing::Values("courier", "tabletop")),
                         Name);

}  // namespace
}  // namespace upright::host
