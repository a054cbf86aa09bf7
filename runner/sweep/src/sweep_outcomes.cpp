// Survival counts and baseline pairing read off a sweep's runs.
#include <algorithm>

#include "upright/model/check.hpp"
#include "upright/runner/sweep/sweep.hpp"

namespace upright::runner {
namespace {

bool Survived(const RunResult& run) { return run.metrics.status == RunStatus::kOk; }

}  // namespace

std::size_t CountSurvived(const SweepResult& result, std::size_t controller) {
  std::size_t survived = 0;
  for (const SweepSample& sample : result.samples) {
    survived += Survived(result.run(sample.index, controller)) ? 1 : 0;
  }
  return survived;
}

std::size_t BaselineIndex(const SweepResult& result) {
  const auto& names = result.scenario.controllers;
  const auto at = std::find(names.begin(), names.end(), result.scenario.baseline);
  UPRIGHT_CHECK(at != names.end(), "the baseline '%s' is not among the controllers",
                result.scenario.baseline.c_str());
  return static_cast<std::size_t>(at - names.begin());
}

PairedCounts PairWithBaseline(const SweepResult& result, std::size_t controller) {
  const std::size_t baseline = BaselineIndex(result);
  PairedCounts counts;
  for (const SweepSample& sample : result.samples) {
    counts.Add(Survived(result.run(sample.index, baseline)),
               Survived(result.run(sample.index, controller)));
  }
  return counts;
}

}  // namespace upright::runner
