// Verdicts of a comparison with the baseline: one word per verdict in the CSV files, and one mark
// (a symbol with the word, so it reads without colour) wherever a person reads it — compare.md
// and the HTML report take both from here.
#pragma once

#include <string>
#include <string_view>

namespace upright::runner {

enum class Verdict {
  kBetter,         // the paired test rejects "no difference" and the difference counts
  kWorse,          // the same, the other way
  kSame,           // the test does not reject, or the difference is below the threshold
  kIndicative,     // too few pairs to test: the direction is a hint, not a verdict
  kNotApplicable,  // nothing to compare (a side without a value)
};

const char* ToString(Verdict verdict);  // "better", "worse", "same", "indicative", "n/a"
bool FromString(std::string_view text, Verdict* verdict);

// The mark of `verdict`: "✔ better", "✘ worse", "≈ same", "— n/a"; an indicative verdict shows
// its `direction` (better, worse or same) as a hint: "? better (hint)". `direction` is read only
// for kIndicative.
std::string VerdictMark(Verdict verdict, Verdict direction = Verdict::kNotApplicable);

// The difference of a comparison as a person reads it, 3 significant digits: "-50.0 %" of the
// baseline; below the figure's floor (diff_pct NaN) "+0.420 A (abs.)" in the figure's `unit`, in
// percentage points for a figure that is itself a percentage ("%"); "-50.0 pp" for a difference
// of rates (`rate`, diff_abs a fraction); "—" when diff_abs is NaN.
std::string DifferenceText(double diff_abs, double diff_pct, std::string_view unit, bool rate);

// One sentence saying what every mark means, for the legends of compare.md and the report.
std::string VerdictLegend();

}  // namespace upright::runner
