#include "upright/runner/tables/verdict.hpp"

#include <cmath>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"

namespace upright::runner {

const char* ToString(Verdict verdict) {
  switch (verdict) {
    case Verdict::kBetter:
      return "better";
    case Verdict::kWorse:
      return "worse";
    case Verdict::kSame:
      return "same";
    case Verdict::kIndicative:
      return "indicative";
    case Verdict::kNotApplicable:
      break;
  }
  return "n/a";
}

bool FromString(std::string_view text, Verdict* verdict) {
  for (const Verdict v : {Verdict::kBetter, Verdict::kWorse, Verdict::kSame, Verdict::kIndicative,
                          Verdict::kNotApplicable}) {
    if (text == ToString(v)) {
      *verdict = v;
      return true;
    }
  }
  return false;
}

std::string VerdictMark(Verdict verdict, Verdict direction) {
  switch (verdict) {
    case Verdict::kBetter:
      return "✔ better";
    case Verdict::kWorse:
      return "✘ worse";
    case Verdict::kSame:
      return "≈ same";
    case Verdict::kIndicative: {
      const bool known = direction == Verdict::kBetter || direction == Verdict::kWorse ||
                         direction == Verdict::kSame;
      return std::string("? ") + (known ? ToString(direction) : "unknown") + " (hint)";
    }
    case Verdict::kNotApplicable:
      break;
  }
  return "— n/a";
}

namespace {

// "+1.50" from 3 significant digits, a sign on every non-zero value.
std::string Signed(double value) {
  std::string text = ReadableText(value, NanAs::kDash);
  if (value > 0) text.insert(text.begin(), '+');
  return text;
}

}  // namespace

std::string DifferenceText(double diff_abs, double diff_pct, std::string_view unit, bool rate) {
  if (std::isnan(diff_abs)) return "—";
  if (rate) return Signed(diff_abs * 100) + " pp";
  if (!std::isnan(diff_pct)) return Signed(diff_pct) + " %";
  // A difference of percentages is in percentage points.
  const std::string_view shown = unit == "%" ? std::string_view("pp") : unit;
  std::string text = Signed(diff_abs);
  if (!shown.empty()) text.append(" ").append(shown);
  return text + " (abs.)";
}

std::string VerdictLegend() {
  return "✔ better and ✘ worse: the paired test rejects \"no difference\" at 5 % and the "
         "difference counts; ≈ same: it does not, or the difference is too small to count; "
         "? … (hint): too few pairs to test, or seeds with a value on one side only against the "
         "verdict, the direction of the difference only; — n/a: "
         "nothing to compare";
}

}  // namespace upright::runner
