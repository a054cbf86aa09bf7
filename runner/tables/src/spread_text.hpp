// A figure's mean over seeds as summary.md and compare.md print it: the mean, its spread over the
// seeds (min–max when there are few seeds, the standard deviation otherwise) and how many runs it
// skipped.
#pragma once

#include <cstddef>
#include <string>

#include "batch_groups.hpp"

namespace upright::runner::internal {

// Up to this many seeds a scenario's spreads are min–max ranges; above, standard deviations.
inline constexpr std::size_t kRangeUpToSeeds = 5;

enum class SpreadKind { kRange, kSd };

// kRange for `seeds` ≤ kRangeUpToSeeds, kSd above.
SpreadKind SpreadFor(std::size_t seeds);

// "min–max" or "± standard deviation", for legends.
const char* SpreadName(SpreadKind kind);

// The mean rounded to 3 significant digits, with its spread: "3.00 (2.00–4.00)" or "3.00 ± 0.500";
// the mean alone from one value or from values alike at the 3 digits shown; "—" without values.
// Then " [2 of 3]" when it is the mean of fewer values than the group has runs. Every number is
// multiplied by `scale` first.
std::string MeanWithSpread(const FigureStats& stats, SpreadKind kind, double scale = 1);

// The line saying what "[k of n]" means, for legends.
const char* SkippedNote();

}  // namespace upright::runner::internal
