// Test helpers for the built-in modules: a demo robot and a built-in module in, run through the
// controller host against the plant; the run's figures (fall, tilt, drift, speed, heading) out.
#pragma once

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <memory>
#include <numbers>
#include <string>
#include <utility>
#include <vector>

#include "succeeded.hpp"
#include "upright/host/controller_host.hpp"
#include "upright/host/module.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/sim/plant.hpp"

namespace upright::host::testing {

inline constexpr double kDeg = std::numbers::pi / 180;

// models/<name>.xml, or a test failure.
inline model::RobotModel DemoRobot(const std::string& name) {
  const auto loaded =
      model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/" + name + ".xml");
  EXPECT_TRUE(Succeeded(loaded)) << name;
  return loaded.value_or(model::RobotModel{});
}

// The built-in module `name` as the host finds it, or null with a test failure.
inline std::shared_ptr<Module> Builtin(const std::string& name) {
  const Result<std::string> path = FindBuiltinModule(name, DefaultModuleDirs());
  EXPECT_TRUE(Succeeded(path));
  if (!path) return nullptr;
  auto module = Module::Load(*path);
  EXPECT_TRUE(Succeeded(module));
  return module.value_or(nullptr);
}

using Config = std::vector<std::pair<std::string, std::string>>;

// ControllerHost::Create for a built-in at the robot's control rate; a failure when the module
// refuses.
inline Result<std::unique_ptr<ControllerHost>> CreateBuiltin(const std::string& name,
                                                             const model::RobotModel& model,
                                                             const Config& config,
                                                             bool true_state) {
  ControllerSpec spec;
  spec.module = Builtin(name);
  spec.config = config;
  spec.true_state = true_state;
  return ControllerHost::Create(spec, model, sim::PlantOptions{}.dt_s);
}

struct RunSettings {
  double duration_s = 10;
  double initial_pitch_rad = 3 * kDeg;
  Reference reference;
  Config config;
  bool true_state = false;
};

struct RunFigures {
  bool ran = false;                // host and plant were built and the run reached its end
  std::string error;               // why not
  bool fell = false;               // the chassis touched the ground at some step
  double max_tilt_rad = 0;         // largest |pitch|
  double final_pitch_rad = 0;      // at the end
  double rms_pitch_late_rad = 0;   // over the second half of the run
  double rms_pitch_final_rad = 0;  // over the last second
  double final_x_m = 0;            // axle midpoint, world x, at the end
  double max_abs_x_m = 0;          // largest |x|
  double final_yaw_rad = 0;
  double mean_final_speed_m_s = 0;  // forward speed over the last 0.5 s
  // √(mean square) of the left command's change from one control tick to the next over the
  // second half of the run, in the command's unit: a loop chattering at the Nyquist rate shows
  // it at twice the chatter's amplitude.
  double rms_command_step = 0;
};

// Host first, plant after with the host's drive mode; each physics step: Tick, then Step. Sensor
// noise on (the plant's default seed).
inline RunFigures RunBuiltin(const std::string& name, const std::string& robot,
                             const RunSettings& settings) {
  RunFigures f;
  const model::RobotModel model = DemoRobot(robot);
  auto created = CreateBuiltin(name, model, settings.config, settings.true_state);
  if (!created) {
    f.error = created.error();
    return f;
  }
  const std::unique_ptr<ControllerHost> host = std::move(*created);
  sim::PlantOptions options;
  options.initial.pitch_rad = settings.initial_pitch_rad;
  options.sensor_noise = true;
  options.drive = host->drive();
  auto built = sim::Plant::Create(model, options);
  if (!built) {
    f.error = built.error();
    return f;
  }
  const std::unique_ptr<sim::Plant> plant = std::move(*built);
  const long steps = std::lround(settings.duration_s / options.dt_s);
  const long late_from = steps / 2;
  const long final_from = steps - std::lround(1.0 / options.dt_s);
  const long speed_from = steps - std::lround(0.5 / options.dt_s);
  double late_sum = 0, final_sum = 0, speed_sum = 0, step_sum = 0, last_command = 0;
  long step_count = 0;
  for (long k = 0; k < steps; ++k) {
    if (!host->Tick(*plant, settings.reference)) {
      f.error = host->fault();
      return f;
    }
    if (k % host->period_steps() == 0) {
      const double command = host->command()[0];
      if (k >= late_from && k > 0) {
        step_sum += (command - last_command) * (command - last_command);
        ++step_count;
      }
      last_command = command;
    }
    plant->Step();
    const sim::TrueState& s = plant->truth();
    const double pitch_squared = s.pitch_rad * s.pitch_rad;
    f.max_tilt_rad = std::max(f.max_tilt_rad, std::abs(s.pitch_rad));
    f.max_abs_x_m = std::max(f.max_abs_x_m, std::abs(s.x_m));
    f.fell = f.fell || plant->contact().chassis_on_ground;
    if (k >= late_from) late_sum += pitch_squared;
    if (k >= final_from) final_sum += pitch_squared;
    if (k >= speed_from) speed_sum += s.forward_speed_m_s;
  }
  const sim::TrueState& s = plant->truth();
  f.final_pitch_rad = s.pitch_rad;
  f.final_x_m = s.x_m;
  f.final_yaw_rad = s.yaw_rad;
  f.rms_pitch_late_rad = std::sqrt(late_sum / static_cast<double>(steps - late_from));
  f.rms_pitch_final_rad = std::sqrt(final_sum / static_cast<double>(steps - final_from));
  f.mean_final_speed_m_s = speed_sum / static_cast<double>(steps - speed_from);
  f.rms_command_step = std::sqrt(step_sum / static_cast<double>(std::max(1L, step_count)));
  f.ran = !plant->diverged();
  if (!f.ran) f.error = "the plant diverged";
  return f;
}

// One line of a run's figures in the test log, for the record.
inline void PrintFigures(const std::string& what, const RunFigures& f) {
  std::printf(
      "[ figures  ] %-26s max tilt %.3f deg, final pitch %+.3f deg, RMS pitch last 5 s %.3f deg, "
      "last 1 s %.3f deg, final x %+.3f m, max |x| %.3f m, final yaw %+.2f deg, final speed "
      "%+.3f m/s, RMS command step %.3g\n",
      what.c_str(), f.max_tilt_rad / kDeg, f.final_pitch_rad / kDeg, f.rms_pitch_late_rad / kDeg,
      f.rms_pitch_final_rad / kDeg, f.final_x_m, f.max_abs_x_m, f.final_yaw_rad / kDeg,
      f.mean_final_speed_m_s, f.rms_command_step);
}

}  // namespace upright::host::testing
