// Envelopes end to end on the courier demo robot: the defaults and refusals of a plan, a push
// envelope whose survived value really survives, the same files whatever the number of jobs, a
// survival map with its easy and hard corners, and a controller that cannot be run.
#include "upright/runner/envelope/envelope.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "parameter_unit.hpp"
#include "run_test_support.hpp"
#include "upright/runner/envelope/envelope_writer.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/scenario/scenario_parameter.hpp"

namespace upright::runner {
namespace {

using testing::ReadFile;
using testing::ScenarioFromText;
using testing::ScratchDir;

// A parked courier shoved once by a half-sine push at 0.5 s, for 4 s, on one seed.
std::string ShoveText(const std::string& controllers = R"(<controller name="lqr" builtin="lqr"/>)",
                      const std::string& peak_N = "160") {
  return R"(<scenario name="shove" schema="1" duration_s="4">
  <description>Test: a parked courier shoved once.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N=")" +
         peak_N + R"(" duration_s="0.3" height_m="0.45"/>
  </timeline>
  <controllers>)" +
         controllers + R"(</controllers>
  <seeds list="1"/>
</scenario>)";
}

EnvelopeOptions PeakOptions() {
  EnvelopeOptions options;
  options.param = "timeline/push[1].peak_N";
  options.lo = 40;
  options.hi = 640;
  options.tol = 20;  // coarse, to keep the test short
  options.jobs = 2;
  return options;
}

TEST(EnvelopePlan, FillsTheDefaultRangeFromTheScenario) {
  const Scenario s = ScenarioFromText(ShoveText());
  EnvelopeOptions options;
  options.param = "timeline/push[1].peak_N";
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  EXPECT_EQ(plan.axis.unit, "N");
  EXPECT_DOUBLE_EQ(plan.axis.scenario_value, 160);
  EXPECT_DOUBLE_EQ(plan.axis.lo, 40);   // 0.25 × 160
  EXPECT_DOUBLE_EQ(plan.axis.hi, 640);  // 4 × 160
  EXPECT_DOUBLE_EQ(plan.tol, 3);        // (640 − 40) / 200
  EXPECT_EQ(plan.seeds, (std::vector<std::uint64_t>{1}));
  // One controller, one seed: 200 = w / tol, 2^8 = 256, so 8 halvings + 2 ends.
  EXPECT_EQ(plan.max_runs, 10u);
  EXPECT_FALSE(plan.axis2);
}

TEST(EnvelopePlan, OrdersTheDefaultRangeOfANegativeValue) {
  const Scenario s =
      ScenarioFromText(ShoveText(R"(<controller name="lqr" builtin="lqr"/>)", "-80"));
  EnvelopeOptions options;
  options.param = "timeline/push[1].peak_N";
  options.seed_count = 3;
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  EXPECT_DOUBLE_EQ(plan.axis.lo, -320);
  EXPECT_DOUBLE_EQ(plan.axis.hi, -20);
  EXPECT_EQ(plan.seeds, (std::vector<std::uint64_t>{1, 2, 3}));
}

TEST(EnvelopePlan, RefusesBadInputWithTheReason) {
  const Scenario s = ScenarioFromText(ShoveText());
  // Why `options` are refused; a test failure, and "", when they are not.
  const auto refusal = [&](const EnvelopeOptions& options) {
    const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
    EXPECT_FALSE(planned);
    return planned ? std::string() : planned.error();
  };
  EnvelopeOptions options = PeakOptions();
  std::string error;

  options.param = "timeline/push[2].peak_N";
  error = refusal(options);
  EXPECT_NE(error.find("push[2]"), std::string::npos) << error;
  EXPECT_NE(error.find("has 1"), std::string::npos) << error;

  options = PeakOptions();
  options.param = "timeline/push[1].peak_kN";
  error = refusal(options);
  EXPECT_NE(error.find("peak_kN"), std::string::npos) << error;

  options = PeakOptions();
  options.lo = 640;
  error = refusal(options);
  EXPECT_NE(error.find("lo = 640, must be < hi = 640"), std::string::npos) << error;

  options = PeakOptions();
  options.tol = 0;
  error = refusal(options);
  EXPECT_NE(error.find("tol = 0"), std::string::npos) << error;

  // The start pitch is 0 in the file: no default range.
  options = PeakOptions();
  options.param = "start.pitch_deg";
  options.lo.reset();
  options.hi.reset();
  options.tol.reset();
  error = refusal(options);
  EXPECT_NE(error.find("--lo and --hi"), std::string::npos) << error;

  // A push after the run's end (4 s) is refused at the range's end.
  options = PeakOptions();
  options.param = "timeline/push[1].at_s";
  options.lo = 0.5;
  options.hi = 5;
  error = refusal(options);
  EXPECT_NE(error.find("at_s = 5"), std::string::npos) << error;

  options = PeakOptions();
  options.param2 = options.param;
  error = refusal(options);
  EXPECT_NE(error.find("param2"), std::string::npos) << error;

  // Ends each finite, but a width that is not (its default tolerance would be infinite too).
  options = PeakOptions();
  options.lo = -1e308;
  options.hi = 1e308;
  options.tol.reset();
  error = refusal(options);
  EXPECT_NE(error.find("the range from -1e+308 to 1e+308 is wider than a number holds"),
            std::string::npos)
      << error;

  // A tolerance finer than 2^-52 of the range: a bisection to it could not end. At exactly
  // 2^-52 of the range it plans 52 halvings and 54 probes a seed and controller.
  options = PeakOptions();
  options.lo = 0;
  options.hi = 1;
  options.tol = 0x1p-53;
  error = refusal(options);
  EXPECT_NE(error.find("is finer than a number resolves across the range 0 to 1"),
            std::string::npos)
      << error;
  options.tol = 0x1p-52;
  const Result<EnvelopePlan> finest = PlanEnvelope(s, options);
  ASSERT_TRUE(finest) << finest.error();
  EXPECT_EQ(finest->max_runs, 54 * s.controllers.size() * finest->seeds.size());
}

TEST(Envelope, PushPeakIsBracketedAndTheSurvivedValueSurvives) {
  const Scenario s = ScenarioFromText(ShoveText());
  const EnvelopeOptions options = PeakOptions();
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  const EnvelopeResult r = RunEnvelope(s, options, plan, "test", nullptr);
  ASSERT_EQ(r.controllers.size(), 1u);
  const ControllerEnvelope& lqr = r.controllers[0];
  ASSERT_TRUE(lqr.setup_error.empty()) << lqr.setup_error;
  ASSERT_EQ(lqr.bisect.outcome, BisectOutcome::kBracketed);
  EXPECT_EQ(lqr.bisect.direction, HarderDirection::kUpward);
  EXPECT_LT(lqr.bisect.survived_value, lqr.bisect.first_failing_value);
  EXPECT_LE(lqr.bisect.first_failing_value - lqr.bisect.survived_value, 20);
  // 600 / 20 = 30; 2^4 = 16 < 30 <= 32 = 2^5: 5 halvings + 2 ends, one run each.
  EXPECT_EQ(lqr.bisect.probes, 7);
  EXPECT_EQ(lqr.probes.size(), 7u);
  EXPECT_EQ(r.runs, 7u);
  EXPECT_FALSE(lqr.failure.empty());
  EXPECT_FALSE(r.any_setup_failed());

  // The probes at the two values, rerun here: one survives, the other does not.
  const auto module = testing::BuiltinModule("lqr");
  ASSERT_NE(module, nullptr);
  RunOptions run_options;
  run_options.trace_rate_hz = 0;
  run_options.stop_when_settled = true;
  for (const double value : {lqr.bisect.survived_value, lqr.bisect.first_failing_value}) {
    Scenario probe = s;
    const Status set = SetScenarioParameter(&probe, options.param, value);
    ASSERT_TRUE(set) << set.error();
    const RunResult run = RunOne(probe, 0, 1, module, run_options);
    EXPECT_EQ(run.metrics.status == RunStatus::kOk, value == lqr.bisect.survived_value)
        << value << ": " << run.metrics.message;
  }
  // Survival is judged over the whole run, not just until settled: the survived value also
  // survives a run played to the scenario's end.
  Scenario full = s;
  const Status set = SetScenarioParameter(&full, options.param, lqr.bisect.survived_value);
  ASSERT_TRUE(set) << set.error();
  EXPECT_EQ(RunOne(full, 0, 1, module, RunOptions{}).metrics.status, RunStatus::kOk);
}

TEST(Envelope, ReportsBothEndsHonestlyWithoutBisecting) {
  const Scenario s = ScenarioFromText(ShoveText());
  EnvelopeOptions options = PeakOptions();

  options.lo = 10;
  options.hi = 30;  // gentle nudges
  Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  EnvelopeResult r = RunEnvelope(s, options, *planned, "test", nullptr);
  EXPECT_EQ(r.controllers[0].bisect.outcome, BisectOutcome::kSurvivesWholeRange);
  EXPECT_EQ(r.controllers[0].bisect.probes, 2);

  options.lo = 2000;
  options.hi = 3000;  // far beyond what 41 N·m of wheel torque can catch
  planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  r = RunEnvelope(s, options, *planned, "test", nullptr);
  EXPECT_EQ(r.controllers[0].bisect.outcome, BisectOutcome::kFailsAtBothEnds);
  EXPECT_EQ(r.controllers[0].bisect.probes, 2);
  EXPECT_EQ(r.runs, 2u);
}

TEST(Envelope, FilesAreByteIdenticalWithOneJobOrTwo) {
  const Scenario s = ScenarioFromText(ShoveText(R"(<controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>)"));
  EnvelopeOptions options = PeakOptions();
  options.tol = 40;
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  options.jobs = 1;
  const EnvelopeResult a = RunEnvelope(s, options, plan, "test", nullptr);
  options.jobs = 2;
  std::size_t last_done = 0, calls = 0;
  const EnvelopeResult b =
      RunEnvelope(s, options, plan, "test", [&](std::size_t done, std::size_t total) {
        EXPECT_EQ(done, last_done + 1);
        EXPECT_LE(done, total);
        last_done = done;
        ++calls;
      });
  EXPECT_EQ(calls, b.runs);
  ASSERT_EQ(a.controllers.size(), 2u);
  for (std::size_t c = 0; c < 2; ++c) {
    ASSERT_EQ(a.controllers[c].probes.size(), b.controllers[c].probes.size());
    for (std::size_t p = 0; p < a.controllers[c].probes.size(); ++p) {
      EXPECT_EQ(a.controllers[c].probes[p].value, b.controllers[c].probes[p].value);
      EXPECT_EQ(a.controllers[c].probes[p].seeds_survived,
                b.controllers[c].probes[p].seeds_survived);
    }
  }
  const auto dir_a = ScratchDir("envelope-jobs1"), dir_b = ScratchDir("envelope-jobs2");
  const Status written_a = WriteEnvelopeResults(dir_a.string(), a);
  ASSERT_TRUE(written_a) << written_a.error();
  const Status written_b = WriteEnvelopeResults(dir_b.string(), b);
  ASSERT_TRUE(written_b) << written_b.error();
  for (const auto& name : EnvelopeFileNames(a)) {
    const std::string text = ReadFile(dir_a / name);
    EXPECT_FALSE(text.empty()) << name;
    if (name == "manifest.json") continue;  // wall time and the job count differ by design
    EXPECT_EQ(text, ReadFile(dir_b / name)) << name;
  }
  // A header and one row per controller, each naming the parameter and its unit.
  const std::string csv = ReadFile(dir_a / "envelope.csv");
  EXPECT_EQ(
      csv.rfind("scenario,controller,baseline,parameter,unit,lo,hi,tol,direction,survived_value,"
                "first_failing_value,probes,seeds,outcome,message\n",
                0),
      0u);
  EXPECT_NE(csv.find("shove,lqr,true,timeline/push[1].peak_N,N,40,640,40,"), std::string::npos)
      << csv;
  EXPECT_NE(csv.find("shove,pid,false,timeline/push[1].peak_N,N,40,640,40,"), std::string::npos)
      << csv;
  const std::string md = ReadFile(dir_a / "envelope.md");
  EXPECT_NE(md.find("| lqr (baseline) |"), std::string::npos) << md;
  EXPECT_NE(md.find("simulated robot only"), std::string::npos) << md;
}

TEST(Envelope, SurvivalMapSurvivesTheEasyCornerAndFallsAtTheHardOne) {
  const Scenario s = ScenarioFromText(ShoveText());
  EnvelopeOptions options = PeakOptions();
  options.hi = 400;   // peaks 40, 220, 400 N
  options.tol = 200;  // the bisection is not what this test is about
  options.param2 = "timeline/push[1].duration_s";
  options.lo2 = 0.1;  // lasting 0.1, 0.3, 0.5 s
  options.hi2 = 0.5;
  options.grid = 3;
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  ASSERT_TRUE(plan.axis2);
  EXPECT_EQ(plan.axis2->unit, "s");
  const EnvelopeResult r = RunEnvelope(s, options, plan, "test", nullptr);
  ASSERT_EQ(r.maps.size(), 1u);
  const ControllerMap& map = r.maps[0];
  ASSERT_EQ(map.points.size(), 9u);
  EXPECT_TRUE(map.setup_error.empty()) << map.setup_error;
  // Row by row along the duration, each row along the peak.
  EXPECT_DOUBLE_EQ(map.points[0].value, 40);
  EXPECT_DOUBLE_EQ(map.points[0].value2, 0.1);
  EXPECT_DOUBLE_EQ(map.points[1].value, 220);
  EXPECT_EQ(map.points[3].value2, 0.3);  // exactly the double nearest 0.3, as a file would say
  EXPECT_DOUBLE_EQ(map.points[8].value, 400);
  EXPECT_DOUBLE_EQ(map.points[8].value2, 0.5);
  EXPECT_TRUE(map.points[0].survived());   // 40 N for 0.1 s: a nudge
  EXPECT_FALSE(map.points[8].survived());  // 400 N for 0.5 s: about 127 N·s
  // Monotone along each axis: a point that survives has every easier neighbour surviving.
  for (std::size_t k = 0; k < 9; ++k) {
    if (!map.points[k].survived()) continue;
    if (k % 3 > 0) {
      EXPECT_TRUE(map.points[k - 1].survived()) << k;
    }
    if (k >= 3) {
      EXPECT_TRUE(map.points[k - 3].survived()) << k;
    }
  }
  const auto dir = ScratchDir("envelope-map");
  const Status written = WriteEnvelopeResults(dir.string(), r);
  ASSERT_TRUE(written) << written.error();
  const std::string csv = ReadFile(dir / "envelope_map.csv");
  EXPECT_EQ(csv.rfind("scenario,controller,parameter,value,parameter2,value2,survived,"
                      "seeds_survived,seeds\n",
                      0),
            0u);
  EXPECT_NE(
      csv.find("shove,lqr,timeline/push[1].peak_N,40,timeline/push[1].duration_s,0.1,true,1,1"),
      std::string::npos)
      << csv;
  EXPECT_NE(
      csv.find("shove,lqr,timeline/push[1].peak_N,400,timeline/push[1].duration_s,0.5,false,0,1"),
      std::string::npos)
      << csv;
  const std::string md = ReadFile(dir / "envelope.md");
  EXPECT_NE(md.find("## Survival map"), std::string::npos) << md;
  // The bottom row (0.1 s) starts with a survived point; the top row (0.5 s) ends with a fall.
  EXPECT_NE(md.find("0.1 | #"), std::string::npos) << md;
  EXPECT_NE(md.find(" .\n"), std::string::npos) << md;
}

TEST(Envelope, AControllerThatCannotLoadIsReportedNotRun) {
  const Scenario s = ScenarioFromText(ShoveText());
  EnvelopeOptions options = PeakOptions();
  options.module_dirs = {ScratchDir("no-modules").string()};
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  const EnvelopeResult r = RunEnvelope(s, options, plan, "test", nullptr);
  EXPECT_TRUE(r.any_setup_failed());
  EXPECT_FALSE(r.controllers[0].setup_error.empty());
  EXPECT_EQ(r.controllers[0].bisect.probes, 0);
  EXPECT_EQ(r.runs, 0u);
  const auto dir = ScratchDir("envelope-setup");
  const Status written = WriteEnvelopeResults(dir.string(), r);
  ASSERT_TRUE(written) << written.error();
  EXPECT_NE(ReadFile(dir / "envelope.csv").find(",setup_failed,"), std::string::npos);
}

TEST(Envelope, AControllerThatRefusesItsSettingsStopsAfterItsFirstProbes) {
  const Scenario s = ScenarioFromText(ShoveText(R"(<controller name="lqr" builtin="lqr">
      <setting key="no_such_key" value="1"/></controller>
    <controller name="pid" builtin="pid"/>)"));
  const EnvelopeOptions options = PeakOptions();
  const Result<EnvelopePlan> planned = PlanEnvelope(s, options);
  ASSERT_TRUE(planned) << planned.error();
  const EnvelopePlan& plan = *planned;
  const EnvelopeResult r = RunEnvelope(s, options, plan, "test", nullptr);
  EXPECT_TRUE(r.any_setup_failed());
  EXPECT_NE(r.controllers[0].setup_error.find("no_such_key"), std::string::npos)
      << r.controllers[0].setup_error;
  EXPECT_EQ(r.controllers[0].bisect.probes, 2);  // both ends, run together, then no more
  // The other controller is not held back by it.
  EXPECT_TRUE(r.controllers[1].setup_error.empty());
  EXPECT_EQ(r.controllers[1].bisect.outcome, BisectOutcome::kBracketed);
}

TEST(ParameterUnit, ReadsTheUnitFromTheAttributeSuffix) {
  EXPECT_EQ(internal::ParameterUnit("timeline/push[1].peak_N"), "N");
  EXPECT_EQ(internal::ParameterUnit("timeline/drive[1].speed_m_s"), "m/s");
  EXPECT_EQ(internal::ParameterUnit("timeline/drive[2].yaw_rate_deg_s"), "deg/s");
  EXPECT_EQ(internal::ParameterUnit("ground.slope_deg"), "deg");
  EXPECT_EQ(internal::ParameterUnit("robot/chassis.mass_kg"), "kg");
  EXPECT_EQ(internal::ParameterUnit("robot/sensors/gyro.bias_y_rad_s"), "rad/s");
  EXPECT_EQ(internal::ParameterUnit("robot/sensors/accelerometer.bias_x_m_s2"), "m/s²");
  EXPECT_EQ(internal::ParameterUnit("robot/chassis/principal_moments.pitch_kgm2"), "kg·m²");
  EXPECT_EQ(internal::ParameterUnit("robot/motor.torque_constant_Nm_per_A"), "N·m/A");
  EXPECT_EQ(internal::ParameterUnit("ground/friction[1].friction"), "");
  EXPECT_EQ(internal::ParameterUnit("timeline/motor_fault[1].torque_scale"), "");
}

}  // namespace
}  // namespace upright::runner
