// The linear twin: one run's closed loop replayed on the linear robot instead of the physics
// plant — a fresh instance of the same controller module through the same ABI, at the same rate
// with the same zero-order hold, the drive reference it is handed, the pushes as disturbance
// inputs (x component, own height, mean force per step), ideal sensors (twin_sensors.hpp), no
// contact, no limits. The scenario, the controller and the drive plan in; tilt and drift out.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/host/controller_host.hpp"
#include "upright/host/module.hpp"
#include "upright/runner/metrics/module_log.hpp"
#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/twin/tilt_drift_series.hpp"

namespace upright::runner {

// The drive as the run's timeline sets it, per physics step k: the reference handed to the module
// before the step, and the commanded path's point after it (world x, y).
struct DrivePlan {
  std::vector<host::Reference> reference;
  std::vector<double> path_x_m, path_y_m;
};

// The twin's run: samples at every physics step from t = 0 while it ran.
struct TwinRun {
  TiltDriftSeries series;
  std::vector<double> pitch_rad;  // absolute pitch (tilt + equilibrium pitch), for traces
  std::vector<double> x_m;        // axle midpoint, world x, for traces
  std::string message;            // empty when it ran the whole plan; otherwise why it stopped
};

// Runs the twin of `scenario.controllers[controller]` with the loaded `module` for
// plan.reference.size() physics steps of scenario.dt_s, from the scenario's initial tilt and
// speed. The robot is scenario.built_model() (the one the plant is built from) linearised for the
// module's drive mode: wheel torque in N·m, or motor voltage with back-EMF and viscous friction;
// the module is created for scenario.model, as in a physics run. A module fault, or a tilt beyond
// 90° (outside any linear model) or non-finite, stops the twin with TwinRun::message saying why.
// Fails when the module cannot be created or the plan's lists differ in length. The module's
// log messages (create's included, even when it refuses) go to `module_log` when given.
Result<TwinRun> RunLinearTwin(const Scenario& scenario, std::size_t controller,
                              const std::shared_ptr<host::Module>& module, const DrivePlan& plan,
                              ModuleLogRecorder* module_log = nullptr);

}  // namespace upright::runner
