// `upright demo` (until the scenario runner exists): the demo robot on flat ground under the
// LQR designed for it (reading the true state), shoved by a half-sine push, with a few lines of
// state printed. It shows the plant and the design working end to end.

#include <cmath>
#include <cstdio>
#include <iostream>

#include "commands.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/sim/plant.hpp"

namespace upright::cli {

int RunPlantDemo(const PlantDemoOptions& options) {
  const ModelLoadResult loaded = LoadModelFile(options.model_path);
  if (!loaded.ok()) {
    for (const auto& e : loaded.errors) std::cerr << e.ToString() << "\n";
    return kExitBadInput;
  }
  const RobotModel& model = loaded.model;
  const design::DesignSet designs = design::DesignAll(model, design::DesignRequest{});
  if (!designs.lqr.ok) {
    std::cerr << options.model_path << ": LQR design failed: " << designs.lqr.message << "\n";
    return kExitFailed;
  }
  const design::Gain& k = designs.lqr.K;

  sim::PlantOptions plant_options;
  plant_options.drive = sim::DriveMode::kTorque;
  std::string error;
  auto plant = sim::Plant::Create(model, plant_options, &error);
  if (!plant) {
    std::cerr << options.model_path << ": " << error << "\n";
    return kExitBadInput;
  }
  const double total_mass_kg = model.chassis.mass_kg + 2 * model.wheel.mass_kg +
                               (model.payload.present ? model.payload.mass_kg : 0.0);
  sim::Push push;
  push.shape = sim::PushShape::kHalfSine;
  push.start_s = 1.0;
  push.duration_s = 0.2;
  push.peak_N = options.push_N > 0 ? options.push_N : 0.15 * total_mass_kg * kStandardGravity_m_s2;
  push.height_m = model.chassis.com_height_m;
  if (!plant->AddPush(push, &error)) {
    std::cerr << error << "\n";
    return kExitBadInput;
  }

  std::printf("upright demo: robot '%s' (%.1f kg) under its LQR design, reading the true state\n",
              model.name.c_str(), total_mass_kg);
  std::printf("half-sine push of %.0f N for %.2f s at t = %.1f s, %.2f m above the axle\n",
              push.peak_N, push.duration_s, push.start_s, push.height_m);
  std::printf("%7s %9s %8s %9s %10s %9s %9s %7s\n", "t_s", "pitch_deg", "x_m", "speed_m_s",
              "torque_Nm", "current_A", "load_L_N", "slip_L");
  const auto control_steps =
      static_cast<long>(std::lround(1.0 / (model.control_rate_hz * plant_options.dt_s)));
  const auto print_steps = static_cast<long>(std::lround(options.print_every_s / plant_options.dt_s));
  const auto total_steps = static_cast<long>(std::lround(options.duration_s / plant_options.dt_s));
  bool fell = false;
  for (long step = 0; step <= total_steps; ++step) {
    const sim::TrueState& s = plant->truth();
    if (step % control_steps == 0) {
      design::StateVector x;
      x << s.x_m, s.forward_speed_m_s, s.pitch_rad - designs.plant.equilibrium_pitch_rad,
          s.pitch_rate_rad_s, s.yaw_rad, s.yaw_rate_rad_s;
      const Eigen::Vector2d u = -k * x;
      plant->SetCommand(u(kLeft), u(kRight));
    }
    if (step % print_steps == 0) {
      const auto& motor = plant->motors()[kLeft];
      const auto& wheel = plant->contact().wheels[kLeft];
      std::printf("%7.2f %9.3f %8.3f %9.3f %10.3f %9.3f %9.1f %7.3f\n", s.time_s,
                  s.pitch_rad * 180 / kPi, s.x_m, s.forward_speed_m_s, motor.wheel_torque_Nm,
                  motor.current_A, wheel.normal_N, wheel.slip_ratio);
    }
    if (plant->contact().chassis_on_ground || plant->diverged()) {
      fell = true;
      break;
    }
    if (step < total_steps) plant->Step();
  }
  if (fell) {
    std::printf("the robot fell at t = %.3f s\n", plant->time_s());
    return kExitFailed;
  }
  std::printf("balanced for %.1f s; final pitch %.3f deg, drift %.3f m\n", plant->time_s(),
              plant->truth().pitch_rad * 180 / kPi, plant->truth().x_m);
  std::printf("Simulation only: validate on hardware with a tether or spotter, at low speed "
              "first, within local rules.\n");
  return kExitOk;
}

}  // namespace upright::cli
