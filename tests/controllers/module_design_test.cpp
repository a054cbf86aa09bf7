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
#include "succeeded.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/lqg_filter.hpp"
#include "upright/model/conventions.hpp"

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
FirstTick RunFirstTick(const std::string& module, const model::RobotModel& model, Config config) {
  FirstTick out;
  config.emplace_back("state", "true");
  auto host = CreateBuiltin(module, model, config, /*true_state=*/true);
  EXPECT_TRUE(Succeeded(host));
  if (!host) return out;
  out.host = std::move(*host);
  sim::PlantOptions options;
  options.initial.pitch_rad = 3 * kDeg;
  options.drive = out.host->drive();
  auto built = sim::Plant::Create(model, options);
  EXPECT_TRUE(Succeeded(built));
  if (!built) return out;
  const std::unique_ptr<sim::Plant> plant = std::move(*built);
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
  model::RobotModel model_ = DemoRobot(GetParam());
  design::DesignSet design_ = design::DesignAll(model_, design::DesignRequest{});
};

TEST_P(DemoRobotDesign, LqrAppliesTheDiscreteGain) {
  ASSERT_TRUE(design_.lqr.ok) << design_.lqr.message;
  const FirstTick tick = RunFirstTick("lqr", model_, {});
  ExpectCommand(tick, -design_.lqr.K_discrete * tick.truth);
}

TEST_P(DemoRobotDesign, LqrWithLatencyCompensationFeedsBackItsOwnPastCommands) {
  // latency_compensation = true: the gain `upright design` reports for the delay-augmented
  // model, on the state and on the module's last command (one per wheel at these latencies,
  // under a period). The first tick has no past command; the second feeds back the first.
  const design::DelayAwareLqrReport& aware = design_.lqr_delay_aware;
  ASSERT_TRUE(aware.ok) << aware.message;
  ASSERT_EQ(aware.memory, 1);
  FirstTick tick = RunFirstTick("lqr", model_, {{"latency_compensation", "true"}});
  const Eigen::MatrixXd K_state = aware.K.leftCols(design::kStates);
  const Eigen::MatrixXd K_past = aware.K.rightCols(2);
  ExpectCommand(tick, -K_state * tick.truth);
  ASSERT_TRUE(tick.host);
  sim::PlantOptions options;
  options.initial.pitch_rad = -2 * kDeg;
  options.drive = tick.host->drive();
  auto built = sim::Plant::Create(model_, options);
  ASSERT_TRUE(Succeeded(built));
  const Eigen::Vector2d first(tick.command[0], tick.command[1]);
  const sim::TrueState& s = (*built)->truth();
  design::StateVector truth;
  truth << 0, s.forward_speed_m_s, s.pitch_rad, s.pitch_rate_rad_s, 0, s.yaw_rate_rad_s;
  // The same host, a fresh plant at −2°: its step count is 0, so the host ticks again.
  ASSERT_TRUE(tick.host->Tick(**built, Reference{})) << tick.host->fault();
  tick.command = tick.host->command();
  ExpectCommand(tick, -K_state * truth - K_past * first);
}

TEST_P(DemoRobotDesign, LqrOnVoltageAppliesTheVoltageModelsDiscreteGain) {
  design::DesignRequest request;
  request.input = design::InputKind::kVoltage;
  const design::DesignSet voltage = design::DesignAll(model_, request);
  ASSERT_TRUE(voltage.lqr.ok) << voltage.lqr.message;
  const FirstTick tick = RunFirstTick("lqr", model_, {{"input", "voltage"}});
  ExpectCommand(tick, -voltage.lqr.K_discrete * tick.truth);
}

TEST_P(DemoRobotDesign, HinfAppliesTheDiscreteGainAtTheSameGamma) {
  // The module designs at its own rate: the discrete gain at gamma_factor × the discrete γ_opt.
  ASSERT_TRUE(design_.hinf.ok) << design_.hinf.message;
  const FirstTick tick = RunFirstTick("hinf", model_, {});
  ExpectCommand(tick, -design_.hinf.K_discrete * tick.truth);
  const auto& names = tick.host->diagnostic_names();
  const auto slot = std::find(names.begin(), names.end(), "gamma") - names.begin();
  ASSERT_LT(slot, static_cast<long>(names.size()));
  EXPECT_NEAR(tick.host->diagnostics()[slot], design_.hinf.gamma_discrete,
              1e-9 * design_.hinf.gamma_discrete);
}

TEST_P(DemoRobotDesign, LqgWithTheTrueStateIsItsDiscreteRegulator) {
  ASSERT_TRUE(design_.lqg.ok) << design_.lqg.message;
  const FirstTick tick = RunFirstTick("lqg", model_, {});
  ExpectCommand(tick, -design_.lqg.K_discrete * tick.truth);
}

TEST_P(DemoRobotDesign, LqgEstimatesWithTheFilterDesignAnalyses) {
  // Two ticks of sensor samples (no plant, no reference): the module's estimate, which its
  // diagnostics expose, must follow x̂ = x̂⁻ + L (y − C x̂⁻ − D u), x̂⁻ = Ad x̂₀ + Bd u₀, with the
  // filter of design::DesignLqgFilter that `upright design` analyses, to rounding: the module
  // builds it from the robot as the C ABI carries it, sensor resolutions included.
  ASSERT_TRUE(design_.lqg.ok) << design_.lqg.message;
  const design::LinearModel& plant = design_.plant;
  const auto designed = design::DesignLqgFilter(
      model_, plant, plant, design::DefaultFilterNoise(model_, plant), 1 / model_.control_rate_hz);
  ASSERT_TRUE(Succeeded(designed));
  const design::LqgFilter& filter = *designed;
  EXPECT_LT((filter.L_discrete - design_.lqg.L_discrete).norm(), 1e-12);
  auto created = CreateBuiltin("lqg", model_, {}, /*true_state=*/false);
  ASSERT_TRUE(Succeeded(created));
  const std::unique_ptr<ControllerHost> host = std::move(*created);
  const double g = model::kStandardGravity_m_s2, r = model_.wheel.radius_m,
               track = model_.wheel.track_m;
  sim::SensorSample first;
  first.gyro_rad_s = {0, 0.02, 0.004};
  first.accel_m_s2 = {-0.3, 0, 9.8};
  first.encoder_angle_rad = {0.10, 0.12};
  first.encoder_rate_rad_s = {0.5, 0.6};
  sim::SensorSample second = first;
  second.gyro_rad_s = {0, 0.03, 0.002};
  second.accel_m_s2 = {-0.2, 0, 9.8};
  second.encoder_angle_rad = {0.104, 0.126};
  const long period_steps = std::lround(1 / (model_.control_rate_hz * sim::PlantOptions{}.dt_s));
  second.time_s = static_cast<double>(period_steps) * sim::PlantOptions{}.dt_s;
  ASSERT_TRUE(host->Tick(0, first, nullptr, Reference{})) << host->fault();
  const auto u0 = host->command();
  ASSERT_TRUE(host->Tick(period_steps, second, nullptr, Reference{})) << host->fault();

  // The first sample starts the estimate: pitch from the accelerometer, rates from the gyro and
  // encoders, position and heading at zero, their origins set there (lqg_module.cpp).
  const double eq = plant.equilibrium_pitch_rad;
  const double pitch0 = std::atan2(-first.accel_m_s2[0], first.accel_m_s2[2]) - eq;
  const auto mean = [](const std::array<double, 2>& a) { return (a[0] + a[1]) / 2; };
  const auto heading = [&](const sim::SensorSample& s) {
    return r * (s.encoder_angle_rad[model::kRight] - s.encoder_angle_rad[model::kLeft]) / track;
  };
  design::StateVector x0;
  x0 << 0, r * (mean(first.encoder_rate_rad_s) + first.gyro_rad_s[1]), pitch0,
      first.gyro_rad_s[1], 0, first.gyro_rad_s[2];
  Eigen::Matrix<double, 5, 1> y;
  y << mean(second.encoder_angle_rad) - (mean(first.encoder_angle_rad) + pitch0),
      second.gyro_rad_s[1], heading(second) - heading(first), second.gyro_rad_s[2],
      second.accel_m_s2[0] / g + std::sin(eq);
  const Eigen::Vector2d u(u0[0], u0[1]);
  const design::StateVector prior = filter.Ad * x0 + filter.Bd * u;
  const design::StateVector expected =
      prior + filter.L_discrete * (y - filter.sensors.C * prior - filter.sensors.D * u);
  const double* d = host->diagnostics();  // pitch (absolute), pitch rate, x, speed, yaw
  const double got[5] = {d[0] - eq, d[1], d[2], d[3], d[4]};
  const int state_of[5] = {design::kPitch, design::kPitchRate, design::kX, design::kXDot,
                           design::kYaw};
  for (int i = 0; i < 5; ++i) {
    const double want = expected(state_of[i]);
    EXPECT_NEAR(got[i], want, 1e-9 * std::abs(want - prior(state_of[i])) + 1e-12)
        << design::StateName(state_of[i]) << " (prior " << prior(state_of[i]) << ")";
  }
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

TEST_P(DemoRobotDesign, PidPlacesThePolesItsSettingsAskFor) {
  // The pole keys reach the rule: the module's first command is that of the gains
  // design::DesignAll computes for the same PidPoles, and not that of the defaults.
  design::DesignRequest request;
  request.pid_poles = {.tilt_pole_factor = 3.5,
                       .tilt_damping = 0.5,
                       .speed_pole_factor = 0.25,
                       .speed_damping = 0.8,
                       .yaw_pole_factor = 2};
  const design::PidGains g = design::DesignAll(model_, request).pid.gains;
  const FirstTick tick = RunFirstTick("pid", model_,
                                      {{"tilt_pole_factor", "3.5"},
                                       {"tilt_damping", "0.5"},
                                       {"speed_pole_factor", "0.25"},
                                       {"speed_damping", "0.8"},
                                       {"yaw_pole_factor", "2"}});
  const double each = (g.tilt_kp_Nm_per_rad * tick.truth(design::kPitch) +
                       g.tilt_kd_Nm_s_per_rad * tick.truth(design::kPitchRate)) /
                      2;
  const double speed_term =
      g.tilt_kp_Nm_per_rad *
      (g.speed_kp_rad_per_m_s + g.speed_ki_rad_per_m / model_.control_rate_hz) *
      tick.truth(design::kXDot) / 2;
  ExpectCommand(tick, Eigen::Vector2d(each + speed_term, each + speed_term));
  // The defaults' command differs by far more than the tolerance: the tilt gain is not theirs.
  EXPECT_GT(std::abs(g.tilt_kp_Nm_per_rad - design_.pid.gains.tilt_kp_Nm_per_rad),
            0.1 * design_.pid.gains.tilt_kp_Nm_per_rad);
}

INSTANTIATE_TEST_SUITE_P(Robots, DemoRobotDesign, ::testing::Values("courier", "tabletop"));

}  // namespace
}  // namespace upright::host
