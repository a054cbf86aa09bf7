// upright-bench: what a run costs against the bare physics engine. Prints one `name=value` line
// per figure, ending with overhead_vs_floor and scaling_2_jobs. Timings are wall-clock on this
// machine: compare the ratios, measured side by side in one process, not the absolute numbers.
#include <btBulletDynamicsCommon.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <BulletDynamics/Featherstone/btMultiBody.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <string>
#include <thread>
#include <vector>

#include "robot_body.hpp"
#include "upright/host/module.hpp"
#include "upright/model/conventions.hpp"
#include "upright/runner/batch.hpp"
#include "upright/runner/run_one.hpp"
#include "upright/runner/scenario_file.hpp"
#include "upright/sim/plant.hpp"
#include "world.hpp"

namespace {

using upright::RobotModel;
using namespace upright::runner;
namespace sim = upright::sim;
using Clock = std::chrono::steady_clock;

double Seconds(Clock::time_point since) {
  return std::chrono::duration<double>(Clock::now() - since).count();
}

void Print(const char* name, double value, const char* unit) {
  std::printf("%s=%.4g%s%s\n", name, value, unit[0] ? " " : "", unit);
  std::fflush(stdout);
}

// The floor: the plant's world and robot (same bodies, colliders, step, solver iterations),
// stepped `steps` times with a fixed PD torque law on the chassis pitch that keeps it upright,
// nothing else. Returns seconds per step.
double FloorPerStep(const RobotModel& model, const sim::PlantOptions& options, long steps) {
  upright::sim::internal::World world(options.dt_s, options.solver_iterations);
  world.AddGround(options.terrain, std::clamp(4 * model.wheel.radius_m, 0.2, 1.0));
  const auto robot = upright::sim::internal::BuildRobot(world, model, options);
  btMultiBody* body = robot.body;
  const auto start = Clock::now();
  for (long k = 0; k < steps; ++k) {
    const btTransform base = body->getBaseWorldTransform();
    const btMatrix3x3& r = base.getBasis();
    const double pitch = std::asin(std::clamp(-r[2][0], -1.0, 1.0));
    const double rate = body->getBaseOmega().y();
    const double torque = 150 * pitch + 20 * rate;  // per wheel, N·m (a stiff PD, common practice)
    body->addJointTorque(upright::sim::internal::kLeftWheelLink, torque);
    body->addJointTorque(upright::sim::internal::kRightWheelLink, torque);
    world.Step();
  }
  return Seconds(start) / static_cast<double>(steps);
}

std::shared_ptr<upright::host::Module> Builtin(const std::string& name) {
  std::string error;
  const auto path = upright::host::FindBuiltinModule(name, upright::host::DefaultModuleDirs(), &error);
  auto module = path.empty() ? nullptr : upright::host::Module::Load(path, &error);
  if (!module) std::fprintf(stderr, "upright-bench: %s\n", error.c_str());
  return module;
}

// Peak resident memory (MB) of a fresh child process that runs one run.
double OneRunPeakMemoryMB(const Scenario& scenario,
                          const std::shared_ptr<upright::host::Module>& module) {
  const pid_t child = fork();
  if (child == 0) {
    RunOne(scenario, 0, 1, module, "", RunOptions{});
    _exit(0);
  }
  int status = 0;
  rusage usage{};
  wait4(child, &status, 0, &usage);
  return static_cast<double>(usage.ru_maxrss) / 1024.0;  // ru_maxrss is in KiB on Linux
}

}  // namespace

int main(int argc, char** argv) {
  // upright-bench [SCENARIO] [--only floor|full]: --only runs that one loop once and prints
  // nothing else, for a profiler (callgrind counts instructions, free of the machine's load).
  std::string path = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/courier-shove-half-sine.xml";
  std::string only;
  for (int i = 1; i < argc; ++i) {
    const std::string arg = argv[i];
    if (arg == "--only" && i + 1 < argc) {
      only = argv[++i];
    } else if (arg.rfind("--", 0) == 0) {
      std::fprintf(stderr, "usage: upright-bench [SCENARIO] [--only floor|full]\n");
      return 2;
    } else {
      path = arg;
    }
  }
  ScenarioLoadResult loaded = LoadScenarioFile(path);
  if (!loaded.ok()) {
    for (const auto& e : loaded.errors) std::fprintf(stderr, "%s\n", e.ToString().c_str());
    return 2;
  }
  Scenario scenario = loaded.scenario;
  scenario.controllers.resize(1);  // the baseline module alone
  scenario.baseline = 0;
  const auto module = Builtin(scenario.controllers[0].module);
  if (!module) return 1;
  const long steps = std::lround(scenario.duration_s / scenario.dt_s);
  std::printf("scenario=%s controller=%s steps=%ld dt_s=%g hardware_threads=%u\n",
              scenario.name.c_str(), scenario.controllers[0].name.c_str(), steps, scenario.dt_s,
              std::thread::hardware_concurrency());

  sim::PlantOptions floor_options;
  floor_options.dt_s = scenario.dt_s;
  floor_options.solver_iterations = scenario.solver_iterations;
  floor_options.terrain = scenario.terrain;
  if (only == "floor") {
    Print("floor_step_us", FloorPerStep(scenario.model, floor_options, steps) * 1e6, "us");
    return 0;
  }
  if (only == "full") {
    const auto start = Clock::now();
    RunOne(scenario, 0, 1, module, "", RunOptions{});
    Print("full_step_us", Seconds(start) / static_cast<double>(steps) * 1e6, "us");
    return 0;
  }

  // Side by side, alternating, best of several: the least disturbed measurement of each.
  const int rounds = 7;
  double floor_best = 1e9, full_best = 1e9;
  for (int round = 0; round < rounds; ++round) {
    floor_best = std::min(floor_best, FloorPerStep(scenario.model, floor_options, steps));
    const auto start = Clock::now();
    const RunResult run = RunOne(scenario, 0, 1, module, "", RunOptions{});
    const double per_step = Seconds(start) / static_cast<double>(run.steps);
    if (run.metrics.status != RunStatus::kOk) {
      std::fprintf(stderr, "upright-bench: the benchmark run did not survive: %s\n",
                   run.metrics.message.c_str());
    }
    full_best = std::min(full_best, per_step);
  }
  Print("floor_step_us", floor_best * 1e6, "us");
  Print("full_step_us", full_best * 1e6, "us");
  Print("floor_realtime_factor", scenario.dt_s / floor_best, "");
  Print("full_realtime_factor", scenario.dt_s / full_best, "");

  // World build and teardown: Plant::Create and destroy, nothing stepped.
  {
    sim::PlantOptions options = floor_options;
    const int builds = 50;
    std::string error;
    const auto start = Clock::now();
    for (int i = 0; i < builds; ++i) sim::Plant::Create(scenario.model, options, &error);
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
      plane_best = std::min(plane_best, FloorPerStep(scenario.model, floor_options, steps));
      mesh_best = std::min(mesh_best, FloorPerStep(scenario.model, mesh, steps));
    }
    Print("mesh_step_us", mesh_best * 1e6, "us");
    Print("mesh_vs_plane", mesh_best / plane_best, "");
  }

  // Runs per second with 1 and 2 jobs: the same batch of 16 runs (seeds 1..16).
  double runs_per_s[2] = {0, 0};
  for (int jobs : {1, 2}) {
    BatchOptions options;
    options.jobs = jobs;
    options.seed_count = 16;
    const auto start = Clock::now();
    const BatchResult batch = RunBatch({scenario}, options, "bench", nullptr);
    runs_per_s[jobs - 1] = static_cast<double>(batch.runs.size()) / Seconds(start);
    Print(jobs == 1 ? "runs_per_s_1_job" : "runs_per_s_2_jobs", runs_per_s[jobs - 1], "");
  }
  Print("peak_memory_one_run_MB", OneRunPeakMemoryMB(scenario, module), "MB");
  Print("overhead_vs_floor", full_best / floor_best, "");
  Print("scaling_2_jobs", runs_per_s[1] / runs_per_s[0], "");
  return 0;
}
