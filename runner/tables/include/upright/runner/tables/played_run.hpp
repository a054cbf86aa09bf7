// Whether a run was played: a run that never took a physics step (not run, its set-up failed, or
// its controller faulted before the first step) has no figures, only the defaults it was born
// with. Every table prints such a run's figures as empty cells and leaves them out of its means.
#pragma once

#include "upright/runner/metrics/run_result.hpp"

namespace upright::runner {

// True when `run` took at least one physics step: its status is neither not_run nor setup_failed
// and run.steps > 0. A fall or a fault after the first step counts as played.
bool WasPlayed(const RunResult& run);

}  // namespace upright::runner
