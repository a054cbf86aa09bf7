// The gap between the twin and the plant: peaks, the bands and the first time past them, worked
// by hand on short series; the events the linear model leaves out.
#include "upright/runner/twin/twin_gap.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "run_test_support.hpp"
#include "upright/model/conventions.hpp"

namespace upright::runner {
namespace {

constexpr double kRad = std::numbers::pi / 180;

TiltDriftSeries Series(std::vector<double> tilt_deg, std::vector<double> drift_m) {
  TiltDriftSeries s;
  s.dt_s = 0.01;
  for (std::size_t k = 0; k < tilt_deg.size(); ++k) s.Add(tilt_deg[k] * kRad, drift_m[k]);
  return s;
}

TEST(TwinGap, PeaksBandsAndTheFirstTimePastThem) {
  // Plant peak tilt 12° (band max(1°, 1.2°) = 1.2°), peak drift 0.1 m (band max(0.05, 0.01) m).
  const TiltDriftSeries plant = Series({0, 2, -12, 4, 1}, {0, 0.01, 0.05, 0.1, 0.08});
  const TiltDriftSeries twin = Series({0, 2.5, -10.5, 4.2, 1, 9}, {0, 0.04, 0.06, 0.16, 0.09, 0.2});
  const GapFigures g = CompareTwin(twin, plant);
  EXPECT_TRUE(g.ran);
  EXPECT_NEAR(g.peak_tilt_plant_deg, 12, 1e-12);
  EXPECT_NEAR(g.peak_tilt_linear_deg, 10.5, 1e-12);
  EXPECT_NEAR(g.peak_drift_plant_m, 0.1, 1e-15);
  EXPECT_NEAR(g.peak_drift_linear_m, 0.2, 1e-15);  // its own whole run, past the plant's end
  EXPECT_NEAR(g.tilt_band_deg, 1.2, 1e-12);
  EXPECT_NEAR(g.drift_band_m, 0.05, 1e-15);
  EXPECT_NEAR(g.tilt_diverge_s, 0.02, 1e-15);   // |−10.5 − (−12)| = 1.5° > 1.2° at sample 2
  EXPECT_NEAR(g.drift_diverge_s, 0.03, 1e-15);  // 0.06 m > 0.05 m at sample 3 (0.03 at 1 is not)
}

TEST(TwinGap, AQuietRunWithinTheFloorsNeverDiverges) {
  const TiltDriftSeries plant = Series({0.1, 0.6, -0.4}, {0, 0.005, 0.03});
  const TiltDriftSeries twin = Series({0.1, -0.3, 0.4}, {0, 0.04, 0.07});
  const GapFigures g = CompareTwin(twin, plant);
  EXPECT_NEAR(g.tilt_band_deg, 1.0, 1e-15);
  EXPECT_NEAR(g.drift_band_m, 0.05, 1e-15);
  EXPECT_TRUE(std::isnan(g.tilt_diverge_s));
  EXPECT_TRUE(std::isnan(g.drift_diverge_s));
}

TEST(TwinGap, ListsWhatTheLinearModelLeavesOut) {
  const Scenario parked = testing::ScenarioFromText(R"(<scenario name="p" schema="1" duration_s="2">
  <description>Test: a push straight ahead.</description>
  <robot file="../models/courier.xml"/>
  <timeline><push at_s="0.5" shape="impulse" peak_N="50" duration_s="0.1"/></timeline>
  <controllers baseline="lqr"><controller name="lqr" builtin="lqr"/></controllers>
</scenario>)");
  EXPECT_EQ(NotModelled(parked), "");

  const Scenario busy = testing::ScenarioFromText(R"(<scenario name="b" schema="1" duration_s="4">
  <description>Test: everything the linear model does not have, and a drive it does.</description>
  <robot file="../models/courier.xml"/>
  <ground kind="slope" slope_deg="3"/>
  <timeline>
    <push at_s="0.5" shape="impulse" peak_N="50" duration_s="0.1" direction_deg="90"/>
    <payload_shift at_s="1" distance_m="0.1" duration_s="0.5"/>
    <drive at_s="1.5" speed_m_s="0.5" ramp_s="0.5"/>
    <motor_fault at_s="2" side="left" torque_scale="0.5"/>
    <sensor_fault at_s="3" channel="gyro_y" kind="dropout" duration_s="0.1"/>
  </timeline>
  <controllers baseline="lqr"><controller name="lqr" builtin="lqr"/></controllers>
</scenario>)");
  EXPECT_EQ(NotModelled(busy),
            "lateral part of the push at 0.5 s (100 % of it); payload shift +0.1 m at 1 s; motor "
            "fault left x0.5 at 2 s; sensor fault gyro_y dropout at 3 s; slope 3 deg");
  // The drive is not among them: the twin is handed the same speed and yaw-rate reference
  // (AddLinearTwin builds its plan from the run's own timeline).
  EXPECT_EQ(NotModelled(busy).find("drive"), std::string::npos);
}

}  // namespace
}  // namespace upright::runner
