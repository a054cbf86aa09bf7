// `upright envelope`: a scenario file and a parameter path in; every controller's bisection (and
// with --vary2 a survival map) run in parallel with a progress line on a terminal; envelope.csv,
// envelope.md, envelope_map.csv and manifest.json written and each controller's envelope printed.
#include "envelope_command.hpp"

#include <algorithm>
#include <cstdio>

#include "commands.hpp"
#include "load_scenario.hpp"
#include "log.hpp"
#include "progress.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/envelope/envelope.hpp"
#include "upright/runner/envelope/envelope_writer.hpp"
#include "upright/runner/scenario/scenario_parameter.hpp"
#include "upright_version.hpp"

namespace upright::cli {
namespace {

// An option that sets a std::optional<double> when given.
void AddOptionalNumber(CLI::App* cmd, const std::string& name, std::optional<double>* target,
                       const std::string& help) {
  cmd->add_option_function<double>(
      name, [target](const double& value) { *target = value; }, help);
}

std::string Range(const runner::ParameterAxis& axis) {
  return axis.path + " from " + SignificantText(axis.lo, 6) + " to " + SignificantText(axis.hi, 6) +
         (axis.unit.empty() ? "" : " " + axis.unit);
}

}  // namespace

CLI::App* AddEnvelopeCommand(CLI::App* app, EnvelopeCommandOptions* o) {
  auto* cmd = app->add_subcommand(
      "envelope",
      "Each controller's survival envelope: the hardest value of a scenario parameter it "
      "survives on every seed, found by bisection; with --vary2, a survival map over two");
  cmd->add_option("SCENARIO", o->scenario_path, "Scenario file (.xml)")->required();
  cmd->add_option("--vary", o->vary, "Parameter path, e.g. timeline/push[1].peak_N (see below)")
      ->required();
  AddOptionalNumber(cmd, "--lo", &o->lo,
                    "Range start, in the parameter's unit (default: 0.25 x the scenario's value)");
  AddOptionalNumber(cmd, "--hi", &o->hi, "Range end (default: 4 x the scenario's value)");
  AddOptionalNumber(cmd, "--tol", &o->tol,
                    "Bisection tolerance, in the parameter's unit (default: (hi - lo) / 200)");
  cmd->add_option("--vary2", o->vary2, "A second parameter path: also a survival map over both");
  AddOptionalNumber(cmd, "--lo2", &o->lo2, "Range start of the second parameter");
  AddOptionalNumber(cmd, "--hi2", &o->hi2, "Range end of the second parameter");
  cmd->add_option("--grid", o->grid, "Map points per axis, ends included")
      ->check(CLI::Range(2, 101))
      ->capture_default_str();
  cmd->add_option("--jobs", o->jobs, "Runs in parallel (0: one per core)")
      ->check(CLI::Range(0, 1024))
      ->capture_default_str();
  cmd->add_option("--seeds", o->seed_count,
                  "Noise seeds 1..N for every probe (0: the scenario's own seeds)")
      ->check(CLI::Range(0, 100000))
      ->capture_default_str();
  cmd->add_option("--out", o->out_dir,
                  "Results folder (default: results/<scenario name>-envelope)");
  std::string footer =
      "Parameter paths read like the scenario file (an index [i] counts elements of one kind "
      "from 1, in start-time order), in the file's units:\n";
  for (const std::string& line : runner::ScenarioParameterHelp()) footer += "  " + line + "\n";
  cmd->footer(footer);
  return cmd;
}

int RunEnvelope(const EnvelopeCommandOptions& options) {
  const Result<runner::Scenario> loaded = LoadScenarioForRun(options.scenario_path);
  if (!loaded) {
    Log().Error(loaded.error());
    return kExitBadInput;
  }
  const runner::Scenario& scenario = *loaded;
  runner::EnvelopeOptions envelope_options;
  envelope_options.param = options.vary;
  envelope_options.lo = options.lo;
  envelope_options.hi = options.hi;
  envelope_options.tol = options.tol;
  envelope_options.param2 = options.vary2;
  envelope_options.lo2 = options.lo2;
  envelope_options.hi2 = options.hi2;
  envelope_options.grid = options.grid;
  envelope_options.jobs = options.jobs;
  envelope_options.seed_count = options.seed_count;
  const Result<runner::EnvelopePlan> planned = runner::PlanEnvelope(scenario, envelope_options);
  if (!planned) {
    Log().Error(options.scenario_path + ": " + planned.error() + "\n" +
                "(parameter paths: upright envelope --help; nothing was run)");
    return kExitBadInput;
  }
  const runner::EnvelopePlan& plan = *planned;
  const std::string out_dir =
      options.out_dir.empty() ? "results/" + scenario.name + "-envelope" : options.out_dir;

  ProgressLine progress_line({.label = "upright envelope"});
  Log().Info(Printf("upright envelope: %s, %s to within %s%s%s; %zu controller(s) x %zu seed(s)",
                    scenario.name.c_str(), Range(plan.axis).c_str(),
                    SignificantText(plan.tol, 6).c_str(), plan.axis.unit.empty() ? "" : " ",
                    plan.axis.unit.c_str(), scenario.controllers.size(), plan.seeds.size()));
  if (plan.axis2) {
    Log().Info(Printf("  and a %d x %d survival map over %s", plan.grid, plan.grid,
                      Range(*plan.axis2).c_str()));
  }
  Log().Info(Printf("  at most %zu run(s) into %s", plan.max_runs, out_dir.c_str()));
  const runner::EnvelopeResult result =
      runner::RunEnvelope(scenario, envelope_options, plan, UPRIGHT_VERSION,
                          Log().ShowsProgress() ? progress_line.Callback() : runner::ProgressFn());
  // The runs expected can shrink after the last one (a bisection that ended early).
  progress_line.Close();
  if (const Status written = runner::WriteEnvelopeResults(out_dir, result); !written) {
    Log().Error(written.error());
    return kExitFailed;
  }

  std::size_t width = 0;
  for (const auto& c : result.controllers) width = std::max(width, c.controller.size());
  for (const auto& c : result.controllers) {
    // A controller that could not run is the exit code's reason: shown when quiet too.
    Log().Out(c.setup_error.empty() ? LogLevel::kInfo : LogLevel::kError,
              Printf("  %-*s  %s (%d probe(s))", static_cast<int>(width), c.controller.c_str(),
                     runner::EnvelopeOutcomeText(c, plan).c_str(), c.bisect.probes));
  }
  for (const auto& m : result.maps) {
    if (!m.setup_error.empty()) {
      Log().Out(LogLevel::kError,
                "  " + m.controller + " map: some points could not run: " + m.setup_error);
    }
  }
  Log().Info(Printf("%zu run(s); %s s on %d job(s)", result.runs,
                    FixedText(result.wall_s, 1).c_str(), result.jobs));
  Log().Info("tables: " + out_dir + "/envelope.md, " + out_dir + "/envelope.csv" +
             (plan.axis2 ? ", " + out_dir + "/envelope_map.csv" : std::string()));
  if (options.caution) Log().Caution(kCaution);
  return result.any_setup_failed() ? kExitFailed : kExitOk;
}

}  // namespace upright::cli
