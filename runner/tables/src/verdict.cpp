#include "upright/runner/verdict.hpp"

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

std::string VerdictLegend() {
  return "✔ better and ✘ worse: the paired test rejects \"no difference\" at 5 % and the "
         "difference counts; ≈ same: it does not, or the difference is too small to count; "
         "? … (hint): too few pairs to test, the direction of the difference only; — n/a: "
         "nothing to compare";
}

}  // namespace upright::runner
