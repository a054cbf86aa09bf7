// The pid module's anti-windup on the motors' real saturation, through the ABI with the true state
// handed in: while the wheel torques sit at the drives' limit, neither integrator takes a step
// that would drive its output further into it, and both integrate again once the limit is left.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <memory>
#include <string>

#include "builtin_run.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/pid.hpp"
#include "upright/design/weights.hpp"

namespace upright::host {
namespace {

using testing::CreateBuiltin;
using testing::DemoRobot;

constexpr int kSpeedIntegral = 5, kYawIntegral = 6;  // the pid module's diagnostic slots

class PidWindup : public ::testing::Test {
 protected:
  void SetUp() override {
    auto created = CreateBuiltin("pid", model_, {{"state", "true"}}, /*true_state=*/true);
    ASSERT_TRUE(Succeeded(created));
    host_ = std::move(*created);
    ASSERT_EQ(host_->diagnostic_names()[kSpeedIntegral], "speed_integral_m");
    ASSERT_EQ(host_->diagnostic_names()[kYawIntegral], "yaw_integral_rad");
  }

  // One control tick with the robot leaning `lean_rad` from its equilibrium, rolling at `speed`,
  // turning at `yaw_rate`, wheels still relative to the chassis.
  void Tick(double lean_rad, double speed, double yaw_rate, const Reference& reference) {
    truth_.pitch_rad = plant_.equilibrium_pitch_rad + lean_rad;
    truth_.forward_speed_m_s = speed;
    truth_.yaw_rate_rad_s = yaw_rate;
    ASSERT_TRUE(host_->Tick(step_, sim::SensorSample{}, &truth_, reference)) << host_->fault();
    step_ += host_->period_steps();
  }

  double Diagnostic(int slot) const { return host_->diagnostics()[slot]; }

  model::RobotModel model_ = DemoRobot("courier");
  design::LinearModel plant_ = design::Linearise(model_, design::InputKind::kTorque);
  design::PidGains gains_ =
      design::TunePid(plant_, design::PidPoles{}, design::DesignWeights{}.max_tilt_deg);
  double stall_Nm_ = design::InputLimit(model_, design::InputKind::kTorque);
  double period_s_ = 1 / model_.control_rate_hz;
  std::unique_ptr<ControllerHost> host_;
  sim::TrueState truth_;
  long step_ = 0;
};

TEST_F(PidWindup, SpeedIntegralHoldsWhileTheWheelsAreAtTheirLimit) {
  // Leaning 0.3 rad forward: the tilt PD alone asks for tilt_kp · 0.3, several times the stall
  // torque, so both wheels sit at +stall. Rolling faster than the (zero) reference, e_v < 0: the
  // speed integral's step lowers θ_ref and raises the torque further into the limit. The speed
  // error is small enough that θ_ref = speed_kp e_v stays inside its own clamp, so only the
  // motors' saturation can stop the integral.
  ASSERT_GT(gains_.tilt_kp_Nm_per_rad * 0.3, 2 * stall_Nm_);
  const double speed = 0.3 * gains_.max_tilt_ref_rad / gains_.speed_kp_rad_per_m_s;
  for (int k = 0; k < 200; ++k) {
    Tick(0.3, speed, 0, Reference{});
    ASSERT_NEAR(host_->command()[0], stall_Nm_, 1e-9 * stall_Nm_) << "tick " << k;
    ASSERT_NEAR(host_->command()[1], stall_Nm_, 1e-9 * stall_Nm_);
    ASSERT_EQ(Diagnostic(kSpeedIntegral), 0) << "tick " << k;
  }
  // Upright again, the same speed error: the torque leaves the limit and the integral takes
  // e_v T a tick.
  for (int k = 1; k <= 10; ++k) {
    Tick(0, speed, 0, Reference{});
    ASSERT_LT(std::abs(host_->command()[0]), stall_Nm_);
    ASSERT_NEAR(Diagnostic(kSpeedIntegral), -speed * period_s_ * k, 1e-12) << "tick " << k;
  }
}

TEST_F(PidWindup, SpeedIntegralStillStepsOutOfTheLimit) {
  // At the limit as above, but rolling backward against the zero reference, e_v > 0: the step
  // raises θ_ref and lowers the torque, out of the limit, and is taken (conditional integration
  // stops only the steps that drive further in).
  const double speed = -0.3 * gains_.max_tilt_ref_rad / gains_.speed_kp_rad_per_m_s;
  for (int k = 1; k <= 10; ++k) {
    Tick(0.3, speed, 0, Reference{});
    ASSERT_NEAR(host_->command()[0], stall_Nm_, 1e-9 * stall_Nm_);
    ASSERT_NEAR(Diagnostic(kSpeedIntegral), -speed * period_s_ * k, 1e-12) << "tick " << k;
  }
}

TEST_F(PidWindup, YawIntegralHoldsWhileBalanceTakesAllTheTorque) {
  // Leaning 0.3 rad forward and asked to turn left at 0.5 rad/s: the common mode takes all the
  // torque there is, the differential is cut to nothing, and the yaw integral, whose step would
  // widen it, holds. Upright again, it integrates e_r T a tick.
  Reference turn;
  turn.yaw_rate_rad_s = 0.5;
  for (int k = 0; k < 200; ++k) {
    Tick(0.3, 0, 0, turn);
    ASSERT_NEAR(host_->command()[0], host_->command()[1], 1e-12) << "tick " << k;
    ASSERT_EQ(Diagnostic(kYawIntegral), 0) << "tick " << k;
  }
  for (int k = 1; k <= 10; ++k) {
    Tick(0, 0, 0, turn);
    ASSERT_NEAR(Diagnostic(kYawIntegral), 0.5 * period_s_ * k, 1e-12) << "tick " << k;
  }
  EXPECT_GT(host_->command()[1], host_->command()[0]);  // the right wheel ahead: turning left
}

}  // namespace
}  // namespace upright::host
