// manifest.json of a tune: what was searched and with what — tool version, the scenario, model
// and tune files with their SHA-256, the seeds and held-out seeds, the budget, search seed,
// objective, bounds and Pareto metrics, each controller's knobs — and how long it took. The one
// file of a tune's folder that may differ between identical tunes.
#pragma once

#include <string>

#include "upright/runner/tune/tune.hpp"

namespace upright::runner::internal {

std::string TuneManifestJson(const TuneResult& result);

}  // namespace upright::runner::internal
