// The held-out replays of a tune as batches, so the usual tables can rank them: every tuned
// controller's default (or tuned) setting on each scenario's held-out seeds.
#pragma once

#include "upright/runner/metrics/run_result.hpp"
#include "upright/runner/tune/tune.hpp"

namespace upright::runner::internal {

// The held-out runs of the default settings (`tuned` false) or the tuned ones: scenario by
// scenario, controller by controller in the scenario's order, seed by seed. A scenario's baseline
// stays its own when that controller was tuned, else the first tuned controller there. Empty runs
// without held-out seeds or without a tuned controller.
BatchResult HeldOutBatch(const TuneResult& result, bool tuned);

}  // namespace upright::runner::internal
