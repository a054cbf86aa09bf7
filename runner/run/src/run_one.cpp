#include "upright/runner/run/run_one.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <exception>
#include <functional>
#include <limits>
#include <numbers>
#include <sstream>
#include <string_view>

#include "timeline.hpp"
#include "upright/base/number_text.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/weights.hpp"
#include "upright/host/controller_host.hpp"
#include "upright/model/conventions.hpp"
#include "upright/runner/metrics/metric_recorder.hpp"
#include "upright/runner/twin/linear_twin.hpp"
#include "upright/runner/twin/twin_gap.hpp"
#include "upright/sim/plant.hpp"

namespace upright::runner {
namespace {

constexpr double kDeg = 180 / std::numbers::pi;

// The readings the metrics take after a step, the module's command held over it and that
// command's limit (command_limit, V or N·m as the module commands); no allocation.
StepSample Sample(const sim::Plant& plant, const host::ControllerHost& host, double command_limit,
                  double tilt_rad, double drift_m) {
  const sim::TrueState& s = plant.truth();
  const sim::MotorState& m = plant.motors();
  const sim::ContactState& c = plant.contact();
  StepSample out;
  out.time_s = s.time_s;
  out.tilt_rad = tilt_rad;
  out.drift_m = drift_m;
  for (int i = 0; i < 2; ++i) {
    out.torque_Nm[i] = m[i].wheel_torque_Nm;
    out.current_A[i] = m[i].current_A;
    out.power_W[i] = m[i].power_W();
    out.saturated = out.saturated || m[i].voltage_saturated || m[i].current_saturated;
    out.slip_ratio[i] = c.wheels[i].slip_ratio;
    out.touching[i] = c.wheels[i].touching;
  }
  const auto command = host.command();
  out.command_at_limit = sim::AtOrBeyondLimit(command[0], command_limit) ||
                         sim::AtOrBeyondLimit(command[1], command_limit);
  return out;
}

TraceRow Row(const sim::Plant& plant, const host::ControllerHost& host,
             const internal::Timeline& timeline, double drift_m) {
  const sim::TrueState& s = plant.truth();
  const sim::MotorState& m = plant.motors();
  const sim::ContactState& c = plant.contact();
  const sim::SensorSample sensed = plant.Sense();
  const auto command = host.command();
  TraceRow r;
  r.time_s = s.time_s;
  r.x_m = s.x_m;
  r.y_m = s.y_m;
  r.pitch_deg = s.pitch_rad * kDeg;
  r.pitch_rate_deg_s = s.pitch_rate_rad_s * kDeg;
  r.yaw_deg = s.yaw_rad * kDeg;
  r.speed_m_s = s.forward_speed_m_s;
  r.ref_speed_m_s = timeline.reference().forward_speed_m_s;
  r.ref_yaw_rate_deg_s = timeline.reference().yaw_rate_rad_s * kDeg;
  r.drift_m = drift_m;
  r.gyro_y_rad_s = sensed.gyro_rad_s[1];
  r.accel_x_m_s2 = sensed.accel_m_s2[0];
  r.encoder_left_rad = sensed.encoder_angle_rad[model::kLeft];
  r.encoder_right_rad = sensed.encoder_angle_rad[model::kRight];
  r.command_left = std::isfinite(command[model::kLeft]) ? command[model::kLeft] : 0;
  r.command_right = std::isfinite(command[model::kRight]) ? command[model::kRight] : 0;
  r.voltage_left_V = m[model::kLeft].voltage_V;
  r.voltage_right_V = m[model::kRight].voltage_V;
  r.current_left_A = m[model::kLeft].current_A;
  r.current_right_A = m[model::kRight].current_A;
  r.torque_left_Nm = m[model::kLeft].wheel_torque_Nm;
  r.torque_right_Nm = m[model::kRight].wheel_torque_Nm;
  r.load_left_N = c.wheels[model::kLeft].normal_N;
  r.load_right_N = c.wheels[model::kRight].normal_N;
  r.slip_left = c.wheels[model::kLeft].slip_ratio;
  r.slip_right = c.wheels[model::kRight].slip_ratio;
  r.payload_x_m = s.payload_x_m;
  return r;
}

// The linear twin of this run (RunOptions::linear_twin): the same drive from a timeline of its
// own, the twin over the scenario's whole duration, its gap to `plant` and its trace columns.
void AddLinearTwin(const Scenario& scenario, std::size_t controller,
                   const std::shared_ptr<host::Module>& module, const TiltDriftSeries& plant,
                   long total_steps, LogLevel module_log_level, RunResult* result) {
  DrivePlan plan;
  plan.reference.reserve(static_cast<std::size_t>(total_steps));
  plan.path_x_m.reserve(static_cast<std::size_t>(total_steps));
  plan.path_y_m.reserve(static_cast<std::size_t>(total_steps));
  internal::Timeline timeline(scenario);
  for (long step = 0; step < total_steps; ++step) {
    timeline.Advance(step);
    plan.reference.push_back(timeline.reference());
    timeline.Integrate(scenario.dt_s);
    plan.path_x_m.push_back(timeline.path_x_m());
    plan.path_y_m.push_back(timeline.path_y_m());
  }
  ModuleLogRecorder twin_log(module_log_level);
  const Result<TwinRun> ran = RunLinearTwin(scenario, controller, module, plan, &twin_log);
  result->twin_module_log = twin_log.Log();
  if (!ran) {
    result->gap.twin_message = "not run: " + ran.error();
    return;
  }
  const TwinRun& twin = *ran;
  result->gap = CompareTwin(twin.series, plant);
  result->gap.not_modelled = NotModelled(scenario);
  result->gap.twin_message = twin.message;
  if (!(result->trace.rate_hz > 0)) return;
  result->trace.has_twin = true;
  for (TraceRow& row : result->trace.rows) {
    const auto k = static_cast<std::size_t>(std::lround(row.time_s / scenario.dt_s));
    if (k >= twin.pitch_rad.size()) continue;
    row.twin_pitch_deg = twin.pitch_rad[k] * kDeg;
    row.twin_x_m = twin.x_m[k];
  }
}

// What a run starts from: the controller instance and the plant with every timeline event.
struct RunStart {
  std::unique_ptr<host::ControllerHost> host;
  std::unique_ptr<sim::Plant> plant;
};

// The module's log messages into `recorder`, which must outlive the host.
std::function<void(int, double, std::string_view)> LogInto(ModuleLogRecorder* recorder) {
  return [recorder](int level, double time_s, std::string_view text) {
    recorder->Add(level, time_s, text);
  };
}

// Sets up the run of `controller` with `seed`, the module's messages (create's included) into
// `log`, or says why it cannot start (the run's setup_failed message): the module refuses its
// settings or the plant refuses the scenario.
Result<RunStart> StartRun(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                          const std::shared_ptr<host::Module>& module, ModuleLogRecorder* log) {
  const ControllerEntry& entry = scenario.controllers.at(controller);
  RunStart start;
  // The controller first: the plant's drive mode is the module's.
  host::ControllerSpec spec;
  spec.module = module;
  spec.config = entry.config;
  spec.rate_hz = entry.rate_hz;
  spec.true_state = entry.true_state;
  spec.log = LogInto(log);
  Result<std::unique_ptr<host::ControllerHost>> created =
      host::ControllerHost::Create(spec, scenario.model, scenario.dt_s);
  if (!created) return Failure(created.error());
  start.host = std::move(*created);

  sim::PlantOptions plant_options;
  plant_options.dt_s = scenario.dt_s;
  plant_options.solver_iterations = scenario.solver_iterations;
  plant_options.terrain = scenario.terrain;
  plant_options.initial = scenario.initial;
  plant_options.drive = start.host->drive();
  plant_options.seed = seed;
  plant_options.sensor_noise = scenario.sensor_noise;
  Result<std::unique_ptr<sim::Plant>> plant =
      sim::Plant::Create(scenario.built_model(), plant_options);
  if (!plant) return Failure(plant.error());
  start.plant = std::move(*plant);
  for (const auto& p : scenario.pushes) {
    if (Status added = start.plant->AddPush(p); !added) return Failure(added.error());
  }
  for (const auto& f : scenario.motor_faults) {
    if (Status added = start.plant->AddMotorFault(f); !added) return Failure(added.error());
  }
  for (const auto& f : scenario.sensor_faults) {
    if (Status added = start.plant->AddSensorFault(f); !added) return Failure(added.error());
  }
  return start;
}

// A run in progress: the plant and host it steps, the timeline that drives them, the recorder of
// its figures, and what it is judged by — all set up before the first step.
struct RunLoop {
  RunLoop(const Scenario& run_scenario, const RunOptions& run_options, sim::Plant& run_plant,
          host::ControllerHost& run_host);

  // The commanded path's distance from the axle now, m.
  double Drift() const {
    const sim::TrueState& s = plant.truth();
    const double dx = s.x_m - timeline.path_x_m(), dy = s.y_m - timeline.path_y_m();
    return std::sqrt(dx * dx + dy * dy);  // metres: no overflow for hypot to guard against
  }

  const Scenario& scenario;
  const RunOptions& options;
  sim::Plant& plant;
  host::ControllerHost& host;
  internal::Timeline timeline;
  MetricRecorder recorder;
  double dt_s;
  long total_steps;
  double equilibrium_pitch_rad;
  // The limit on the module's command, of its kind: the supply voltage, or the stall torque at
  // the wheel — on the robot the module is given (its nominal one, not one a sweep or envelope
  // changed), the most the built-in controllers command (design::InputLimit; at speed they clamp
  // lower, where the back-EMF leaves less headroom).
  double command_limit;
  double fall_tilt_rad;
  bool drives_payload;
  long trace_every = 0;  // trace rows every this many steps; 0: no trace
  // The linear twin compares against tilt and drift at every step (options.linear_twin).
  TiltDriftSeries plant_series;
  // Early settling (envelope probes): from when on a quiet robot has nothing more coming to it,
  // and for how many steps it must stay quiet.
  double quiet_from_s;
  long hold_steps;
  double tilt_band_rad;
};

RunLoop::RunLoop(const Scenario& run_scenario, const RunOptions& run_options, sim::Plant& run_plant,
                 host::ControllerHost& run_host)
    : scenario(run_scenario),
      options(run_options),
      plant(run_plant),
      host(run_host),
      timeline(run_scenario),
      recorder(run_scenario.metrics, run_scenario.dt_s, run_scenario.duration_s,
               internal::Timeline::DisturbanceStarts(run_scenario)),
      dt_s(run_scenario.dt_s),
      total_steps(std::lround(run_scenario.duration_s / run_scenario.dt_s)),
      equilibrium_pitch_rad(
          design::Linearise(run_scenario.built_model(), design::InputKind::kTorque)
              .equilibrium_pitch_rad),
      command_limit(
          design::InputLimit(run_scenario.model, run_host.drive() == sim::DriveMode::kVoltage
                                                     ? design::InputKind::kVoltage
                                                     : design::InputKind::kTorque)),
      fall_tilt_rad(run_scenario.metrics.fall_tilt_deg / kDeg),
      drives_payload(run_scenario.built_model().payload.present &&
                     !run_scenario.payload_shifts.empty()),
      quiet_from_s(run_options.stop_when_settled ? internal::Timeline::QuietFrom(run_scenario)
                                                 : std::numeric_limits<double>::infinity()),
      // Bounded before the conversion: a hold longer than the run is as good as the run's length.
      hold_steps(std::max(1L, std::lround(std::min(run_options.settle_hold_s / run_scenario.dt_s,
                                                   static_cast<double>(total_steps) + 1)))),
      tilt_band_rad(run_scenario.metrics.tilt_band_deg / kDeg) {}

// The storage the steps fill, reserved before the first: the trace (its rate, marks and first
// row) and the linear twin's comparison series.
void ReserveRecords(RunLoop& run, Trace* trace) {
  if (run.options.trace_rate_hz > 0) {
    // Bounded before the conversion: a trace slower than one row a run keeps its first row only.
    run.trace_every =
        std::max(1L, std::lround(std::min(1.0 / (run.options.trace_rate_hz * run.dt_s),
                                          static_cast<double>(run.total_steps) + 1)));
    trace->rate_hz = 1.0 / (static_cast<double>(run.trace_every) * run.dt_s);
    trace->rows.reserve(static_cast<std::size_t>(run.total_steps / run.trace_every + 2));
    trace->marks = internal::Timeline::Marks(run.scenario);
    trace->rows.push_back(Row(run.plant, run.host, run.timeline, 0));
  }
  if (run.options.linear_twin) {
    run.plant_series.dt_s = run.dt_s;
    run.plant_series.Reserve(static_cast<std::size_t>(run.total_steps + 1));
    run.plant_series.Add(run.plant.truth().pitch_rad - run.equilibrium_pitch_rad, 0);
  }
}

// How the steps ended, with what the run's message needs; the message itself is written after
// the loop, which formats no text.
struct LoopEnd {
  enum class Why { kRanToTheEnd, kControllerFault, kDiverged, kOnGround, kTiltedOver, kSettled };
  Why why = Why::kRanToTheEnd;
  double time_s = 0;    // the plant's time when it ended
  double tilt_rad = 0;  // kTiltedOver: the tilt beyond the limit
};

// The step loop: timeline, controller tick, physics step, then the figures, the trace row and the
// verdicts (a fault, non-finite physics, a fall, a robot settled early), until the scenario's
// duration. The hot path: no allocation (every store reserved up front), no logging, no text.
LoopEnd StepUntilDecided(RunLoop& run, Trace* trace) {
  sim::Plant& plant = run.plant;
  const double rate_band_rad_s = 5 / kDeg;
  long quiet_steps = 0;
  for (long step = 0; step < run.total_steps; ++step) {
    run.timeline.Advance(step);
    if (run.drives_payload) {
      plant.SetPayloadTarget(run.timeline.payload_target_m());
    }
    if (!run.host.Tick(plant, run.timeline.reference())) {
      return {LoopEnd::Why::kControllerFault, plant.time_s()};
    }
    plant.Step();
    run.timeline.Integrate(run.dt_s);
    if (plant.diverged()) return {LoopEnd::Why::kDiverged, plant.time_s()};
    const double drift_m = run.Drift();
    const double tilt_rad = plant.truth().pitch_rad - run.equilibrium_pitch_rad;
    run.recorder.Add(Sample(plant, run.host, run.command_limit, tilt_rad, drift_m));
    if (run.options.linear_twin) run.plant_series.Add(tilt_rad, drift_m);
    if (run.trace_every > 0 && plant.step_count() % run.trace_every == 0) {
      trace->rows.push_back(Row(plant, run.host, run.timeline, drift_m));
    }
    if (plant.contact().chassis_on_ground) return {LoopEnd::Why::kOnGround, plant.time_s()};
    if (std::abs(tilt_rad) > run.fall_tilt_rad) {
      return {LoopEnd::Why::kTiltedOver, plant.time_s(), tilt_rad};
    }
    if (plant.time_s() >= run.quiet_from_s) {
      const sim::TrueState& s = plant.truth();
      const bool quiet = std::abs(tilt_rad) <= run.tilt_band_rad &&
                         std::abs(s.pitch_rate_rad_s) <= rate_band_rad_s &&
                         std::abs(s.forward_speed_m_s) < 0.05;
      quiet_steps = quiet ? quiet_steps + 1 : 0;
      if (quiet_steps >= run.hold_steps) return {LoopEnd::Why::kSettled, plant.time_s()};
    }
  }
  return {LoopEnd::Why::kRanToTheEnd, plant.time_s()};
}

RunStatus StatusOf(const LoopEnd& end) {
  switch (end.why) {
    case LoopEnd::Why::kControllerFault:
      return RunStatus::kControllerFault;
    case LoopEnd::Why::kDiverged:
      return RunStatus::kNumericFailure;
    case LoopEnd::Why::kOnGround:
    case LoopEnd::Why::kTiltedOver:
      return RunStatus::kFell;
    case LoopEnd::Why::kSettled:
    case LoopEnd::Why::kRanToTheEnd:
      break;
  }
  return RunStatus::kOk;
}

// The run's one-line message: why it fell or faulted, or how it survived.
std::string EndMessage(const LoopEnd& end, const host::ControllerHost& host) {
  switch (end.why) {
    case LoopEnd::Why::kControllerFault:
      return host.fault();
    case LoopEnd::Why::kDiverged:
      return "the physics state became non-finite at t = " + FixedText(end.time_s, 3) + " s";
    case LoopEnd::Why::kOnGround:
      return "fell at t = " + FixedText(end.time_s, 3) + " s: the chassis touched the ground";
    case LoopEnd::Why::kTiltedOver:
      return "fell at t = " + FixedText(end.time_s, 3) + " s: tilt " +
             FixedText(end.tilt_rad * kDeg, 1) + " deg beyond the limit";
    case LoopEnd::Why::kSettled:
      return "settled by t = " + FixedText(end.time_s, 3) + " s; stopped early";
    case LoopEnd::Why::kRanToTheEnd:
      break;
  }
  return "survived";
}

// After the steps: the trace's last row and the mark where a run cut short ended, the linear twin
// (options.linear_twin), and the run's figures with its status and message.
void FinishRun(RunLoop& run, const LoopEnd& end, std::size_t controller,
               const std::shared_ptr<host::Module>& module, RunResult* result) {
  const RunStatus status = StatusOf(end);
  Trace& trace = result->trace;
  // The trace ends where the run ended, on the trace rate's grid or not, so that what happened
  // last (a fall, a fault) has its row.
  if (run.trace_every > 0 && trace.rows.back().time_s < run.plant.time_s()) {
    trace.rows.push_back(Row(run.plant, run.host, run.timeline, run.Drift()));
  }
  if (run.trace_every > 0 && status != RunStatus::kOk) {
    // The end of a run cut short, among the event marks in time order.
    const double end_s =
        status == RunStatus::kControllerFault ? run.host.fault_time_s() : run.plant.time_s();
    auto& marks = trace.marks;
    const auto at = std::upper_bound(marks.begin(), marks.end(), end_s,
                                     [](double t, const EventMark& m) { return t < m.time_s; });
    marks.insert(at, {end_s, ToString(status)});
  }
  result->steps = run.plant.step_count();
  if (run.options.linear_twin) {
    AddLinearTwin(run.scenario, controller, module, run.plant_series, run.total_steps,
                  run.options.module_log_level, result);
  }
  result->metrics = run.recorder.Finish(status, EndMessage(end, run.host));
}

}  // namespace

Status RunOptions::Validate() const {
  std::ostringstream why;
  if (!(trace_rate_hz >= 0) || !std::isfinite(trace_rate_hz)) {
    why << "RunOptions::trace_rate_hz = " << trace_rate_hz << ", must be >= 0 and finite";
  } else if (!(settle_hold_s > 0) || !std::isfinite(settle_hold_s)) {
    why << "RunOptions::settle_hold_s = " << settle_hold_s << ", must be > 0 and finite";
  } else if (module_log_level < LogLevel::kDebug || module_log_level > LogLevel::kError) {
    why << "RunOptions::module_log_level = " << static_cast<int>(module_log_level)
        << ", must be a LogLevel";
  } else {
    return {};
  }
  return Failure(why.str());
}

RunResult RunOne(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                 const LoadedModule& module, const RunOptions& options) {
  const auto wall_start = std::chrono::steady_clock::now();
  RunResult result;
  result.scenario = scenario.name;
  result.controller = scenario.controllers.at(controller).name;
  result.seed = seed;
  result.baseline = controller == scenario.baseline;
  // Before the controller host, which hands it messages until it is destroyed.
  ModuleLogRecorder module_log(options.module_log_level);
  const auto finish = [&](RunStatus status, std::string message) {
    result.metrics.status = status;
    result.metrics.message = std::move(message);
    result.module_log = module_log.Log();
    result.wall_s =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
    return result;
  };
  if (const Status valid = options.Validate(); !valid) {
    return finish(RunStatus::kSetupFailed, valid.error());
  }
  if (!module) return finish(RunStatus::kSetupFailed, module.error());

  Result<RunStart> started = StartRun(scenario, controller, seed, *module, &module_log);
  if (!started) return finish(RunStatus::kSetupFailed, started.error());
  RunLoop run(scenario, options, *started->plant, *started->host);
  ReserveRecords(run, &result.trace);
  const LoopEnd end = StepUntilDecided(run, &result.trace);
  FinishRun(run, end, controller, *module, &result);
  const RunMetrics metrics = result.metrics;
  return finish(metrics.status, metrics.message);
}

Status CheckRunStart(const Scenario& scenario, std::size_t controller,
                     const std::shared_ptr<host::Module>& module, ModuleLog* module_log,
                     LogLevel module_log_level) {
  ModuleLogRecorder log(module_log_level);  // outlives the host in `started`
  const std::uint64_t seed = scenario.seeds.empty() ? 1 : scenario.seeds.front();
  const Result<RunStart> started = StartRun(scenario, controller, seed, module, &log);
  if (module_log) *module_log = log.Log();
  if (!started) return Failure(started.error());
  return {};
}

RunResult SetupFailedRun(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                         const std::string& message) {
  RunResult failed;
  failed.scenario = scenario.name;
  failed.controller = scenario.controllers[controller].name;
  failed.seed = seed;
  failed.baseline = controller == scenario.baseline;
  failed.metrics.status = RunStatus::kSetupFailed;
  failed.metrics.message = message;
  return failed;
}

RunResult RunOneSafely(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                       const LoadedModule& module, const RunOptions& options) {
  try {
    return RunOne(scenario, controller, seed, module, options);
  } catch (const std::exception& e) {
    return SetupFailedRun(scenario, controller, seed,
                          std::string("the run stopped on an error: ") + e.what());
  }
}

}  // namespace upright::runner
