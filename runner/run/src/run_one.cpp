#include "upright/runner/run_one.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <exception>
#include <limits>
#include <sstream>

#include "timeline.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/weights.hpp"
#include "upright/host/controller_host.hpp"
#include "upright/model/conventions.hpp"
#include "upright/runner/linear_twin.hpp"
#include "upright/runner/metric_recorder.hpp"
#include "upright/runner/twin_gap.hpp"
#include "upright/sim/plant.hpp"

namespace upright::runner {
namespace {

constexpr double kDeg = 180 / kPi;

std::string Format(const char* format, double a, double b = 0) {
  char text[200];
  std::snprintf(text, sizeof text, format, a, b);
  return text;
}

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
  r.encoder_left_rad = sensed.encoder_angle_rad[kLeft];
  r.encoder_right_rad = sensed.encoder_angle_rad[kRight];
  r.command_left = std::isfinite(command[kLeft]) ? command[kLeft] : 0;
  r.command_right = std::isfinite(command[kRight]) ? command[kRight] : 0;
  r.voltage_left_V = m[kLeft].voltage_V;
  r.voltage_right_V = m[kRight].voltage_V;
  r.current_left_A = m[kLeft].current_A;
  r.current_right_A = m[kRight].current_A;
  r.torque_left_Nm = m[kLeft].wheel_torque_Nm;
  r.torque_right_Nm = m[kRight].wheel_torque_Nm;
  r.load_left_N = c.wheels[kLeft].normal_N;
  r.load_right_N = c.wheels[kRight].normal_N;
  r.slip_left = c.wheels[kLeft].slip_ratio;
  r.slip_right = c.wheels[kRight].slip_ratio;
  r.payload_x_m = s.payload_x_m;
  return r;
}

// The linear twin of this run (RunOptions::linear_twin): the same drive from a timeline of its
// own, the twin over the scenario's whole duration, its gap to `plant` and its trace columns.
void AddLinearTwin(const Scenario& scenario, std::size_t controller,
                   const std::shared_ptr<host::Module>& module, const TiltDriftSeries& plant,
                   long total_steps, RunResult* result) {
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
  TwinRun twin;
  std::string error;
  if (!RunLinearTwin(scenario, controller, module, plan, &twin, &error)) {
    result->gap.twin_message = "not run: " + error;
    return;
  }
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

// Sets up the run of `controller` with `seed`: false and *error (the run's setup_failed message)
// when the module refuses its settings or the plant refuses the scenario.
bool StartRun(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
              const std::shared_ptr<host::Module>& module, RunStart* start, std::string* error) {
  const ControllerEntry& entry = scenario.controllers.at(controller);
  // The controller first: the plant's drive mode is the module's.
  host::ControllerSpec spec;
  spec.module = module;
  spec.config = entry.config;
  spec.rate_hz = entry.rate_hz;
  spec.true_state = entry.true_state;
  // The set-up's first broken rule, into *error.
  const auto failed = [error](const std::string& why) {
    if (error) *error = why;
    return false;
  };
  auto host = host::ControllerHost::Create(spec, scenario.model, scenario.dt_s);
  if (!host) return failed(host.error());
  start->host = std::move(*host);

  sim::PlantOptions plant_options;
  plant_options.dt_s = scenario.dt_s;
  plant_options.solver_iterations = scenario.solver_iterations;
  plant_options.terrain = scenario.terrain;
  plant_options.initial = scenario.initial;
  plant_options.drive = start->host->drive();
  plant_options.seed = seed;
  plant_options.sensor_noise = scenario.sensor_noise;
  auto plant = sim::Plant::Create(scenario.built_model(), plant_options);
  if (!plant) return failed(plant.error());
  start->plant = std::move(*plant);
  for (const auto& p : scenario.pushes) {
    if (Status added = start->plant->AddPush(p); !added) return failed(added.error());
  }
  for (const auto& f : scenario.motor_faults) {
    if (Status added = start->plant->AddMotorFault(f); !added) return failed(added.error());
  }
  for (const auto& f : scenario.sensor_faults) {
    if (Status added = start->plant->AddSensorFault(f); !added) return failed(added.error());
  }
  return true;
}

}  // namespace

bool RunOptions::IsValid(std::string* error) const {
  std::ostringstream why;
  if (!(trace_rate_hz >= 0) || !std::isfinite(trace_rate_hz)) {
    why << "RunOptions::trace_rate_hz = " << trace_rate_hz << ", must be >= 0 and finite";
  } else if (!(settle_hold_s > 0) || !std::isfinite(settle_hold_s)) {
    why << "RunOptions::settle_hold_s = " << settle_hold_s << ", must be > 0 and finite";
  } else {
    return true;
  }
  *error = why.str();
  return false;
}

RunResult RunOne(const Scenario& scenario, std::size_t controller, std::uint64_t seed,
                 const std::shared_ptr<host::Module>& module, const std::string& load_error,
                 const RunOptions& options) {
  const auto wall_start = std::chrono::steady_clock::now();
  RunResult result;
  result.scenario = scenario.name;
  result.controller = scenario.controllers.at(controller).name;
  result.seed = seed;
  result.baseline = controller == scenario.baseline;
  const auto finish = [&](RunStatus status, std::string message) {
    result.metrics.status = status;
    result.metrics.message = std::move(message);
    result.wall_s =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - wall_start).count();
    return result;
  };
  std::string error;
  if (!options.IsValid(&error)) return finish(RunStatus::kSetupFailed, error);
  if (!module) return finish(RunStatus::kSetupFailed, load_error);

  RunStart start;
  if (!StartRun(scenario, controller, seed, module, &start, &error)) {
    return finish(RunStatus::kSetupFailed, error);
  }
  const std::unique_ptr<host::ControllerHost>& host = start.host;
  const std::unique_ptr<sim::Plant>& plant = start.plant;

  const double equilibrium_pitch_rad =
      design::Linearise(scenario.built_model(), design::InputKind::kTorque).equilibrium_pitch_rad;
  // The limit on the module's command, of its kind: the supply voltage, or the stall torque at
  // the wheel — on the robot the module is given (its nominal one, not one a sweep or envelope
  // changed), the limit the built-in controllers clamp at (design::InputLimit).
  const double command_limit = design::InputLimit(
      scenario.model, host->drive() == sim::DriveMode::kVoltage ? design::InputKind::kVoltage
                                                                : design::InputKind::kTorque);
  const double fall_tilt_rad = scenario.metrics.fall_tilt_deg / kDeg;
  const double dt_s = scenario.dt_s;
  const long total_steps = std::lround(scenario.duration_s / dt_s);
  MetricRecorder recorder(scenario.metrics, dt_s, scenario.duration_s,
                          internal::Timeline::DisturbanceStarts(scenario));
  internal::Timeline timeline(scenario);

  // Trace rows every `trace_every` steps, the storage reserved up front.
  long trace_every = 0;
  if (options.trace_rate_hz > 0) {
    trace_every = std::max(1L, std::lround(1.0 / (options.trace_rate_hz * dt_s)));
    result.trace.rate_hz = 1.0 / (static_cast<double>(trace_every) * dt_s);
    result.trace.rows.reserve(static_cast<std::size_t>(total_steps / trace_every + 2));
    result.trace.marks = internal::Timeline::Marks(scenario);
  }
  const auto drift = [&] {
    const sim::TrueState& s = plant->truth();
    const double dx = s.x_m - timeline.path_x_m(), dy = s.y_m - timeline.path_y_m();
    return std::sqrt(dx * dx + dy * dy);  // metres: no overflow for hypot to guard against
  };
  if (trace_every > 0) result.trace.rows.push_back(Row(*plant, *host, timeline, 0));
  // The linear twin compares against tilt and drift at every step, the storage reserved here.
  TiltDriftSeries plant_series;
  if (options.linear_twin) {
    plant_series.dt_s = dt_s;
    plant_series.Reserve(static_cast<std::size_t>(total_steps + 1));
    plant_series.Add(plant->truth().pitch_rad - equilibrium_pitch_rad, 0);
  }

  // Early settling (envelope probes): from when on a quiet robot has nothing more coming to it.
  const double quiet_from_s = options.stop_when_settled ? internal::Timeline::QuietFrom(scenario)
                                                        : std::numeric_limits<double>::infinity();
  const long hold_steps = std::max(1L, std::lround(options.settle_hold_s / dt_s));
  const double tilt_band_rad = scenario.metrics.tilt_band_deg / kDeg;
  const double rate_band_rad_s = 5 / kDeg;
  long quiet_steps = 0;

  RunStatus status = RunStatus::kOk;
  std::string message;
  const bool drives_payload =
      scenario.built_model().payload.present && !scenario.payload_shifts.empty();
  for (long step = 0; step < total_steps; ++step) {
    timeline.Advance(step);
    if (drives_payload) {
      plant->SetPayloadTarget(timeline.payload_target_m());
    }
    if (!host->Tick(*plant, timeline.reference())) {
      status = RunStatus::kControllerFault;
      message = host->fault();
      break;
    }
    plant->Step();
    timeline.Integrate(dt_s);
    if (plant->diverged()) {
      status = RunStatus::kNumericFailure;
      message = Format("the physics state became non-finite at t = %.3f s", plant->time_s());
      break;
    }
    const double drift_m = drift();
    const double tilt_rad = plant->truth().pitch_rad - equilibrium_pitch_rad;
    recorder.Add(Sample(*plant, *host, command_limit, tilt_rad, drift_m));
    if (options.linear_twin) plant_series.Add(tilt_rad, drift_m);
    if (trace_every > 0 && plant->step_count() % trace_every == 0) {
      result.trace.rows.push_back(Row(*plant, *host, timeline, drift_m));
    }
    const bool on_ground = plant->contact().chassis_on_ground;
    if (on_ground || std::abs(tilt_rad) > fall_tilt_rad) {
      status = RunStatus::kFell;
      message = on_ground
                    ? Format("fell at t = %.3f s: the chassis touched the ground", plant->time_s())
                    : Format("fell at t = %.3f s: tilt %.1f deg beyond the limit", plant->time_s(),
                             tilt_rad * kDeg);
      break;
    }
    if (plant->time_s() >= quiet_from_s) {
      const sim::TrueState& s = plant->truth();
      const bool quiet = std::abs(tilt_rad) <= tilt_band_rad &&
                         std::abs(s.pitch_rate_rad_s) <= rate_band_rad_s &&
                         std::abs(s.forward_speed_m_s) < 0.05;
      quiet_steps = quiet ? quiet_steps + 1 : 0;
      if (quiet_steps >= hold_steps) {
        message = Format("settled by t = %.3f s; stopped early", plant->time_s());
        break;
      }
    }
  }
  if (status == RunStatus::kOk && message.empty()) message = "survived";
  // The trace ends where the run ended, on the trace rate's grid or not, so that what happened
  // last (a fall, a fault) has its row.
  if (trace_every > 0 && result.trace.rows.back().time_s < plant->time_s()) {
    result.trace.rows.push_back(Row(*plant, *host, timeline, drift()));
  }
  if (trace_every > 0 && status != RunStatus::kOk) {
    // The end of a run cut short, among the event marks in time order.
    const double end_s =
        status == RunStatus::kControllerFault ? host->fault_time_s() : plant->time_s();
    auto& marks = result.trace.marks;
    const auto at = std::upper_bound(marks.begin(), marks.end(), end_s,
                                     [](double t, const EventMark& m) { return t < m.time_s; });
    marks.insert(at, {end_s, ToString(status)});
  }
  result.steps = plant->step_count();
  if (options.linear_twin) {
    AddLinearTwin(scenario, controller, module, plant_series, total_steps, &result);
  }
  result.metrics = recorder.Finish(status, message);
  const RunMetrics metrics = result.metrics;
  return finish(metrics.status, metrics.message);
}

std::string RunStartProblem(const Scenario& scenario, std::size_t controller,
                            const std::shared_ptr<host::Module>& module) {
  RunStart start;
  std::string error;
  const std::uint64_t seed = scenario.seeds.empty() ? 1 : scenario.seeds.front();
  return StartRun(scenario, controller, seed, module, &start, &error) ? "" : error;
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
                       const std::shared_ptr<host::Module>& module, const std::string& load_error,
                       const RunOptions& options) {
  try {
    return RunOne(scenario, controller, seed, module, load_error, options);
  } catch (const std::exception& e) {
    return SetupFailedRun(scenario, controller, seed,
                          std::string("the run stopped on an error: ") + e.what());
  }
}

}  // namespace upright::runner
