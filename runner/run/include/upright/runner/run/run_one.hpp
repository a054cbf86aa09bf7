// One run: a scenario, one of its controllers and a noise seed in; a fresh plant and controller
// instance stepped through the timeline, the metrics and (optionally) a trace out. A run ends at
// the scenario's duration or as soon as its outcome is decided (a fall, a controller fault, a
// numeric failure); such a run is a result with its status, never an exception.
#pragma once

#include <cstddef>
#include <cstdint>
#include <memory>
#include <string>

#include "upright/base/result.hpp"
#include "upright/host/module.hpp"
#include "upright/runner/metrics/module_log.hpp"
#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/run/modules.hpp"
#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

struct RunOptions {
  double trace_rate_hz = 100;  // trace rows per simulated second; 0 records no trace
  // Envelope probes: also end a run as survived once its outcome is decided that way — every
  // timed event has begun (and a push, shift or ramp has ended), the reference is at rest, and
  // for settle_hold_s the robot has stood still (|speed| < 0.05 m/s) upright (|tilt| within the
  // scenario's tilt band, |pitch rate| < 5 deg/s). The metrics then cover the run so far.
  bool stop_when_settled = false;
  double settle_hold_s = 1.0;
  // Also replay the run on the linear robot (runner/twin: linear_twin.hpp) for the scenario's
  // whole duration and compare: RunResult::gap, and twin columns in the trace.
  bool linear_twin = false;
  // The least severe module message a run keeps (RunResult::module_log): info, warnings and
  // errors by default; kDebug keeps the modules' debug messages too.
  LogLevel module_log_level = LogLevel::kInfo;
  // Fine when valid; otherwise the broken rule, naming the field and value.
  Status Validate() const;
};

// Runs controller `controller` (index into scenario.controllers) with noise seed `seed`, using the
// already loaded `module` (a module that did not load: the run is a kSetupFailed result carrying
// why).
RunResult RunOne(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                 const LoadedModule& module, const RunOptions& options);

// Whether a run of controller `controller` (index into scenario.controllers) with the already
// loaded `module` can start, or why not: the module's create refusing the robot, its settings or
// its rate, or the plant refusing the scenario — RunOne's own set-up and message (seed: the
// scenario's first), nothing stepped. `upright check` asks this of every controller.
// When `module_log` is given, it receives what create logged at `module_log_level` and above.
Status CheckRunStart(const Scenario& scenario, std::size_t controller,
                     const std::shared_ptr<host::Module>& module, ModuleLog* module_log = nullptr,
                     LogLevel module_log_level = LogLevel::kInfo);

// The row of a run that could not happen: controller `controller` of `scenario` with `seed`,
// status kSetupFailed and `message`, nothing else filled in.
RunResult SetupFailedRun(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                         const std::string& message);

// RunOne for a worker thread: never throws. An exception (out of memory and the like) becomes a
// SetupFailedRun with the message "the run stopped on an error: <what>".
RunResult RunOneSafely(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                       const LoadedModule& module, const RunOptions& options);

}  // namespace upright::runner
