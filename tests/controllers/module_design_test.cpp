// The built-in modules design what `upright design` designs: with the true state, a module's
// first command from a known tilt is its gain applied to that tilt, and the gain, γ and PID
// gains are those of design::DesignAll for the same robot — a check that the robot and linear
// model survive the trip through the C ABI.
#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <memory>
#include <string>

#include "builtin_run.hpp"
#include "upright/design/design_set.hpp"

namespace upright::host {
namespace {

using testing::Config;
using testing::CreateBuiltin;
using testing::DemoRobot;
using testing::kDeg;

struct FirstTick {
  std::array<double, 2> command{};
  design::StateVector truth;  // [0, ẋ, θ, θ̇, 0, ψ̇] at the tick
  std::unique_ptr<ControllerHost> host;
};

// Creates the module with the true state, the plant at a 3° tilt, and runs one tick.
FirstTick RunFirstTick(const std::string& module, const RobotModel& model, Config config) {
  FirstTick out;
  config.emplace_back("state", "true");
  std::string error;
  out.host = CreateBuiltin(module, model, config, /*true_state=*/true, &error);
  EXPECT_NE(out.host, nullptr) << error;
  if (!out.host) return out;
  sim::PlantOptions options;
  options.initial.pitch_rad = 3 * kDeg;
  options.drive = out.host->drive();
  auto plant = sim::Plant::Create(model, options, &error);
  EXPECT_NE(plant, nullptr) << error;
  if (!plant) return out;
  const sim::TrueState& s = plant->truth();
  out.truth << 0, s.forward_speed_m_s, s.pitch_rad, s.pitch_rate_rad_s, 0, s.yaw_rate_rad_s;
  EXPECT_TRUE(out.host->Tick(*plant, Reference{})) << out.host->fault();
  out.command = out.host->command();
  return out;
}

void ExpectCommand(const FirstTick& tick, const Eigen::Vector2d& expected) {
  for (int i = 0; i < 2; ++i) {
    EXPECT_NEAR(tick.command[i], expected(i), 1e-9 * (1 + std::abs(expected(i)))) << "wheel " << i;
  }
}

class DemoRobotDesign : public ::testing::TestWithParam<std::string> {
 protected:
  RobotModel model_ = DemoRobot(GetParam());
  design::DesignSet design_ = design::DesignAll(model_, design::DesignRequest{});
};

TEST_P(DemoRobotDesign, LqrAppliesTheDiscreteGain) {
  ASSERT_TRUE(design_.lqr.ok) << design_.lqr.message;
  const FirstTick tick = RunFirstTick("lqr", model_, {});
  ExpectCommand(tick, -design_.lqr.K_discrete * tick.truth);
}

TEST_P(DemoRobotDesign, LqrOnVoltageAppliesTheVoltageModelsDiscreteGain) {
  design::DesignRequest request;
  request.input = design::InputKind::kVoltage;
  const design::DesignSet voltage = design::DesignAll(model_, request);
  ASSERT_TRUE(voltage.lqr.ok) << voltage.lqr.message;
  const FirstTick tick = RunFirstTick("lqr", model_, {{"input", "voltage"}});
  ExpectCommand(tick, -voltage.lqr.K_discrete * tick.truth);
}

TEST_P(DemoRobotDesign, HinfAppliesTheContinuousGainAtTheSameGamma) {
  ASSERT_TRUE(design_.hinf.ok) << design_.hinf.message;
  const FirstTick tick = RunFirstTick("hinf", model_, {});
  ExpectCommand(tick, -design_.hinf.K * tick.truth);
  const auto& names = tick.host->diagnostic_names();
  const auto slot = std::find(names.begin(), names.end(), "gamma") - names.begin();
  ASSERT_LT(slot, static_cast<long>(names.size()));
  EXPECT_NEAR(tick.host->diagnostics()[slot], design_.hinf.gamma, 1e-9 * design_.hinf.gamma);
}

TEST_P(DemoRobotDesign, LqgWithTheTrueStateIsItsDiscreteRegulator) {
  ASSERT_TRUE(design_.lqg.ok) << design_.lqg.message;
  const FirstTick tick = RunFirstTick("lqg", model_, {});
  ExpectCommand(tick, -design_.lqg.K_discrete * tick.truth);
}

TEST_P(DemoRobotDesign, PidAppliesItsTunedTiltGains) {
  // Standing still (θ_ref = 0 with no speed error): τ = (kp θ + kd θ̇) / 2 on each wheel.
  const design::PidGains& g = design_.pid.gains;
  const FirstTick tick = RunFirstTick("pid", model_, {});
  const double each = (g.tilt_kp_Nm_per_rad * tick.truth(design::kPitch) +
                       g.tilt_kd_Nm_s_per_rad * tick.truth(design::kPitchRate)) /
                      2;
  // The speed PI sees the plant's initial speed (zero, to rounding) through θ_ref.
  const double speed_term =
      g.tilt_kp_Nm_per_rad *
      (g.speed_kp_rad_per_m_s + g.speed_ki_rad_per_m / model_.control_rate_hz) *
      tick.truth(design::kXDot) / 2;
  ExpectCommand(tick, Eigen::Vector2d(each + speed_term, each + speed_term));
}

INSTANTIATE_TEST_SUITE_P(Robots, DemoRobotDesign, ::testing::Values("courier", "tabletop"));

}  // namespace
}  // namespace upright::host
