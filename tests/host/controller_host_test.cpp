// The controller host: modules run at their rate with the command held between ticks; outputs
// left unwritten or non-finite, error statuses and exceptions become recorded faults, and other
// runs go on.
#include "upright/host/controller_host.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

#include "succeeded.hpp"
#include "upright/model/model_file.hpp"

namespace upright::host {
namespace {

model::RobotModel Courier() {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  EXPECT_TRUE(Succeeded(loaded));
  return loaded.value_or(model::RobotModel{});
}

std::shared_ptr<Module> Load(const std::string& name) {
  auto module = Module::Load(std::string(UPRIGHT_TEST_MODULE_DIR) + "/" + name + ".so");
  EXPECT_TRUE(Succeeded(module));
  return module.value_or(nullptr);
}

struct HostRun {
  std::unique_ptr<ControllerHost> host;
  std::unique_ptr<sim::Plant> plant;
  long steps_done = 0;
  bool faulted = false;
};

// Creates host and plant for `module` and runs up to `steps` physics steps, stopping at a fault.
HostRun RunModule(const std::string& module, long steps, ControllerSpec spec = {}) {
  HostRun run;
  const model::RobotModel model = Courier();
  spec.module = Load(module);
  sim::PlantOptions options;
  auto host = ControllerHost::Create(spec, model, options.dt_s);
  EXPECT_TRUE(Succeeded(host));
  if (!host) return run;
  run.host = std::move(*host);
  options.drive = run.host->drive();
  auto plant = sim::Plant::Create(model, options);
  EXPECT_TRUE(Succeeded(plant));
  if (!plant) return run;
  run.plant = std::move(*plant);
  for (; run.steps_done < steps; ++run.steps_done) {
    if (!run.host->Tick(*run.plant, Reference{})) {
      run.faulted = true;
      break;
    }
    run.plant->Step();
  }
  return run;
}

TEST(ControllerHost, StepsAtTheControllerRateAndHoldsTheCommand) {
  // The courier's control rate is 200 Hz with 1 ms physics steps: a tick every 5 steps.
  const HostRun run = RunModule("faulty_0", 50);
  ASSERT_FALSE(run.faulted) << run.host->fault();
  EXPECT_EQ(run.host->period_steps(), 5);
  EXPECT_EQ(run.host->drive(), sim::DriveMode::kTorque);
  ASSERT_EQ(run.host->diagnostic_names().size(), 1u);
  EXPECT_EQ(run.host->diagnostic_names()[0], "ticks");
  EXPECT_EQ(run.host->diagnostics()[0], 10.0);  // steps 0, 5, ..., 45
}

// A message as the host hands it on.
struct Logged {
  int level = -1;
  double time_s = 0;
  std::string text;
};

// A log callback that appends to `logged`.
std::function<void(int, double, std::string_view)> Into(std::vector<Logged>* logged) {
  return [logged](int level, double time_s, std::string_view text) {
    logged->push_back({level, time_s, std::string(text)});
  };
}

TEST(ControllerHost, PassesTheModulesLogMessagesToTheCallerWithTheirLevel) {
  ControllerSpec spec;
  std::vector<Logged> logged;
  spec.log = Into(&logged);
  RunModule("faulty_0", 1, spec);
  ASSERT_EQ(logged.size(), 1u);
  EXPECT_EQ(logged[0].level, UPRIGHT_LOG_INFO);
  EXPECT_EQ(logged[0].text, "created");
  EXPECT_TRUE(std::isnan(logged[0].time_s));  // logged by create, before the first tick
}

TEST(ControllerHost, HandsEachTicksMessagesOnWithTheTicksTime) {
  // The courier's 200 Hz control rate on 1 ms steps: ticks at steps 0, 5 and 10 in 12 steps.
  ControllerSpec spec;
  spec.config = {{"per_step", "1"}};
  std::vector<Logged> logged;
  spec.log = Into(&logged);
  const HostRun run = RunModule("logging", 12, spec);
  ASSERT_FALSE(run.faulted) << run.host->fault();
  // Four from create (one per level), then "first tick" and one per tick.
  ASSERT_EQ(logged.size(), 4u + 1u + 3u);
  for (int level = UPRIGHT_LOG_DEBUG; level <= UPRIGHT_LOG_ERROR; ++level) {
    EXPECT_EQ(logged[level].level, level);
    EXPECT_TRUE(std::isnan(logged[level].time_s)) << logged[level].text;
  }
  EXPECT_EQ(logged[0].text, "create: debug");
  EXPECT_EQ(logged[3].text, "create: error");
  EXPECT_EQ(logged[4].text, "first tick");
  EXPECT_EQ(logged[4].level, UPRIGHT_LOG_WARNING);
  EXPECT_EQ(logged[4].time_s, 0.0);
  EXPECT_EQ(logged[5].text, "tick 1 message 1");
  EXPECT_EQ(logged[6].text, "tick 2 message 1");
  EXPECT_NEAR(logged[6].time_s, 0.005, 1e-12);
  EXPECT_EQ(logged[7].text, "tick 3 message 1");
  EXPECT_NEAR(logged[7].time_s, 0.010, 1e-12);
}

TEST(ControllerHost, AModuleThatRefusesCreateStillHasItsMessagesHandedOn) {
  ControllerSpec spec;
  spec.module = Load("logging");
  spec.config = {{"refuse", "true"}};
  std::vector<Logged> logged;
  spec.log = Into(&logged);
  const std::string error = FailureOf(ControllerHost::Create(spec, Courier(), 0.001));
  EXPECT_NE(error.find("refused as asked"), std::string::npos) << error;
  ASSERT_EQ(logged.size(), 4u);
  EXPECT_EQ(logged[3].text, "create: error");
}

TEST(ControllerHost, AnOptionalRateOverridesTheRobots) {
  ControllerSpec spec;
  spec.rate_hz = 100;
  const HostRun run = RunModule("faulty_0", 50, spec);
  EXPECT_EQ(run.host->period_steps(), 10);
  EXPECT_EQ(run.host->diagnostics()[0], 5.0);
}

TEST(ControllerHost, RejectsARateThatIsNoWholeNumberOfSteps) {
  ControllerSpec spec;
  spec.module = Load("faulty_0");
  spec.rate_hz = 300;
  const auto host = ControllerHost::Create(spec, Courier(), 0.001);
  ASSERT_FALSE(host.has_value());
  EXPECT_NE(host.error().find("rate_hz = 300 must give a period of a whole number"),
            std::string::npos)
      << host.error();
}

TEST(ControllerHost, AModuleThatRefusesItsConfigurationIsReportedAtCreate) {
  ControllerSpec spec;
  spec.module = Load("faulty_5");
  const auto host = ControllerHost::Create(spec, Courier(), 0.001);
  ASSERT_FALSE(host.has_value());
  EXPECT_NE(host.error().find("create failed (status 2): gain = banana: must be a number"),
            std::string::npos)
      << host.error();
}

TEST(ControllerHost, AnUnwrittenOutputIsAFault) {
  const HostRun run = RunModule("faulty_1", 100);
  EXPECT_TRUE(run.faulted);
  EXPECT_EQ(run.steps_done, 0);
  EXPECT_EQ(run.host->fault(),
            "controller 'faulty' returned a non-finite right command (NaN: left unwritten?)");
}

TEST(ControllerHost, AnInfiniteCommandIsAFault) {
  const HostRun run = RunModule("faulty_6", 100);
  EXPECT_TRUE(run.faulted);
  EXPECT_EQ(run.host->fault(), "controller 'faulty' returned a non-finite left command (infinite)");
}

TEST(ControllerHost, AnErrorStatusIsAFaultWithTheModulesMessageAndTime) {
  const HostRun run = RunModule("faulty_2", 100);
  EXPECT_TRUE(run.faulted);
  EXPECT_EQ(run.steps_done, 10);  // third tick: steps 0, 5, 10
  EXPECT_DOUBLE_EQ(run.host->fault_time_s(), 0.010);
  EXPECT_EQ(run.host->fault(),
            "controller 'faulty' step failed (status 1): estimator diverged at tick 3");
}

TEST(ControllerHost, AnExceptionThrownThroughTheAbiIsAFaultAndLaterRunsGoOn) {
  const HostRun bad = RunModule("throwing", 100);
  EXPECT_TRUE(bad.faulted);
  EXPECT_EQ(bad.host->fault(), "controller 'throwing' threw an exception: matrix not invertible");
  // The plant's motors are switched off at the fault.
  EXPECT_EQ(bad.plant->motors()[0].wheel_torque_Nm, 0.0);
  const HostRun good = RunModule("faulty_0", 100);
  EXPECT_FALSE(good.faulted);
  EXPECT_EQ(good.steps_done, 100);
}

TEST(ControllerHost, ResetClearsAFaultAndRestartsTheModule) {
  HostRun run = RunModule("faulty_2", 100);
  ASSERT_TRUE(run.faulted);
  ASSERT_TRUE(Succeeded(run.host->Reset()));
  EXPECT_FALSE(run.host->faulted());
  EXPECT_TRUE(run.host->Tick(*run.plant, Reference{}) || run.plant->step_count() % 5 != 0);
}

}  // namespace
}  // namespace upright::host
