// What `upright design` says of each controller: its status (ok, unstable when sampled, failed,
// not offered) at the edges, and the delay the figures leave out against the delay margin.
#include "upright/design/design_set.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "demo_robot.hpp"

namespace upright::design {
namespace {

// A report made, with its sampled loop's largest |z| at `max_abs_z` (period 0: not analysed).
ControllerReport Made(double period_s, double max_abs_z) {
  ControllerReport r;
  r.ok = true;
  r.message = "ok";
  r.sampled.period_s = period_s;
  r.sampled.max_abs_z = max_abs_z;
  return r;
}

TEST(DesignSet, StatusFollowsTheSampledLoopWithOneOnTheUnstableSide) {
  // |z| = 1 is not asymptotically stable: a pole on the unit circle never decays (any text on
  // discrete systems; common practice).
  EXPECT_EQ(Made(0.005, std::nextafter(1.0, 0.0)).status(), DesignStatus::kOk);
  EXPECT_EQ(Made(0.005, 1.0).status(), DesignStatus::kUnstableSampled);
  EXPECT_EQ(Made(0.005, 3.5).status(), DesignStatus::kUnstableSampled);
  EXPECT_EQ(Made(0.005, NAN).status(), DesignStatus::kUnstableSampled);
  EXPECT_EQ(Made(0, 0).status(), DesignStatus::kOk);  // not analysed (PID)
  ControllerReport failed = Made(0.005, 0.5);
  failed.ok = false;
  EXPECT_EQ(failed.status(), DesignStatus::kFailed);
  ControllerReport unsupported;
  unsupported.supported = false;
  EXPECT_EQ(unsupported.status(), DesignStatus::kUnsupported);
  EXPECT_STREQ(ToString(DesignStatus::kOk), "ok");
  EXPECT_STREQ(ToString(DesignStatus::kUnstableSampled), "unstable_sampled");
  EXPECT_STREQ(ToString(DesignStatus::kFailed), "failed");
  EXPECT_STREQ(ToString(DesignStatus::kUnsupported), "unsupported");
}

TEST(DesignSet, PidWithVoltageInputIsNotOfferedRatherThanFailed) {
  DesignRequest request;
  request.input = InputKind::kVoltage;
  const DesignSet d = DesignAll(Demo("courier.xml"), request);
  EXPECT_EQ(d.pid.status(), DesignStatus::kUnsupported);
  EXPECT_NE(d.pid.message.find("torque input only"), std::string::npos) << d.pid.message;
  EXPECT_EQ(d.lqr.status(), DesignStatus::kOk) << d.lqr.message;
}

TEST(DesignSet, UnanalysedDelayIsTheLatencyPlusHalfAPeriodWhereTheHoldIsNotAnalysed) {
  model::RobotModel model = Demo("courier.xml");
  model.sensors.latency_s = 0.004;
  DesignRequest request;
  request.rate_hz = 50;
  const DesignSet d = DesignAll(model, request);
  ASSERT_TRUE(d.lqr.ok && d.pid.ok) << d.lqr.message << "; " << d.pid.message;
  // The sampled LQR loop includes the hold; the PID figures are continuous, and a zero-order
  // hold lags like half a period (common practice).
  EXPECT_DOUBLE_EQ(d.lqr.unanalysed_delay_s, 0.004);
  EXPECT_DOUBLE_EQ(d.hinf.unanalysed_delay_s, 0.004);
  EXPECT_DOUBLE_EQ(d.lqg.unanalysed_delay_s, 0.004);
  EXPECT_DOUBLE_EQ(d.pid.unanalysed_delay_s, 0.004 + 0.5 / 50);
}

TEST(DesignSet, DelayMarginIsShortJustPastTheLatency) {
  // The designs do not depend on the latency, so the LQR's delay margin at zero latency is the
  // edge: a latency at the margin leaves the loop on the edge (not short), a latency past it is.
  model::RobotModel model = Demo("courier.xml");
  model.sensors.latency_s = 0;
  const DesignSet at_zero = DesignAll(model, DesignRequest{});
  ASSERT_TRUE(at_zero.lqr.ok) << at_zero.lqr.message;
  const double margin_s = at_zero.lqr.loop.margins.delay_s;
  ASSERT_TRUE(std::isfinite(margin_s) && margin_s > 0) << margin_s;
  EXPECT_FALSE(at_zero.lqr.delay_margin_short());

  model.sensors.latency_s = margin_s;
  const DesignSet at_margin = DesignAll(model, DesignRequest{});
  EXPECT_EQ(at_margin.lqr.loop.margins.delay_s, margin_s);
  EXPECT_FALSE(at_margin.lqr.delay_margin_short());

  model.sensors.latency_s = margin_s * (1 + 1e-9);
  const DesignSet past = DesignAll(model, DesignRequest{});
  EXPECT_TRUE(past.lqr.delay_margin_short());

  // A design that failed says nothing of its margins.
  ControllerReport failed;
  failed.unanalysed_delay_s = 1;
  EXPECT_FALSE(failed.delay_margin_short());
}

}  // namespace
}  // namespace upright::design
