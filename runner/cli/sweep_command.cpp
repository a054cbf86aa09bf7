// `upright sweep`: a scenario file with <dispersions> in; N samples × its controllers run in
// parallel with a progress line on a terminal; sweep.csv, sweep.md and manifest.json written and
// each controller's survival printed.
#include "sweep_command.hpp"

#include "commands.hpp"
#include "load_scenario.hpp"
#include "log.hpp"
#include "progress.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/sweep/sweep.hpp"
#include "upright/runner/sweep/sweep_writer.hpp"
#include "upright_version.hpp"

namespace upright::cli {

int RunSweep(const SweepCommandOptions& options) {
  const Result<runner::Scenario> loaded = LoadScenarioForRun(options.scenario_path);
  if (!loaded) {
    Log().Error(loaded.error());
    return kExitBadInput;
  }
  const runner::Scenario& scenario = *loaded;
  if (scenario.dispersions.empty()) {
    Log().Error(options.scenario_path +
                ": the scenario declares no dispersions, so there is nothing to sample. Add, "
                "inside <scenario>:\n"
                "  <dispersions>\n"
                "    <spread param=\"robot/chassis.mass_kg\" kind=\"normal\" sd=\"1.5\"/>\n"
                "    <spread param=\"timeline/push[1].peak_N\" kind=\"uniform\" lo=\"120\" "
                "hi=\"200\"/>\n"
                "  </dispersions>\n"
                "(parameter paths and the element's rules: scenarios/README.md)");
    return kExitBadInput;
  }
  runner::SweepOptions sweep_options;
  sweep_options.samples = options.samples;
  sweep_options.seed = options.seed;
  sweep_options.jobs = options.jobs;
  if (const Status valid = sweep_options.Validate(); !valid) {
    Log().Error(valid.error());
    return kExitBadInput;
  }
  const std::string out_dir =
      options.out_dir.empty() ? "results/" + scenario.name + "-sweep" : options.out_dir;
  const std::size_t total = static_cast<std::size_t>(options.samples) * scenario.controllers.size();

  ProgressLine progress_line({.label = "upright sweep"});
  Log().Info(
      Printf("upright sweep: %s, %d sample(s) x %zu controller(s) = %zu run(s), seed %llu, into %s",
             scenario.name.c_str(), options.samples, scenario.controllers.size(), total,
             static_cast<unsigned long long>(options.seed), out_dir.c_str()));
  const Result<runner::SweepResult> swept = runner::RunSweepSamples(
      scenario, sweep_options, UPRIGHT_VERSION,
      Log().ShowsProgress() ? progress_line.Callback() : runner::ProgressFn());
  if (!swept) {
    Log().Error(options.scenario_path + ": " + swept.error() + "; nothing was run");
    return kExitFailed;
  }
  const runner::SweepResult& result = *swept;
  if (const Status written = runner::WriteSweepResults(out_dir, result); !written) {
    Log().Error(written.error());
    return kExitFailed;
  }

  const std::size_t n = result.samples.size();
  for (std::size_t c = 0; c < result.controller_count(); ++c) {
    const std::size_t k = runner::CountSurvived(result, c);
    const runner::Interval interval = runner::WilsonInterval(k, n);
    Log().Info(Printf("  %-12s survived %zu/%zu  (%s %%, 95 %% interval %s-%s %%)%s",
                      result.scenario.controllers[c].c_str(), k, n,
                      FixedText(100.0 * static_cast<double>(k) / static_cast<double>(n), 1).c_str(),
                      FixedText(100 * interval.lo, 1).c_str(),
                      FixedText(100 * interval.hi, 1).c_str(),
                      c == runner::BaselineIndex(result) ? "  baseline" : ""));
  }
  std::size_t failed_samples = 0;
  for (const auto& sample : result.samples) failed_samples += sample.error.empty() ? 0 : 1;
  if (failed_samples > 0) {
    Log().Out(LogLevel::kWarning,
              Printf("  %zu sample(s) had no acceptable draw (setup_failed rows in sweep.csv)",
                     failed_samples));
  }
  Log().Info(Printf("%s s on %d job(s); tables: %s/sweep.md, %s/sweep.csv",
                    FixedText(result.wall_s, 1).c_str(), result.jobs, out_dir.c_str(),
                    out_dir.c_str()));
  if (options.caution) Log().Caution(kCaution);
  return kExitOk;
}

}  // namespace upright::cli
