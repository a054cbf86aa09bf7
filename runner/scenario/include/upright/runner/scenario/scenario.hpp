// Scenario: one scripted field situation — the robot, the ground, how it starts, a timeline of
// events, the controllers to compare (one the baseline), the noise seeds and how runs are judged.
// Loaded from scenarios/*.xml (scenario_file.hpp); immutable and shared by every run.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "upright/model/model_file.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/runner/metrics/metric_settings.hpp"
#include "upright/runner/scenario/dispersion.hpp"
#include "upright/sim/faults.hpp"
#include "upright/sim/plant.hpp"
#include "upright/sim/push.hpp"
#include "upright/sim/terrain.hpp"

namespace upright::runner {

// From start_s, the payload carriage target moves by distance_m along the deck (+ forward) at a
// constant rate over duration_s (0: at once). Shifts add up from the payload's home x_m; a loaded
// scenario keeps the target within the carriage travel at every instant.
struct PayloadShift {
  double start_s = 0;
  double duration_s = 0;
  double distance_m = 0;
};

// From start_s, the reference handed to the controller moves linearly to these values over
// ramp_s (0: at once) and holds them until the next drive change.
struct DriveChange {
  double start_s = 0;
  double ramp_s = 0;
  double speed_m_s = 0;       // forward speed
  double yaw_rate_rad_s = 0;  // + turns left
};

// One controller to run: a built-in module by name or a module file by path, with its settings.
struct ControllerEntry {
  std::string name;     // label in every table; unique within the scenario; [A-Za-z0-9._-]+
  std::string module;   // built-in name ("lqr", "hinf", "lqg", "pid") or a path to a .so
  bool builtin = true;  // module names a built-in; false: module is a file path, already resolved
                        // against the scenario's folder (absolute, or from the working folder)
  // Handed to the module as given, in file order; keys are unique.
  std::vector<std::pair<std::string, std::string>> config;
  double rate_hz = 0;       // 0: the robot's control rate
  bool true_state = false;  // the module also reads the true state
  int line = 0;             // the <controller> element's line in the scenario file, for messages
};

// The most physics steps a run may take (duration_s / dt_s): 2.8 h at 1 kHz. A run keeps 16 bytes
// of metrics a step (160 MB at the limit) and its trace rows (about 290 bytes each; 290 MB for
// 10⁴ s at 100 Hz), and costs about 7 µs a step (70 s at the limit).
inline constexpr double kMaxRunSteps = 1e7;

struct Scenario {
  std::string name;         // from the file; names the results folder and table rows;
                            // [A-Za-z0-9._-]+
  std::string description;  // one or two sentences, from the file
  std::string path;         // the scenario file, as given
  std::string model_path;   // the robot model file, resolved against the scenario's folder
  model::RobotModel model;  // the robot the controllers are designed for
  // The robot as built, when it differs from `model` (a sweep's sampled robot, an envelope over a
  // robot parameter); the plant is built from it.
  std::optional<model::RobotModel> plant_model;

  double duration_s = 10;  // a whole number of physics steps, at most kMaxRunSteps
  double dt_s = model::kDefaultPhysicsStep_s;  // physics step
  int solver_iterations = 10;
  sim::Terrain terrain;
  sim::InitialState initial;  // the file gives pitch in degrees; here in radians
  bool sensor_noise = true;

  // The timeline; each list in start-time order (events at the same time in file order), every
  // start in [0, duration_s). A push without a height in the file acts at the chassis COM height.
  std::vector<sim::Push> pushes;
  std::vector<PayloadShift> payload_shifts;
  std::vector<DriveChange> drives;  // the file gives the yaw rate in degrees per second
  std::vector<sim::MotorFault> motor_faults;
  std::vector<sim::SensorFault> sensor_faults;  // without a duration in the file: to the end

  std::vector<ControllerEntry> controllers;  // at least one
  std::size_t baseline = 0;                  // index into controllers
  std::vector<std::uint64_t> seeds{1};       // sensor-noise seeds, unique, >= 1, in file order;
                                             // one run per seed and controller

  MetricSettings metrics;

  // Monte Carlo spreads (<dispersions>), in file order: read by `upright sweep`, ignored by runs.
  // Each names a parameter that exists in this scenario, at most once.
  std::vector<Dispersion> dispersions;

  // The robot the plant is built from.
  const model::RobotModel& built_model() const { return plant_model ? *plant_model : model; }
};

}  // namespace upright::runner
