#include "spread_text.hpp"

#include <cmath>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"

namespace upright::runner::internal {

SpreadKind SpreadFor(std::size_t seeds) {
  return seeds <= kRangeUpToSeeds ? SpreadKind::kRange : SpreadKind::kSd;
}

const char* SpreadName(SpreadKind kind) {
  return kind == SpreadKind::kRange ? "min–max" : "± standard deviation";
}

std::string MeanWithSpread(const FigureStats& stats, SpreadKind kind, double scale) {
  if (stats.values == 0) return "—";
  std::string text = ReadableText(stats.mean * scale, NanAs::kDash);
  // Values alike at the digits shown have no spread to show.
  const std::string min = ReadableText(stats.min * scale, NanAs::kDash);
  const std::string max = ReadableText(stats.max * scale, NanAs::kDash);
  const bool spread = !std::isnan(stats.min) && !std::isnan(stats.max) && min != max;
  if (stats.values >= 2 && spread) {
    if (kind == SpreadKind::kRange) {
      text += " (" + min + "–" + max + ")";
    } else if (!std::isnan(stats.sd)) {
      text += " ± " + ReadableText(stats.sd * scale, NanAs::kDash);
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
