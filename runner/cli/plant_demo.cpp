// `upright demo` (until the scenario runner exists): the demo robot on flat ground under a
// state feedback placed on its linearised pitch/drive model, shoved by a half-sine push, with a
// few lines of state printed. It shows the plant working end to end, not a controller design.
#include <Eigen/Dense>

#include <cmath>
#include <cstdio>
#include <iostream>

#include "commands.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/sim/plant.hpp"

namespace upright::cli {
namespace {

using Vector4 = Eigen::Vector4d;
using Matrix4 = Eigen::Matrix4d;

// Linearised pitch/drive model about upright, states [x, ẋ, θ, θ̇], input u = τ_L + τ_R at the
// wheels (CONTROL-NOTES derivation; the payload is lumped into the body at its home position).
void PitchDriveModel(const RobotModel& m, Matrix4* a, Vector4* b) {
  const double g = kStandardGravity_m_s2, r = m.wheel.radius_m;
  double mb = m.chassis.mass_kg, l = m.chassis.com_height_m, ib = m.chassis.pitch_inertia_kgm2;
  if (m.payload.present) {  // parallel-axis lumping of the payload box into the body
    const PayloadModel& p = m.payload;
    const double mt = mb + p.mass_kg, lt = (mb * l + p.mass_kg * p.z_m) / mt;
    ib += mb * (l - lt) * (l - lt) + p.mass_kg * (p.z_m - lt) * (p.z_m - lt) +
          p.mass_kg * (p.length_m * p.length_m + p.height_m * p.height_m) / 12;
    mb = mt;
    l = lt;
  }
  const double mx = mb + 2 * m.wheel.mass_kg + 2 * m.wheel.spin_inertia_kgm2 / (r * r);
  const double jt = ib + mb * l * l;
  const double delta = mx * jt - mb * mb * l * l;
  *a << 0, 1, 0, 0,  //
      0, 0, -mb * mb * l * l * g / delta, 0,  //
      0, 0, 0, 1,  //
      0, 0, mx * mb * g * l / delta, 0;
  *b << 0, (jt + mb * l * r) / (r * delta), 0, -(mx * r + mb * l) / (r * delta);
}

// Ackermann's formula: K such that eig(A − b K) are the roots of the given monic polynomial.
Eigen::RowVector4d PlacePoles(const Matrix4& a, const Vector4& b, const Eigen::Vector4d& poles) {
  Matrix4 ctrb;
  ctrb << b, a * b, a * a * b, a * a * a * b;
  Matrix4 phi = Matrix4::Identity();
  for (int i = 0; i < 4; ++i) phi = phi * (a - poles(i) * Matrix4::Identity());
  return Eigen::RowVector4d(0, 0, 0, 1) * ctrb.inverse() * phi;
}

}  // namespace

int RunPlantDemo(const PlantDemoOptions& options) {
  const ModelLoadResult loaded = LoadModelFile(options.model_path);
  if (!loaded.ok()) {
    for (const auto& e : loaded.errors) std::cerr << e.ToString() << "\n";
    return kExitBadInput;
  }
  const RobotModel& model = loaded.model;
  Matrix4 a;
  Vector4 b;
  PitchDriveModel(model, &a, &b);
  // Closed-loop poles at multiples of the open-loop falling rate λ: fast enough to catch a fall,
  // slow enough to stay inside the motors' torque (a rule of thumb for a demonstration).
  const double lambda = std::sqrt(a(3, 2));
  const Eigen::RowVector4d k =
      PlacePoles(a, b, Eigen::Vector4d(-1.5 * lambda, -1.3 * lambda, -0.6 * lambda, -0.4 * lambda));

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

  std::printf("upright demo: robot '%s' (%.1f kg), state feedback K = [%.3g %.3g %.3g %.3g]\n",
              model.name.c_str(), total_mass_kg, k(0), k(1), k(2), k(3));
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
      const Vector4 x(s.x_m, s.forward_speed_m_s, s.pitch_rad, s.pitch_rate_rad_s);
      const double per_wheel_Nm = -0.5 * k.dot(x);
      plant->SetCommand(per_wheel_Nm, per_wheel_Nm);
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
