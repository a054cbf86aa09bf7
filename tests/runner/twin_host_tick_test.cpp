// The controller host's plant-free tick: the same module given the same samples, reference and
// step numbers through it commands exactly what it commands through the plant path.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "run_test_support.hpp"
#include "succeeded.hpp"
#include "upright/host/controller_host.hpp"
#include "upright/model/model_file.hpp"

namespace upright::host {
namespace {

// Drives a plant from 2° with one host through the plant path while a second instance of the same
// module, fed the plant's samples through the plant-free tick, must command the same bits.
void ExpectSameCommands(const std::string& module_name, bool true_state) {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  ASSERT_TRUE(Succeeded(loaded));
  ControllerSpec spec;
  spec.module = runner::testing::BuiltinModule(module_name);
  spec.true_state = true_state;
  sim::PlantOptions options;
  options.initial.pitch_rad = 2 * 3.141592653589793 / 180;
  auto driving_host = ControllerHost::Create(spec, *loaded, options.dt_s);
  auto shadow_host = ControllerHost::Create(spec, *loaded, options.dt_s);
  ASSERT_TRUE(Succeeded(driving_host));
  ASSERT_TRUE(Succeeded(shadow_host));
  const std::unique_ptr<ControllerHost> driving = std::move(*driving_host);
  const std::unique_ptr<ControllerHost> shadow = std::move(*shadow_host);
  options.drive = driving->drive();
  auto built = sim::Plant::Create(*loaded, options);
  ASSERT_TRUE(Succeeded(built));
  const std::unique_ptr<sim::Plant> plant = std::move(*built);
  Reference reference;
  int ticks = 0;
  double largest_command = 0;
  for (long step = 0; step < 1500; ++step) {
    reference.forward_speed_m_s = step < 700 ? 0.0 : 0.3;
    const sim::SensorSample sensed = plant->Sense();
    ASSERT_TRUE(driving->Tick(*plant, reference)) << driving->fault();
    ASSERT_TRUE(shadow->Tick(plant->step_count(), sensed, true_state ? &plant->truth() : nullptr,
                             reference))
        << shadow->fault();
    const auto a = driving->command(), b = shadow->command();
    ASSERT_EQ(a[0], b[0]) << "step " << step;
    ASSERT_EQ(a[1], b[1]) << "step " << step;
    for (std::size_t d = 0; d < driving->diagnostic_names().size(); ++d) {
      ASSERT_EQ(driving->diagnostics()[d], shadow->diagnostics()[d]) << "step " << step;
    }
    ticks += step % driving->period_steps() == 0;
    largest_command = std::max(largest_command, std::abs(a[0]));
    plant->Step();
  }
  EXPECT_EQ(ticks, 300);  // 1.5 s at the courier's 200 Hz
  // The commands were doing something: the robot caught its 2° start and stayed up.
  EXPECT_GT(largest_command, 0);
  EXPECT_LT(std::abs(plant->truth().pitch_rad), 0.1);
}

TEST(ControllerHostTick, CommandsWithoutAPlantMatchThePlantPath) {
  for (const char* name : {"lqr", "lqg", "pid"}) {
    SCOPED_TRACE(name);
    ExpectSameCommands(name, false);
  }
}

TEST(ControllerHostTick, HandsOverTheTrueStateLikeThePlantPath) { ExpectSameCommands("lqr", true); }

}  // namespace
}  // namespace upright::host
