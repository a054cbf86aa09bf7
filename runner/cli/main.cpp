// Entry point of the `upright` program: parses the command line and dispatches to a subcommand.
#include <CLI/CLI.hpp>
#include <algorithm>
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "commands.hpp"
#include "envelope_command.hpp"
#include "log.hpp"
#include "report_command.hpp"
#include "sweep_command.hpp"
#include "tune_command.hpp"
#include "upright/base/result.hpp"
#include "upright_version.hpp"

namespace {

// The flags every subcommand takes: --quiet and --verbose, one or the other.
struct VerbosityFlags {
  bool quiet = false;
  bool verbose = false;
  upright::cli::Verbosity verbosity() const {
    if (verbose) return upright::cli::Verbosity::kVerbose;
    return quiet ? upright::cli::Verbosity::kQuiet : upright::cli::Verbosity::kNormal;
  }
};

// Adds -q/--quiet and -v/--verbose to `cmd`, into `flags` (shared by every subcommand: one runs).
void AddVerbosityFlags(CLI::App* cmd, VerbosityFlags* flags) {
  auto* quiet = cmd->add_flag("-q,--quiet", flags->quiet,
                              "Errors, warnings and the safety caution only: no progress, no "
                              "information, no module messages below warning");
  auto* verbose = cmd->add_flag(
      "-v,--verbose", flags->verbose,
      "Also debug lines on stderr, the controller modules' debug messages among them");
  quiet->excludes(verbose);
}

// An option that sets a std::optional<double> when given.
void AddOptionalNumber(CLI::App* cmd, const std::string& name, std::optional<double>* target,
                       const std::string& help) {
  cmd->add_option_function<double>(
      name, [target](const double& value) { *target = value; }, help);
}

void AddDesignOptions(CLI::App* cmd, upright::cli::DesignOptions* o) {
  auto& r = o->request;
  auto& w = r.weights;
  cmd->add_option("MODEL", o->model_path, "Robot model file (.xml)")->required();
  cmd->add_flag("--json", o->json, "Print one JSON object instead of text");
  cmd->add_option("--export-c", o->export_c_path,
                  "Also write the usable designs' gains at the rate as a C header (FILE.h) for "
                  "firmware, with the model file's SHA-256, state order, units and signs");
  cmd->add_option("--report", o->report_dir,
                  "Also write the designs' pictures to DIR (created if missing): Bode and Nyquist "
                  "plots of the loop at the wheels, the linear response to the design push and "
                  "the margins, as CSV files and DIR/report.html");
  AddOptionalNumber(cmd, "--rate", &o->rate_hz,
                    "Controller sample rate, Hz, > 0 (default: the model's control rate_hz)");
  AddOptionalNumber(cmd, "--gamma", &o->gamma,
                    "H-infinity gamma, > 0 (default: the smallest gamma whose design push stays "
                    "within the ground-contact tilt and the current limit)");
  AddOptionalNumber(cmd, "--gamma-factor", &o->gamma_factor,
                    "gamma as a multiple of gamma_opt, > 1 (default: by the rule, as --gamma)");
  cmd->add_option("--input", o->input_text, "Design input: torque or voltage")
      ->check(CLI::IsMember({"torque", "voltage"}))
      ->capture_default_str();
  AddOptionalNumber(cmd, "--push-height-m", &o->push_height_m,
                    "Height of the design push above the axle, m, >= 0 (default: the COM height)");
  AddOptionalNumber(cmd, "--push-scale-N", &o->push_scale_N,
                    "Size of the design push, N, > 0 (default: 10 % of the robot's weight)");
  cmd->add_option("--max-drift-m", w.max_drift_m, "Weight: acceptable drift")
      ->capture_default_str();
  cmd->add_option("--max-speed-m-s", w.max_speed_m_s, "Weight: acceptable speed error")
      ->capture_default_str();
  AddOptionalNumber(cmd, "--max-tilt-deg", &o->max_tilt_deg,
                    "Weight: acceptable tilt, > 0 (default: a fifth of the ground-contact tilt)");
  cmd->add_option("--max-tilt-rate-deg-s", w.max_tilt_rate_deg_s, "Weight: acceptable tilt rate")
      ->capture_default_str();
  cmd->add_option("--max-yaw-deg", w.max_yaw_deg, "Weight: acceptable heading error")
      ->capture_default_str();
  cmd->add_option("--max-yaw-rate-deg-s", w.max_yaw_rate_deg_s, "Weight: acceptable yaw-rate error")
      ->capture_default_str();
  cmd->add_option("--max-input-fraction", w.max_input_fraction,
                  "Weight: acceptable wheel input, as a fraction of stall torque or supply")
      ->capture_default_str();
  auto& poles = r.pid_poles;
  cmd->add_option("--tilt-pole-factor", poles.tilt_pole_factor,
                  "PID: the tilt pair's natural frequency over the fall rate, > 0")
      ->capture_default_str();
  cmd->add_option("--tilt-damping", poles.tilt_damping,
                  "PID: the tilt pair's damping ratio, in [0.2, 1]")
      ->capture_default_str();
  cmd->add_option("--speed-pole-factor", poles.speed_pole_factor,
                  "PID: the speed pair's natural frequency over the fall rate, at most half the "
                  "tilt pole factor")
      ->capture_default_str();
  cmd->add_option("--speed-damping", poles.speed_damping,
                  "PID: the speed pair's damping ratio, in [0.2, 1]")
      ->capture_default_str();
  cmd->add_option("--yaw-pole-factor", poles.yaw_pole_factor,
                  "PID: the yaw-rate loop's crossover over the fall rate, > 0")
      ->capture_default_str();
  cmd->footer(
      "Each controller gets a status: ok; designed but unstable as the module samples it at the "
      "rate; failed (with the reason); or not offered for the input (PID with voltage).\n"
      "Exit codes: 0 every design offered is ok; 3 some are ok and some are not; 1 none is; "
      "2 bad input (nothing designed).");
}

// The options `run` and `demo` share; `out_help` says where results go by default.
void AddRunOptions(CLI::App* cmd, upright::cli::RunCommandOptions* o, const std::string& out_help) {
  cmd->add_option("--out", o->out_dir, out_help);
  cmd->add_option("--jobs", o->batch.jobs, "Runs in parallel (0: one per core)")
      ->check(CLI::Range(0, 1024))
      ->capture_default_str();
  cmd->add_option("--seeds", o->batch.seed_count,
                  "Noise seeds 1..N for every scenario (0: each file's own seeds)")
      ->check(CLI::Range(0, 100000))
      ->capture_default_str();
  cmd->add_option("--trace-rate", o->batch.run.trace_rate_hz,
                  "Trace rows per simulated second, Hz (0: no traces)")
      ->check(CLI::Range(0.0, 1e6))
      ->capture_default_str();
}

// Optimal string alignment distance: insertions, deletions, substitutions and swaps of two
// neighbours, each costing 1.
std::size_t EditDistance(const std::string& a, const std::string& b) {
  std::vector<std::vector<std::size_t>> d(a.size() + 1, std::vector<std::size_t>(b.size() + 1));
  for (std::size_t i = 0; i <= a.size(); ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= b.size(); ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) {
        d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
      }
    }
  }
  return d[a.size()][b.size()];
}

// When the first argument is a word that names no command: what to say on stderr, listing the
// commands and suggesting the nearest (within two edits, fewer than the word's length). Fine when
// there is no such word.
upright::Status CheckFirstWord(const CLI::App& app, int argc, char** argv) {
  if (argc < 2 || argv[1][0] == '-') return {};
  const std::string word = argv[1];
  std::string list, nearest;
  std::size_t nearest_distance = 3;
  for (const CLI::App* sub : app.get_subcommands({})) {
    const std::string& name = sub->get_name();
    if (name == word) return {};
    list += (list.empty() ? "" : ", ") + name;
    const std::size_t distance = EditDistance(word, name);
    if (distance < nearest_distance && distance < word.size()) {
      nearest = name;
      nearest_distance = distance;
    }
  }
  std::string message = "upright: unknown command '" + word + "'";
  if (!nearest.empty()) message += "; did you mean '" + nearest + "'?";
  return upright::Failure(message + "\ncommands: " + list + " (upright --help describes them)");
}

// `upright run`: scenario files or folders in, tables out.
CLI::App* AddRunCommand(CLI::App* app, upright::cli::RunCommandOptions* run) {
  auto* run_cmd = app->add_subcommand(
      "run",
      "Run every scenario x controller x seed; write summary, comparison and ranking tables");
  run_cmd
      ->add_option("SCENARIO", run->scenario_paths,
                   "Scenario files (.xml), or folders: each folder's *.xml scenario files, by name")
      ->required();
  AddRunOptions(run_cmd, run,
                "Results folder (default: results/<scenario name>, or the scenarios' folder name)");
  run_cmd->add_flag("--linear-twin", run->batch.run.linear_twin,
                    "Also play each run on the linear model the controllers are designed on (same "
                    "module, rate, pushes; ideal sensors, no contact or limits) and write gap.csv "
                    "and gap.md: where the linear prediction and the physics part");
  return run_cmd;
}

// `upright demo`: the demo suite, its envelope and sweep, and the report.
CLI::App* AddDemoCommand(CLI::App* app, upright::cli::RunCommandOptions* demo) {
  auto* demo_cmd = app->add_subcommand(
      "demo",
      "Run the invented demo suite (scenarios/) with its linear twins, an envelope and a sweep of "
      "the shove, into results/demo, and write the report");
  AddRunOptions(demo_cmd, demo,
                "Results folder (default: results/demo; the envelope and sweep go in its "
                "envelope/ and sweep/)");
  return demo_cmd;
}

// `upright sweep`: a scenario with dispersions in, survival rates and percentiles out.
CLI::App* AddSweepCommand(CLI::App* app, upright::cli::SweepCommandOptions* sweep) {
  auto* sweep_cmd = app->add_subcommand(
      "sweep",
      "Monte Carlo over the scenario's <dispersions>: survival rate with a 95 % interval, figure "
      "percentiles, paired comparison with the baseline");
  sweep_cmd->add_option("SCENARIO", sweep->scenario_path, "Scenario file (.xml) with <dispersions>")
      ->required();
  sweep_cmd->add_option("--samples", sweep->samples, "Samples N; every controller runs on each")
      ->check(CLI::Range(1, 1000000))
      ->capture_default_str();
  sweep_cmd->add_option("--seed", sweep->seed, "Sweep seed: the same seed draws the same samples")
      ->capture_default_str();
  sweep_cmd->add_option("--out", sweep->out_dir,
                        "Results folder (default: results/<scenario name>-sweep)");
  sweep_cmd->add_option("--jobs", sweep->jobs, "Runs in parallel (0: one per core)")
      ->check(CLI::Range(0, 1024))
      ->capture_default_str();
  return sweep_cmd;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{
      "upright: tests balance controllers for two-wheeled self-balancing robots on a rigid-body "
      "physics model.\nSimulation results never certify a real robot: validate on hardware with a "
      "tether or spotter, at low speed first, within local rules."};
  app.set_version_flag("--version", std::string("upright ") + UPRIGHT_VERSION);
  app.require_subcommand(1);

  std::vector<std::string> check_files;
  auto* check = app.add_subcommand(
      "check", "Validate robot model and scenario files; exit 0 when all are valid");
  check->add_option("FILE", check_files, "Robot model or scenario files (.xml)")->required();

  upright::cli::DesignOptions design;
  auto* design_cmd = app.add_subcommand(
      "design", "Linear model, LQR / H-infinity / LQG / PID gains, poles, norms and margins");
  AddDesignOptions(design_cmd, &design);

  upright::cli::RunCommandOptions run;
  auto* run_cmd = AddRunCommand(&app, &run);

  upright::cli::RunCommandOptions demo;
  auto* demo_cmd = AddDemoCommand(&app, &demo);

  upright::cli::SweepCommandOptions sweep;
  auto* sweep_cmd = AddSweepCommand(&app, &sweep);

  upright::cli::EnvelopeCommandOptions envelope;
  auto* envelope_cmd = upright::cli::AddEnvelopeCommand(&app, &envelope);

  upright::cli::TuneCommandOptions tune;
  auto* tune_cmd = upright::cli::AddTuneCommand(&app, &tune);

  std::string report_dir;
  auto* report_cmd = upright::cli::AddReportCommand(&app, &report_dir);

  VerbosityFlags verbosity;
  for (CLI::App* cmd : app.get_subcommands({})) AddVerbosityFlags(cmd, &verbosity);

  if (const upright::Status known = CheckFirstWord(app, argc, argv); !known) {
    upright::cli::Log().Error(known.error());
    return upright::cli::kExitBadInput;
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : upright::cli::kExitBadInput;
  }
  upright::cli::SetLogVerbosity(verbosity.verbosity());
  if (check->parsed()) return upright::cli::RunCheck(check_files);
  if (design_cmd->parsed()) {
    design.request.input = design.input_text == "voltage" ? upright::design::InputKind::kVoltage
                                                          : upright::design::InputKind::kTorque;
    return upright::cli::RunDesign(design);
  }
  if (run_cmd->parsed()) return upright::cli::RunScenarios(run);
  if (demo_cmd->parsed()) return upright::cli::RunDemo(demo);
  if (sweep_cmd->parsed()) return upright::cli::RunSweep(sweep);
  if (envelope_cmd->parsed()) return upright::cli::RunEnvelope(envelope);
  if (tune_cmd->parsed()) return upright::cli::RunTune(tune);
  if (report_cmd->parsed()) return upright::cli::RunReport(report_dir);
  return upright::cli::kExitBadInput;
}
