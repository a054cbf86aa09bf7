// `upright sweep`: a scenario file with <dispersions> in; N samples × its controllers run in
// parallel with a progress line on a terminal; sweep.csv, sweep.md and manifest.json written and
// each controller's survival printed.
#include "sweep_command.hpp"

#include <cstdio>
#include <iostream>

#include "commands.hpp"
#include "load_scenario.hpp"
#include "progress.hpp"
#include "upright/runner/sweep.hpp"
#include "upright/runner/sweep_writer.hpp"
#include "upright_version.hpp"

namespace upright::cli {

int RunSweep(const SweepCommandOptions& options) {
  const Result<runner::Scenario> loaded = LoadScenarioForRun(options.scenario_path);
  if (!loaded) {
    std::cerr << loaded.error() << "\n";
    return kExitBadInput;
  }
  const runner::Scenario& scenario = *loaded;
  if (scenario.dispersions.empty()) {
    std::cerr << options.scenario_path << ": the scenario declares no dispersions, so there is "
              << "nothing to sample. Add, inside <scenario>:\n"
              << "  <dispersions>\n"
              << "    <spread param=\"robot/chassis.mass_kg\" kind=\"normal\" sd=\"1.5\"/>\n"
              << "    <spread param=\"timeline/push[1].peak_N\" kind=\"uniform\" lo=\"120\" "
                 "hi=\"200\"/>\n"
              << "  </dispersions>\n"
              << "(parameter paths and the element's rules: scenarios/README.md)\n";
    return kExitBadInput;
  }
  runner::SweepOptions sweep_options;
  sweep_options.samples = options.samples;
  sweep_options.seed = options.seed;
  sweep_options.jobs = options.jobs;
  if (const Status valid = sweep_options.Validate(); !valid) {
    std::cerr << valid.error() << "\n";
    return kExitBadInput;
  }
  const std::string out_dir =
      options.out_dir.empty() ? "results/" + scenario.name + "-sweep" : options.out_dir;
  const std::size_t total = static_cast<std::size_t>(options.samples) * scenario.controllers.size();

  ProgressLine progress_line({.label = "upright sweep"});
  std::printf(
      "upright sweep: %s, %d sample(s) x %zu controller(s) = %zu run(s), seed %llu, into %s\n",
      scenario.name.c_str(), options.samples, scenario.controllers.size(), total,
      static_cast<unsigned long long>(options.seed), out_dir.c_str());
  std::fflush(stdout);
  const Result<runner::SweepResult> swept =
      runner::RunSweepSamples(scenario, sweep_options, UPRIGHT_VERSION, progress_line.Callback());
  if (!swept) {
    std::cerr << options.scenario_path << ": " << swept.error() << "; nothing was run\n";
    return kExitFailed;
  }
  const runner::SweepResult& result = *swept;
  if (const Status written = runner::WriteSweepResults(out_dir, result); !written) {
    std::cerr << written.error() << "\n";
    return kExitFailed;
  }

  const std::size_t n = result.samples.size();
  for (std::size_t c = 0; c < result.controller_count(); ++c) {
    const std::size_t k = runner::CountSurvived(result, c);
    const runner::Interval interval = runner::WilsonInterval(k, n);
    std::printf("  %-12s survived %zu/%zu  (%.1f %%, 95 %% interval %.1f-%.1f %%)%s\n",
                result.scenario.controllers[c].c_str(), k, n,
                100.0 * static_cast<double>(k) / static_cast<double>(n), 100 * interval.lo,
                100 * interval.hi, c == runner::BaselineIndex(result) ? "  baseline" : "");
  }
  std::size_t failed_samples = 0;
  for (const auto& sample : result.samples) failed_samples += sample.error.empty() ? 0 : 1;
  if (failed_samples > 0) {
    std::printf("  %zu sample(s) had no acceptable draw (setup_failed rows in sweep.csv)\n",
                failed_samples);
  }
  std::printf("%.1f s on %d job(s); tables: %s/sweep.md, %s/sweep.csv\n", result.wall_s,
              result.jobs, out_dir.c_str(), out_dir.c_str());
  if (options.caution) std::printf("%s\n", kCaution);
  return kExitOk;
}

}  // namespace upright::cli
