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

// One sentence saying what every mark means, for the legends of compare.md and the report.
std::string VerdictLegend();

}  // namespace upright::runner
