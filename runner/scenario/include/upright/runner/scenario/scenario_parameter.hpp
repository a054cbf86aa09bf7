// Scenario parameters by name, for envelopes (bisection over one value) and sweeps (sampled
// values): a path that reads like the scenario file — elements joined by '/', a 1-based index in
// brackets for an element that repeats, '.' before the attribute — in the file's units:
//   timeline/push[1].peak_N    ground.slope_deg    ground/friction[2].friction
//   start.pitch_deg            robot/chassis.mass_kg    robot/sensors/gyro.bias_y_rad_s
// Timeline elements are numbered per kind in start-time order. `robot/...` names a robot model
// field (models/README.md) and changes the robot as built (Scenario::plant_model); controllers are
// still designed for the robot the file names.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

// The paths accepted, with their meaning, for help text and documentation (robot fields are
// summarised by one line).
const std::vector<std::string>& ScenarioParameterHelp();

// The parameter's current value in `scenario` (from the plant model for robot fields), or why the
// path names nothing in this scenario ("timeline/push[3].peak_N: the scenario has 1 push").
Result<double> GetScenarioParameter(const Scenario& scenario, const std::string& path);

// Sets the parameter, then checks what it touched (the element's own rules, event times within the
// duration, the robot model's rules, the payload travel). On any problem, the message and
// `scenario` unchanged.
Status SetScenarioParameter(Scenario* scenario, const std::string& path, double value);

}  // namespace upright::runner
