// The settings a tune plays: a scenario cut to one controller with knob values in place, the
// text of a value, a controller as a scenario file's element, and where a tune file's line is.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "upright/runner/scenario/scenario.hpp"
#include "upright/runner/tune/knob.hpp"

namespace upright::runner::internal {

// "path:line: " for a tune file's line, "path: " for the file, "" without one.
std::string Where(const std::string& path, int line);

// The value text a setting gets: the shortest that reads back as the value.
std::string ValueText(double value);

// `entry` with each knob's setting set to its value (replaced in place, or appended).
ControllerEntry WithValues(ControllerEntry entry, const std::vector<Knob>& knobs,
                           const std::vector<double>& values);

// The scenario cut to controller `entry`, with `values` for its knobs (none: as written).
Scenario EvaluationScenario(const Scenario& scenario, std::size_t entry,
                            const std::vector<Knob>& knobs, const std::vector<double>& values);

// `entry` as a scenario file's <controller> element, its settings one per line.
std::string ControllerElement(const ControllerEntry& entry);

}  // namespace upright::runner::internal
