// `upright sweep`: a scenario file with <dispersions> in; N samples × its controllers run in
// parallel with a progress line on a terminal; sweep.csv, sweep.md and manifest.json written and
// each controller's survival printed.
#include "sweep_command.hpp"

#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <iostream>

#include "commands.hpp"
#include "upright/runner/scenario_file.hpp"
#include "upright/runner/sweep.hpp"
#include "upright/runner/sweep_writer.hpp"
#include "upright_version.hpp"

namespace upright::cli {
namespace {

std::string Clock(double seconds) {
  const long s = std::lround(std::max(0.0, seconds));
  char text[32];
  std::snprintf(text, sizeof text, "%ld:%02ld", s / 60, s % 60);
  return text;
}

}  // namespace

int RunSweep(const SweepCommandOptions& options) {
  runner::ScenarioLoadResult loaded = runner::LoadScenarioFile(options.scenario_path);
  if (!loaded.ok()) {
    for (const auto& e : loaded.errors) std::cerr << e.ToString() << "\n";
    std::cerr << options.scenario_path << ": invalid; nothing was run\n";
    return kExitBadInput;
  }
  const runner::Scenario& scenario = loaded.scenario;
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
  std::string error;
  if (!sweep_options.IsValid(&error)) {
    std::cerr << error << "\n";
    return kExitBadInput;
  }
  const std::string out_dir =
      options.out_dir.empty() ? "results/" + scenario.name + "-sweep" : options.out_dir;
  const std::size_t total = static_cast<std::size_t>(options.samples) * scenario.controllers.size();

  const bool terminal = isatty(STDERR_FILENO) != 0;
  const auto start = std::chrono::steady_clock::now();
  std::printf(
      "upright sweep: %s, %d sample(s) x %zu controller(s) = %zu run(s), seed %llu, into %s\n",
      scenario.name.c_str(), options.samples, scenario.controllers.size(), total,
      static_cast<unsigned long long>(options.seed), out_dir.c_str());
  std::fflush(stdout);
  const runner::ProgressFn progress = [&](std::size_t done, std::size_t all) {
    if (!terminal) return;
    const double elapsed =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    const double eta = elapsed / static_cast<double>(done) * static_cast<double>(all - done);
    std::fprintf(stderr, "\r  %zu/%zu runs  %3.0f %%  elapsed %s  left ~%s   ", done, all,
                 100.0 * static_cast<double>(done) / static_cast<double>(all),
                 Clock(elapsed).c_str(), Clock(eta).c_str());
    if (done == all) std::fputc('\n', stderr);
  };
  const runner::SweepResult result =
      runner::RunSweepSamples(scenario, sweep_options, UPRIGHT_VERSION, progress);
  if (!result.module_error.empty()) {
    std::cerr << options.scenario_path << ": " << result.module_error << "; nothing was run\n";
    return kExitFailed;
  }
  if (!runner::WriteSweepResults(out_dir, result, &error)) {
    std::cerr << error << "\n";
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
  std::printf(
      "Simulation only: validate on hardware with a tether or spotter, at low speed first, "
      "within local rules.\n");
  return kExitOk;
}

}  // namespace upright::cli
