#include "upright/runner/metrics/metric_settings.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <utility>

#include "upright/runner/metrics/run_metrics.hpp"

namespace upright::runner {
namespace {

TEST(MetricSettings, DefaultsAreValid) {
  const Status valid = MetricSettings{}.Validate();
  EXPECT_TRUE(valid) << valid.error();
}

TEST(MetricSettings, RejectsZeroWindowNamingFieldValueAndRule) {
  MetricSettings s;
  s.window_s = 0;
  const Status valid = s.Validate();
  ASSERT_FALSE(valid);
  EXPECT_EQ(valid.error(), "MetricSettings::window_s = 0, must be > 0");
}

TEST(MetricSettings, RejectsEachBrokenRule) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  struct Case {
    void (*set)(MetricSettings*);
    const char* message;
  };
  const Case cases[] = {
      {[](MetricSettings* s) { s->fall_tilt_deg = 0; },
       "MetricSettings::fall_tilt_deg = 0, must be in (0, 90]"},
      {[](MetricSettings* s) { s->fall_tilt_deg = 91; },
       "MetricSettings::fall_tilt_deg = 91, must be in (0, 90]"},
      {[](MetricSettings* s) { s->tilt_band_deg = -1; },
       "MetricSettings::tilt_band_deg = -1, must be > 0"},
      {[](MetricSettings* s) { s->drift_band_m = 0; },
       "MetricSettings::drift_band_m = 0, must be > 0"},
      {[](MetricSettings* s) { s->window_s = -2; }, "MetricSettings::window_s = -2, must be > 0"},
      {[](MetricSettings* s) { s->slip_threshold = 0; },
       "MetricSettings::slip_threshold = 0, must be in (0, 1]"},
      {[](MetricSettings* s) { s->slip_threshold = 1.5; },
       "MetricSettings::slip_threshold = 1.5, must be in (0, 1]"},
  };
  for (const Case& c : cases) {
    MetricSettings s;
    c.set(&s);
    const Status valid = s.Validate();
    ASSERT_FALSE(valid) << c.message;
    EXPECT_EQ(valid.error(), c.message);
  }
  MetricSettings s;
  s.window_s = nan;
  const Status not_a_number = s.Validate();
  ASSERT_FALSE(not_a_number);
  EXPECT_EQ(not_a_number.error(), "MetricSettings::window_s = nan, must be > 0");
  s = MetricSettings{};
  s.window_s = inf;
  const Status infinite = s.Validate();
  ASSERT_FALSE(infinite);
  EXPECT_EQ(infinite.error(), "MetricSettings::window_s = inf, must be finite");
  s = MetricSettings{};
  s.fall_tilt_deg = 90;  // the closed end of (0, 90]
  s.slip_threshold = 1;  // the closed end of (0, 1]
  const Status closed_ends = s.Validate();
  EXPECT_TRUE(closed_ends) << closed_ends.error();
}

TEST(RunStatus, StringsRoundTrip) {
  const std::pair<RunStatus, const char*> names[] = {
      {RunStatus::kNotRun, "not_run"},
      {RunStatus::kOk, "ok"},
      {RunStatus::kFell, "fell"},
      {RunStatus::kControllerFault, "controller_fault"},
      {RunStatus::kNumericFailure, "numeric_failure"},
      {RunStatus::kSetupFailed, "setup_failed"},
  };
  for (const auto& [status, name] : names) {
    EXPECT_STREQ(ToString(status), name);
    RunStatus parsed = RunStatus::kNotRun;
    EXPECT_TRUE(FromString(name, &parsed)) << name;
    EXPECT_EQ(parsed, status);
  }
}

TEST(RunStatus, RejectsUnknownText) {
  RunStatus parsed = RunStatus::kOk;
  EXPECT_FALSE(FromString("OK", &parsed));
  EXPECT_FALSE(FromString("", &parsed));
  EXPECT_EQ(parsed, RunStatus::kOk);
}

TEST(RunMetrics, StartsNotRunWithEveryFigureNaN) {
  const RunMetrics m;
  EXPECT_EQ(m.status, RunStatus::kNotRun);
  EXPECT_EQ(m.message, "not run");
  // A run that never happened has no figure: none may read as a flawless 0.
  for (double figure :
       {m.fall_time_s, m.end_time_s, m.max_tilt_deg, m.max_drift_m, m.tilt_settle_s,
        m.drift_settle_s, m.tilt_rebound_deg, m.tilt_rebound_pct, m.rms_tilt_deg, m.iae_tilt_deg_s,
        m.effort_Nm2s, m.peak_torque_Nm, m.peak_current_A, m.saturation_pct, m.command_limit_pct,
        m.max_slip_ratio, m.slip_time_s, m.energy_J}) {
    EXPECT_TRUE(std::isnan(figure)) << figure;
  }
}

}  // namespace
}  // namespace upright::runner
