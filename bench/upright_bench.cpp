// upright-bench: what a run costs against the bare physics engine. Prints one `name=value` line
// per figure, ending with overhead_vs_floor and scaling_2_jobs. Timings are wall-clock on this
// machine: compare the ratios, measured side by side in one process, not the absolute numbers.
#include <BulletDynamics/Featherstone/btMultiBody.h>
#include <btBulletDynamicsCommon.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <memory>
#include <numbers>
#include <string>
#include <thread>
#include <vector>

#include "robot_body.hpp"
#include "upright/base/number_text.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/robot_limits.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"
#include "upright/host/module.hpp"
#include "upright/model/conventions.hpp"
#include "upright/runner/run/batch.hpp"
#include "upright/runner/run/run_one.hpp"
#include "upright/runner/scenario/scenario_file.hpp"
#include "upright/sim/plant.hpp"
#include "world.hpp"

namespace {

using upright::FixedText;
using upright::SignificantText;
using upright::model::RobotModel;
using namespace upright::runner;
namespace sim = upright::sim;
using Clock = std::chrono::steady_clock;

double Seconds(Clock::time_point since) {
  return std::chrono::duration<double>(Clock::now() - since).count();
}

// User and system CPU time of the whole process so far, all threads.
double ProcessCpuSeconds() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  const auto seconds = [](const timeval& t) {
    return static_cast<double>(t.tv_sec) + 1e-6 * static_cast<double>(t.tv_usec);
  };
  return seconds(usage.ru_utime) + seconds(usage.ru_stime);
}

void Print(const char* name, double value, const char* unit) {
  std::printf("%s=%s%s%s\n", name, SignificantText(value, 4).c_str(), unit[0] ? " " : "", unit);
  std::fflush(stdout);
}

// What the floor's loop applies: per-wheel torque −K (x − x_eq) from the state read off the
// engine, and optionally the scenario's pushes as plain forces on the chassis.
struct FloorLaw {
  Eigen::Matrix<double, 2, 6> K = Eigen::Matrix<double, 2, 6>::Zero();
  double equilibrium_pitch_rad = 0;
  std::vector<sim::Push> pushes;
};

// The robot stands still: a stiff PD on pitch alone, no pushes (common practice gains).
FloorLaw StillLaw() {
  FloorLaw law;
  law.K(0, upright::design::kPitch) = law.K(1, upright::design::kPitch) = -150;         // N·m/rad
  law.K(0, upright::design::kPitchRate) = law.K(1, upright::design::kPitchRate) = -20;  // N·m·s/rad
  return law;
}

// The robot does what the full run's robot does: the scenario's pushes, and an LQR state
// feedback on the torque model (default design weights) that catches them and drives back.
FloorLaw SameMotionLaw(const Scenario& scenario) {
  namespace design = upright::design;
  const RobotModel& model = scenario.built_model();
  const design::LinearModel linear = design::Linearise(model, design::InputKind::kTorque);
  const design::DesignWeights weights =
      design::WeightsForRobot(design::DesignWeights{}, model, linear.equilibrium_pitch_rad)
          .value_or(design::DesignWeights{.max_tilt_deg = 3});
  const auto gain =
      design::RobotLqr(linear, design::StateWeight(weights),
                       design::InputWeight(weights, model, design::InputKind::kTorque));
  FloorLaw law;
  if (gain) law.K = *gain;
  law.equilibrium_pitch_rad = linear.equilibrium_pitch_rad;
  law.pushes = scenario.pushes;
  return law;
}

// The floor: the plant's world and robot (same bodies, colliders, step, solver iterations),
// stepped `steps` times under `law`, nothing else. Returns seconds per step.
double FloorPerStep(const RobotModel& model, const sim::PlantOptions& options,
                    const FloorLaw& law, long steps) {
  namespace internal = upright::sim::internal;
  internal::World world(options.dt_s, options.solver_iterations);
  world.AddGround(options.terrain, std::clamp(4 * model.wheel.radius_m, 0.2, 1.0));
  const auto robot = internal::BuildRobot(world, model, options);
  btMultiBody* body = robot.body;
  const auto start = Clock::now();
  for (long k = 0; k < steps; ++k) {
    const btTransform& base = body->getBaseWorldTransform();
    const btMatrix3x3& r = base.getBasis();
    const btVector3 axle = base.getOrigin() + r * robot.com_to_axle;
    const btVector3 v = body->getBaseVel(), w = body->getBaseOmega();
    Eigen::Matrix<double, 6, 1> x;
    x << axle.x(), v.x(), std::asin(std::clamp(-r[2][0], -1.0, 1.0)) - law.equilibrium_pitch_rad,
        w.y(), std::atan2(r[1][0], r[0][0]), w.z();
    const Eigen::Vector2d torque = -law.K * x;
    body->addJointTorque(internal::kLeftWheelLink, torque[0]);
    body->addJointTorque(internal::kRightWheelLink, torque[1]);
    const double t0 = static_cast<double>(k) * options.dt_s, t1 = t0 + options.dt_s;
    for (const sim::Push& p : law.pushes) {
      if (t1 <= p.start_s || t0 >= p.end_s()) continue;
      const double azimuth = p.direction_deg * std::numbers::pi / 180;
      const btVector3 f = p.MeanForce(t0, t1) * btVector3(std::cos(azimuth), std::sin(azimuth), 0);
      body->addBaseForce(f);
      body->addBaseTorque((r * (robot.com_to_axle + btVector3(0, 0, p.height_m))).cross(f));
    }
    world.Step();
  }
  const double seconds = Seconds(start) / static_cast<double>(steps);
  const double pitch =
      std::asin(std::clamp(-body->getBaseWorldTransform().getBasis()[2][0], -1.0, 1.0));
  if (!(std::abs(pitch) < 0.5)) {
    std::fprintf(stderr,
                 "upright-bench: the floor's robot fell (pitch %s rad): its figure "
                 "times a fallen robot\n",
                 FixedText(pitch, 2).c_str());
  }
  return seconds;
}

// The plant alone: Plant::Create and Plant::Step (motors, rolling resistance, readouts, contact
// readout, the sensor record with its noise) under the floor's still law read from the true
// state, with no timeline, controller, metrics or trace. Returns seconds per step.
double PlantPerStep(const RobotModel& model, const sim::PlantOptions& options, long steps) {
  auto created = sim::Plant::Create(model, options);
  if (!created) {
    std::fprintf(stderr, "upright-bench: %s\n", created.error().c_str());
    return 0;
  }
  const std::unique_ptr<sim::Plant> plant = std::move(*created);
  const auto start = Clock::now();
  for (long k = 0; k < steps; ++k) {
    const sim::TrueState& s = plant->truth();
    const double torque = 150 * s.pitch_rad + 20 * s.pitch_rate_rad_s;
    plant->SetCommand(torque, torque);
    plant->Step();
  }
  return Seconds(start) / static_cast<double>(steps);
}

// One full run of the scenario's baseline controller through RunOne, world build included.
// Returns seconds per step.
double FullPerStep(const Scenario& scenario, const std::shared_ptr<upright::host::Module>& module) {
  const auto start = Clock::now();
  const RunResult run = RunOne(scenario, 0, 1, module, RunOptions{});
  const double per_step = Seconds(start) / static_cast<double>(std::max(1L, run.steps));
  if (run.metrics.status != RunStatus::kOk) {
    std::fprintf(stderr, "upright-bench: the benchmark run did not survive: %s\n",
                 run.metrics.message.c_str());
  }
  return per_step;
}

// The q-quantile of `values` by linear interpolation between order statistics.
double Quantile(std::vector<double> values, double q) {
  std::sort(values.begin(), values.end());
  const double at = q * static_cast<double>(values.size() - 1);
  const auto below = static_cast<std::size_t>(at);
  const std::size_t above = std::min(below + 1, values.size() - 1);
  return values[below] + (at - static_cast<double>(below)) * (values[above] - values[below]);
}

std::shared_ptr<upright::host::Module> Builtin(const std::string& name) {
  const auto path = upright::host::FindBuiltinModule(name, upright::host::DefaultModuleDirs());
  if (!path) {
    std::fprintf(stderr, "upright-bench: %s\n", path.error().c_str());
    return nullptr;
  }
  const auto module = upright::host::Module::Load(*path);
  if (!module) {
    std::fprintf(stderr, "upright-bench: %s\n", module.error().c_str());
    return nullptr;
  }
  return *module;
}

// Peak resident memory (MB) of a fresh child process that runs one run.
double OneRunPeakMemoryMB(const Scenario& scenario,
                          const std::shared_ptr<upright::host::Module>& module) {
  const pid_t child = fork();
  if (child == 0) {
    RunOne(scenario, 0, 1, module, RunOptions{});
    _exit(0);
  }
  int status = 0;
  rusage usage{};
  wait4(child, &status, 0, &usage);
  return static_cast<double>(usage.ru_maxrss) / 1024.0;  // ru_maxrss is in KiB on Linux
}

}  // namespace

int main(int argc, char** argv) {
  // upright-bench [SCENARIO] [--rounds N] [--only floor|still_floor|plant|full]: --only runs that
  // one loop once and prints nothing else, for a profiler (callgrind counts instructions, free of
  // the machine's load).
  const char* usage =
      "usage: upright-bench [SCENARIO] [--rounds N] [--only floor|still_floor|plant|full]\n";
  std::string path = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/courier-shove-half-sine.xml";
  std::string only;
  int rounds = 21;
  for (int i = 1; i < argc; ++i) {
    const std::string arg = argv[i];
    if (arg == "--only" && i + 1 < argc) {
      only = argv[++i];
      if (only != "floor" && only != "still_floor" && only != "plant" && only != "full") {
        std::fprintf(stderr, "%s", usage);
        return 2;
      }
    } else if (arg == "--rounds" && i + 1 < argc) {
      rounds = std::atoi(argv[++i]);
      if (rounds < 1 || rounds > 1000) {
        std::fprintf(stderr, "upright-bench: --rounds must be in [1, 1000]\n");
        return 2;
      }
    } else if (arg.rfind("--", 0) == 0) {
      std::fprintf(stderr, "%s", usage);
      return 2;
    } else {
      path = arg;
    }
  }
  ScenarioLoadResult loaded = LoadScenarioFile(path);
  if (!loaded) {
    for (const auto& e : loaded.error()) std::fprintf(stderr, "%s\n", e.ToString().c_str());
    return 2;
  }
  Scenario scenario = *loaded;
  scenario.controllers.resize(1);  // the baseline module alone
  scenario.baseline = 0;
  const auto module = Builtin(scenario.controllers[0].module);
  if (!module) return 1;
  const long steps = std::lround(scenario.duration_s / scenario.dt_s);
  std::printf("scenario=%s controller=%s steps=%ld dt_s=%s hardware_threads=%u\n",
              scenario.name.c_str(), scenario.controllers[0].name.c_str(), steps,
              SignificantText(scenario.dt_s, 6).c_str(), std::thread::hardware_concurrency());

  sim::PlantOptions floor_options;
  floor_options.dt_s = scenario.dt_s;
  floor_options.solver_iterations = scenario.solver_iterations;
  floor_options.terrain = scenario.terrain;
  floor_options.initial = scenario.initial;
  const FloorLaw same_motion = SameMotionLaw(scenario), still = StillLaw();
  sim::PlantOptions plant_options = floor_options;
  plant_options.drive = sim::DriveMode::kTorque;
  // One timed loop by name: 0 floor, 1 still floor, 2 plant, 3 full.
  const char* loops[] = {"floor", "still_floor", "plant", "full"};
  const auto time_loop = [&](int which) {
    switch (which) {
      case 0:
        return FloorPerStep(scenario.built_model(), floor_options, same_motion, steps);
      case 1:
        return FloorPerStep(scenario.built_model(), floor_options, still, steps);
      case 2:
        return PlantPerStep(scenario.built_model(), plant_options, steps);
      default:
        return FullPerStep(scenario, module);
    }
  };
  for (int which = 0; which < 4; ++which) {
    if (only == loops[which]) {
      Print((std::string(loops[which]) + "_step_us").c_str(), time_loop(which) * 1e6, "us");
      return 0;
    }
  }

  // Side by side: each round times the four loops back to back, in an order that turns each
  // round. Times per step, and the ratios of the figures, are the best of the rounds: the least
  // disturbed measurement of each, as the machine's other work only ever adds time. The
  // quartiles of the full / floor ratio within each round show how much the machine moved.
  std::array<std::vector<double>, 4> per_round;
  std::array<double, 4> best{1e9, 1e9, 1e9, 1e9};
  for (int round = 0; round < rounds; ++round) {
    for (int turn = 0; turn < 4; ++turn) {
      const int which = (round + turn) % 4;
      const double seconds = time_loop(which);
      per_round[which].push_back(seconds);
      best[which] = std::min(best[which], seconds);
    }
  }
  const auto ratio = [&](int top, int bottom) {
    std::vector<double> r;
    for (int i = 0; i < rounds; ++i) r.push_back(per_round[top][i] / per_round[bottom][i]);
    return r;
  };
  for (int which = 0; which < 4; ++which) {
    Print((std::string(loops[which]) + "_step_us").c_str(), best[which] * 1e6, "us");
  }
  const double floor_best = best[0], full_best = best[3];
  Print("floor_realtime_factor", scenario.dt_s / floor_best, "");
  Print("full_realtime_factor", scenario.dt_s / full_best, "");

  // World build and teardown: Plant::Create and destroy, nothing stepped.
  {
    sim::PlantOptions options = floor_options;
    const int builds = 50;
    const auto start = Clock::now();
    for (int i = 0; i < builds; ++i) (void)sim::Plant::Create(scenario.built_model(), options);
    Print("world_build_teardown_ms", Seconds(start) / builds * 1e3, "ms");
  }

  // Floor cost on a triangle-mesh ground (a loading ramp far ahead) against the plane.
  {
    sim::PlantOptions mesh = floor_options;
    mesh.terrain.kind = sim::TerrainKind::kProfile;
    mesh.terrain.start_x_m = 20;
    mesh.terrain.segments = {{sim::SegmentKind::kRamp, 3, 0.25}};
    double plane_best = 1e9, mesh_best = 1e9;
    for (int round = 0; round < 3; ++round) {
      plane_best =
          std::min(plane_best, FloorPerStep(scenario.built_model(), floor_options, still, steps));
      mesh_best = std::min(mesh_best, FloorPerStep(scenario.built_model(), mesh, still, steps));
    }
    Print("mesh_step_us", mesh_best * 1e6, "us");
    Print("mesh_vs_plane", mesh_best / plane_best, "");
  }

  // Runs per second with 1 and 2 jobs: the same batch of 16 runs (seeds 1..16), the two job
  // counts alternating over eight rounds, the best of each. In the best 2-job round, the
  // process's CPU time over twice the wall time says whether the workers ever wait (1: never),
  // whatever speed the machine lends its cores at the time.
  double runs_per_s[2] = {0, 0};
  double busy_2_jobs = 0;
  for (int round = 0; round < 8; ++round) {
    for (int jobs : {1, 2}) {
      BatchOptions options;
      options.jobs = jobs;
      options.seed_count = 16;
      const double cpu_start = ProcessCpuSeconds();
      const auto start = Clock::now();
      const BatchResult batch = RunBatch({scenario}, options, "bench", nullptr);
      const double wall = Seconds(start);
      const double rate = static_cast<double>(batch.runs.size()) / wall;
      if (rate <= runs_per_s[jobs - 1]) continue;
      runs_per_s[jobs - 1] = rate;
      if (jobs == 2) busy_2_jobs = (ProcessCpuSeconds() - cpu_start) / (2 * wall);
    }
  }
  Print("runs_per_s_1_job", runs_per_s[0], "");
  Print("runs_per_s_2_jobs", runs_per_s[1], "");
  Print("busy_2_jobs", busy_2_jobs, "");
  Print("peak_memory_one_run_MB", OneRunPeakMemoryMB(scenario, module), "MB");
  Print("plant_vs_still_floor", best[2] / best[1], "");
  Print("overhead_vs_still_floor", best[3] / best[1], "");
  Print("overhead_vs_floor_q1", Quantile(ratio(3, 0), 0.25), "");
  Print("overhead_vs_floor_q3", Quantile(ratio(3, 0), 0.75), "");
  Print("overhead_vs_floor", best[3] / best[0], "");
  Print("scaling_2_jobs", runs_per_s[1] / runs_per_s[0], "");
  return 0;
}
