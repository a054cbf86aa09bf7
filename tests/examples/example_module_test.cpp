// The example module (examples/gain_scheduled_pd), built out of tree against the installed
// package by the fixture test, loaded like any user module: it must balance both demo robots
// from a 3° tilt with sensor noise on, and refuse a bad configuration by name.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "succeeded.hpp"
#include "upright/host/controller_host.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::host {
namespace {

std::shared_ptr<Module> Example() {
  auto module = Module::Load(UPRIGHT_EXAMPLE_MODULE);
  EXPECT_TRUE(Succeeded(module));
  return module.value_or(nullptr);
}

model::RobotModel Demo(const std::string& name) {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/" + name);
  EXPECT_TRUE(Succeeded(loaded));
  return loaded.value_or(model::RobotModel{});
}

TEST(ExampleModule, LoadsAndNamesItself) {
  const auto module = Example();
  ASSERT_NE(module, nullptr);
  EXPECT_EQ(module->name(), "gain-scheduled-pd");
}

TEST(ExampleModule, BalancesBothDemoRobotsFromThreeDegreesWithNoisySensors) {
  const double deg = std::numbers::pi / 180;
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const model::RobotModel model = Demo(name);
    ControllerSpec spec;
    spec.module = Example();
    ASSERT_NE(spec.module, nullptr);
    sim::PlantOptions options;
    options.initial.pitch_rad = 3 * deg;
    options.sensor_noise = true;
    auto created = ControllerHost::Create(spec, model, options.dt_s);
    ASSERT_TRUE(Succeeded(created));
    const std::unique_ptr<ControllerHost> host = std::move(*created);
    options.drive = host->drive();
    auto built = sim::Plant::Create(model, options);
    ASSERT_TRUE(Succeeded(built));
    const std::unique_ptr<sim::Plant> plant = std::move(*built);
    double max_tilt = 0;
    for (long step = 0; step < 10000; ++step) {
      ASSERT_TRUE(host->Tick(*plant, Reference{})) << name << ": " << host->fault();
      plant->Step();
      max_tilt = std::max(max_tilt, std::abs(plant->truth().pitch_rad));
      ASSERT_FALSE(plant->contact().chassis_on_ground) << name << " fell at " << plant->time_s();
    }
    // Recovered: upright within 1° and near where it started (the tilt it began with costs a
    // few centimetres of travel; 0.5 m is generous).
    EXPECT_LT(std::abs(plant->truth().pitch_rad), 1 * deg) << name;
    EXPECT_LT(std::abs(plant->truth().x_m), 0.5) << name;
    EXPECT_LE(max_tilt, 3.5 * deg) << name;
  }
}

TEST(ExampleModule, RefusesAnUnknownKeyAndABadValueByName) {
  const model::RobotModel model = Demo("courier.xml");
  ControllerSpec spec;
  spec.module = Example();
  ASSERT_NE(spec.module, nullptr);
  spec.config = {{"gain", "2"}};
  const auto unknown = ControllerHost::Create(spec, model, 0.001);
  ASSERT_FALSE(unknown.has_value());
  EXPECT_NE(unknown.error().find("unknown key 'gain'"), std::string::npos) << unknown.error();
  spec.config = {{"filter_s", "-1"}};
  const auto bad = ControllerHost::Create(spec, model, 0.001);
  ASSERT_FALSE(bad.has_value());
  EXPECT_NE(bad.error().find("filter_s = -1: must be a number in (0, 10]"), std::string::npos)
      << bad.error();
}

}  // namespace
}  // namespace upright::host
