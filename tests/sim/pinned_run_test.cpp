// A pinned plant run: the test robot driven open loop through a push, a turn and a fall, its
// physics and its sensor samples hashed bit for bit and compared with values pinned here, so that
// any change in the numbers the plant produces is noticed, intended or not.
//
// When this test fails after a change that is meant to alter the physics (the engine, its
// settings, the robot body, contacts, motors) or the sensors: run upright_physics_test and
// upright_sim_unit_test, check that every physics and sensor check still passes with its stated
// tolerance, then replace the pinned value with the one the failure prints and say why in the
// commit message. When the change was not meant to alter results, the failure is the bug.
//
// The pin holds for a build on x86-64 (SSE2 double arithmetic, no fused multiply-add, no
// -ffast-math) with Debian 12's Bullet; elsewhere the test skips and says why.
#include <gtest/gtest.h>

#include <cstdint>
#include <ios>
#include <string>

#include "succeeded.hpp"
#include "test_robot.hpp"
#include "upright/sim/plant.hpp"
#include "upright/sim/push.hpp"

namespace upright::sim {
namespace {

struct Pinned {
  std::uint64_t physics = 0;
  std::uint64_t sensors = 0;
  bool fell = false;
};

// 1.5 s at 1 kHz: voltage drive with fixed, unequal wheel commands (the robot drives, turns and
// falls), noisy sensors from seed 3, a sideways half-sine push at 0.2 s.
Pinned RunPinnedScenario() {
  model::RobotModel model = testing::MakeTestRobot();
  model.sensors.gyro_noise_rad_s_rthz = 0.01;
  model.sensors.accel_noise_m_s2_rthz = 0.02;
  PlantOptions options;
  options.seed = 3;
  options.initial.pitch_rad = 0.02;
  auto plant = testing::MakePlant(model, options);
  Pinned out;
  if (!plant) return out;
  Push push;
  push.shape = PushShape::kHalfSine;
  push.start_s = 0.2;
  push.duration_s = 0.05;
  push.peak_N = 40;
  push.direction_deg = 60;
  EXPECT_TRUE(Succeeded(plant->AddPush(push)));
  plant->SetCommand(3.0, 1.5);
  testing::TraceHash physics, sensors;
  for (int k = 0; k < 1500; ++k) {
    plant->Step();
    testing::AddPhysics(*plant, &physics);
    testing::AddSensors(*plant, &sensors);
    out.fell = out.fell || plant->contact().chassis_on_ground;
  }
  EXPECT_FALSE(plant->diverged());
  out.physics = physics.value();
  out.sensors = sensors.value();
  return out;
}

TEST(PinnedRun, PlantReproducesThePinnedHashes) {
#if !defined(__x86_64__)
  GTEST_SKIP() << "the pinned hashes were recorded on x86-64; other targets may round differently";
#endif
  const Pinned run = RunPinnedScenario();
  EXPECT_TRUE(run.fell) << "the scenario must reach the chassis-ground contact";
  EXPECT_EQ(run.physics, 0xd09b6fac413c8769ULL)
      << "physics hash 0x" << std::hex << run.physics << ": the plant's results changed";
  EXPECT_EQ(run.sensors, 0x1cee8a4eb1562e7fULL)
      << "sensor hash 0x" << std::hex << run.sensors << ": the sensor samples changed";
}

}  // namespace
}  // namespace upright::sim
