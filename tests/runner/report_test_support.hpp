// Test helpers for the report: a small results folder made by a real batch (two controllers, a
// shove that one of them does not survive, a drive command after it, two seeds, traces at 50 Hz,
// the linear twin), made once per test program.
#pragma once

#include <gtest/gtest.h>

#include <filesystem>
#include <string>

#include "run_test_support.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/tables/results_writer.hpp"

namespace upright::runner::testing {

// A 250 N half-sine shove at 0.45 m: above what LQR survives on the courier (about 164 N in the
// demo's envelope), well below PID's (about 436 N); then a slow drive whose label holds a comma.
inline const char* kReportScenario = R"(<scenario name="shove" schema="1" duration_s="2.5">
  <description>Test: a shove one controller does not survive, then a drive.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N="250" duration_s="0.3" height_m="0.45"/>
    <drive at_s="2" speed_m_s="0.2" ramp_s="0.3"/>
  </timeline>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>
  </controllers>
  <seeds list="1 2"/>
</scenario>)";

struct SmallRun {
  std::filesystem::path dir;
  BatchResult batch;
};

// The batch run and written into a scratch folder, once.
inline const SmallRun& SmallRunFolder() {
  static const SmallRun run = [] {
    SmallRun r;
    r.dir = ScratchDir("report-run");
    BatchOptions options;
    options.jobs = 2;
    options.run.trace_rate_hz = 50;
    options.run.linear_twin = true;
    r.batch = RunBatch({ScenarioFromText(kReportScenario, "shove.xml")}, options, "test", nullptr);
    const Status written = WriteResults(r.dir.string(), r.batch);
    EXPECT_TRUE(written) << written.error();
    return r;
  }();
  return run;
}

}  // namespace upright::runner::testing
