#include "upright/runner/twin/linear_twin.hpp"

#include <cmath>
#include <numbers>
#include <string_view>

#include "upright/base/number_text.hpp"
#include "upright/model/conventions.hpp"
#include "upright/runner/twin/twin_dynamics.hpp"
#include "upright/runner/twin/twin_sensors.hpp"

namespace upright::runner {
namespace {

using design::kPitch, design::kPitchRate, design::kX, design::kXDot, design::kYaw, design::kYawRate;

std::string Stopped(double time_s, const std::string& why) {
  return "stopped at t = " + FixedText(time_s, 3) + " s: " + why;
}

// The true state of the linear robot, for modules that read it.
void FillTruth(double time_s, const design::StateVector& x, double equilibrium_pitch_rad,
               double world_x_m, double world_y_m, const sim::SensorSample& sensed,
               double wheel_radius_m, sim::TrueState* truth) {
  truth->time_s = time_s;
  truth->x_m = world_x_m;
  truth->y_m = world_y_m;
  truth->z_m = wheel_radius_m;
  truth->pitch_rad = equilibrium_pitch_rad + x(kPitch);
  truth->roll_rad = 0;
  truth->yaw_rad = x(kYaw);
  truth->pitch_rate_rad_s = x(kPitchRate);
  truth->roll_rate_rad_s = 0;
  truth->yaw_rate_rad_s = x(kYawRate);
  truth->forward_speed_m_s = x(kXDot);
  truth->vertical_speed_m_s = 0;
  truth->wheel_angle_rad = sensed.encoder_angle_rad;
  truth->wheel_rate_rad_s = sensed.encoder_rate_rad_s;
}

// The robot's constant sensor biases, as the plant's sensors carry them: a bias held against
// wheel friction makes a parked robot creep, and the twin would otherwise part from the plant on a
// quiet run for that reason alone. Noise, quantisation and latency stay out.
void AddSensorBiases(const model::SensorModel& m, sim::SensorSample* sensed) {
  sensed->gyro_rad_s[0] += m.gyro_bias_x_rad_s;
  sensed->gyro_rad_s[1] += m.gyro_bias_y_rad_s;
  sensed->gyro_rad_s[2] += m.gyro_bias_z_rad_s;
  sensed->accel_m_s2[0] += m.accel_bias_x_m_s2;
  sensed->accel_m_s2[1] += m.accel_bias_y_m_s2;
  sensed->accel_m_s2[2] += m.accel_bias_z_m_s2;
}

// The twin's steps: from the scenario's initial tilt and speed, each physics step the ideal
// sensors (with the biases), the module's tick with the plan's reference, and the exact linear
// step, recorded after each, until the plan ends or the twin stops (a module fault, a tilt
// outside any linear model).
TwinRun PlayTwin(const Scenario& scenario, const ControllerEntry& entry, host::ControllerHost& host,
                 const TwinDynamics& dynamics, const DrivePlan& plan) {
  const std::size_t steps = plan.reference.size();
  const model::RobotModel& robot = scenario.built_model();
  const double equilibrium_pitch_rad = dynamics.linear().equilibrium_pitch_rad;
  const double dt_s = scenario.dt_s;

  design::StateVector x = design::StateVector::Zero();
  x(kPitch) = scenario.initial.pitch_rad - equilibrium_pitch_rad;
  x(kXDot) = scenario.initial.speed_m_s;
  const TwinSensorGeometry geometry = SensorGeometry(robot, equilibrium_pitch_rad, x(kPitch));
  double world_x_m = scenario.initial.x_m, world_y_m = 0;

  TwinRun run;
  run.series.dt_s = dt_s;
  run.series.Reserve(steps + 1);
  run.pitch_rad.reserve(steps + 1);
  run.x_m.reserve(steps + 1);
  const auto record = [&](double drift_m) {
    run.series.Add(x(kPitch), drift_m);
    run.pitch_rad.push_back(equilibrium_pitch_rad + x(kPitch));
    run.x_m.push_back(world_x_m);
  };
  record(0);

  Eigen::Vector2d u = Eigen::Vector2d::Zero();
  sim::TrueState truth;
  for (std::size_t i = 0; i < steps; ++i) {
    const long step = static_cast<long>(i);
    const double time_s = static_cast<double>(step) * dt_s;
    // The accelerometer sees the state's derivative with the input and pushes of the step just
    // taken (nothing before the first).
    sim::SensorSample sensed =
        IdealSensors(geometry, time_s, x, dynamics.Derivative(x, u, step - 1));
    AddSensorBiases(robot.sensors, &sensed);
    if (entry.true_state) {
      FillTruth(time_s, x, equilibrium_pitch_rad, world_x_m, world_y_m, sensed,
                robot.wheel.radius_m, &truth);
    }
    if (!host.Tick(step, sensed, entry.true_state ? &truth : nullptr, plan.reference[i])) {
      run.message = Stopped(time_s, host.fault());
      break;
    }
    const auto command = host.command();
    u = Eigen::Vector2d(command[model::kLeft], command[model::kRight]);
    const double x_before = x(kX), yaw_before = x(kYaw);
    dynamics.Step(step, u, &x);
    // The axle's ground track: the distance rolled along the step's mean heading.
    const double heading = (yaw_before + x(kYaw)) / 2, rolled = x(kX) - x_before;
    world_x_m += rolled * std::cos(heading);
    world_y_m += rolled * std::sin(heading);
    record(std::hypot(world_x_m - plan.path_x_m[i], world_y_m - plan.path_y_m[i]));
    if (!x.allFinite() || std::abs(x(kPitch)) > std::numbers::pi / 2) {
      run.message = Stopped(time_s + dt_s, "the tilt left (-90, 90) deg, outside any linear model");
      break;
    }
  }
  return run;
}

}  // namespace

Result<TwinRun> RunLinearTwin(const Scenario& scenario, std::size_t controller,
                              const std::shared_ptr<host::Module>& module, const DrivePlan& plan,
                              ModuleLogRecorder* module_log) {
  const std::size_t steps = plan.reference.size();
  if (plan.path_x_m.size() != steps || plan.path_y_m.size() != steps) {
    return Failure("DrivePlan: reference, path_x_m and path_y_m differ in length");
  }
  const ControllerEntry& entry = scenario.controllers.at(controller);
  host::ControllerSpec spec;
  spec.module = module;
  spec.config = entry.config;
  spec.rate_hz = entry.rate_hz;
  spec.true_state = entry.true_state;
  if (module_log) {
    spec.log = [module_log](int level, double time_s, std::string_view text) {
      module_log->Add(level, time_s, text);
    };
  }
  Result<std::unique_ptr<host::ControllerHost>> created =
      host::ControllerHost::Create(spec, scenario.model, scenario.dt_s);
  if (!created) return Failure(created.error());
  const std::unique_ptr<host::ControllerHost> host = std::move(*created);

  const design::InputKind input = host->drive() == sim::DriveMode::kTorque
                                      ? design::InputKind::kTorque
                                      : design::InputKind::kVoltage;
  const TwinDynamics dynamics(scenario.built_model(), input, scenario.dt_s, scenario.pushes);
  return PlayTwin(scenario, entry, *host, dynamics, plan);
}

}  // namespace upright::runner
