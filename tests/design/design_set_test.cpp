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
  // The sampled loops include the hold and the latency; the PID figures are continuous, and a
  // zero-order hold lags like half a period (common practice).
  EXPECT_EQ(d.lqr.unanalysed_delay_s, 0);
  EXPECT_EQ(d.hinf.unanalysed_delay_s, 0);
  EXPECT_EQ(d.lqg.unanalysed_delay_s, 0);
  EXPECT_DOUBLE_EQ(d.pid.unanalysed_delay_s, 0.004 + 0.5 / 50);
  EXPECT_EQ(d.lqr.sampled_margins.latency_s, 0.004);
}

TEST(DesignSet, DelayMarginIsShortJustPastTheLatency) {
  // The PID design does not depend on the latency, so its delay margin less half a period (the
  // hold its continuous figures leave out) is the edge: a latency there leaves the loop on the
  // edge (not short), a latency past it is.
  // At 50 Hz the sampled loops analysed beside it hold few past inputs.
  model::RobotModel model = Demo("courier.xml");
  model.sensors.latency_s = 0;
  DesignRequest request;
  request.rate_hz = 50;
  const DesignSet at_zero = DesignAll(model, request);
  ASSERT_TRUE(at_zero.pid.ok) << at_zero.pid.message;
  const double half_period_s = 0.5 / at_zero.request.rate_hz;
  const double edge_s = at_zero.pid.loop.margins.delay_s - half_period_s;
  ASSERT_TRUE(std::isfinite(edge_s) && edge_s > 0) << edge_s;
  EXPECT_FALSE(at_zero.pid.delay_margin_short());

  model.sensors.latency_s = edge_s * (1 - 1e-12);
  const DesignSet at_edge = DesignAll(model, request);
  EXPECT_EQ(at_edge.pid.loop.margins.delay_s, at_zero.pid.loop.margins.delay_s);
  EXPECT_FALSE(at_edge.pid.delay_margin_short());

  model.sensors.latency_s = edge_s * (1 + 1e-9);
  const DesignSet past = DesignAll(model, request);
  EXPECT_TRUE(past.pid.delay_margin_short());

  // A design that failed says nothing of its margins.
  ControllerReport failed;
  failed.unanalysed_delay_s = 1;
  EXPECT_FALSE(failed.delay_margin_short());
}

TEST(DesignSet, LatencyPastTheSampledDelayMarginMakesTheDesignUnstableSampled) {
  // The latency is the same delay on both wheels, so the sampled both-wheels delay margin is the
  // latency the loop can still take: the H-infinity design (which does not depend on the latency)
  // stays ok just below latency + margin and is unstable as sampled just above.
  model::RobotModel model = Demo("tabletop.xml");
  const DesignSet nominal = DesignAll(model, DesignRequest{});
  ASSERT_EQ(nominal.hinf.status(), DesignStatus::kOk) << nominal.hinf.message;
  const double total_s = model.sensors.latency_s + nominal.hinf.sampled_margins.both_wheels.delay_s;
  model.sensors.latency_s = total_s * (1 - 1e-6);
  EXPECT_EQ(DesignAll(model, DesignRequest{}).hinf.status(), DesignStatus::kOk);
  model.sensors.latency_s = total_s * (1 + 1e-6);
  const DesignSet past = DesignAll(model, DesignRequest{});
  EXPECT_EQ(past.hinf.status(), DesignStatus::kUnstableSampled);
  EXPECT_FALSE(past.hinf.sampled_margins.analysed());  // no margins for an unstable loop
}

}  // namespace
}  // namespace upright::design
