#include "spread_text.hpp"

#include <cmath>

#include "upright/runner/text_format.hpp"

namespace upright::runner::internal {

SpreadKind SpreadFor(std::size_t seeds) {
  return seeds <= kRangeUpToSeeds ? SpreadKind::kRange : SpreadKind::kSd;
}

const char* SpreadName(SpreadKind kind) {
  return kind == SpreadKind::kRange ? "min–max" : "± standard deviation";
}

std::string MeanWithSpread(const FigureStats& stats, SpreadKind kind, double scale) {
  if (stats.values == 0) return "—";
  std::string text = FormatReadable(stats.mean * scale);
  // Values alike at the digits shown have no spread to show.
  const std::string min = FormatReadable(stats.min * scale);
  const std::string max = FormatReadable(stats.max * scale);
  const bool spread = !std::isnan(stats.min) && !std::isnan(stats.max) && min != max;
  if (stats.values >= 2 && spread) {
    if (kind == SpreadKind::kRange) {
      text += " (" + min + "–" + max + ")";
    } else if (!std::isnan(stats.sd)) {
      text += " ± " + FormatReadable(stats.sd * scale);
    }
  }
  if (stats.values < stats.runs) {
    text += " [" + std::to_string(stats.values) + " of " + std::to_string(stats.runs) + "]";
  }
  return text;
}

const char* SkippedNote() {
  return "[k of n]: the mean of the k runs with a value out of the n runs; the others were not "
         "played (set-up failed, not run, or a fault before the first step) or have no value "
         "there (a settling time when the run did not settle or fell, a fall time when it did "
         "not fall)";
}

}  // namespace upright::runner::internal
