#include "upright/runner/tables/played_run.hpp"

namespace upright::runner {

bool WasPlayed(const RunResult& run) {
  const RunStatus status = run.metrics.status;
  return status != RunStatus::kNotRun && status != RunStatus::kSetupFailed && run.steps > 0;
}

}  // namespace upright::runner
