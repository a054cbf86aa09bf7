#include "upright/runner/envelope/bisect.hpp"

#include <algorithm>
#include <cmath>

#include "upright/base/number_text.hpp"
#include "upright/model/check.hpp"

namespace upright::runner {

const char* ToString(BisectOutcome outcome) {
  switch (outcome) {
    case BisectOutcome::kBracketed:
      return "bracketed";
    case BisectOutcome::kSurvivesWholeRange:
      return "survives_whole_range";
    case BisectOutcome::kFailsAtBothEnds:
      return "fails_at_both_ends";
  }
  return "?";
}

bool FromString(const std::string& text, BisectOutcome* outcome) {
  for (BisectOutcome o : {BisectOutcome::kBracketed, BisectOutcome::kSurvivesWholeRange,
                          BisectOutcome::kFailsAtBothEnds}) {
    if (text == ToString(o)) {
      *outcome = o;
      return true;
    }
  }
  return false;
}

const char* ToString(HarderDirection direction) {
  switch (direction) {
    case HarderDirection::kUnknown:
      return "unknown";
    case HarderDirection::kUpward:
      return "upward";
    case HarderDirection::kDownward:
      return "downward";
  }
  return "?";
}

bool FromString(const std::string& text, HarderDirection* direction) {
  for (HarderDirection d :
       {HarderDirection::kUnknown, HarderDirection::kUpward, HarderDirection::kDownward}) {
    if (text == ToString(d)) {
      *direction = d;
      return true;
    }
  }
  return false;
}

Bisection::Bisection(double lo, double hi, double tol) : lo_(lo), hi_(hi), tol_(tol) {
  UPRIGHT_CHECK(std::isfinite(lo) && std::isfinite(hi) && lo < hi, "bisection range [%g, %g]", lo,
                hi);
  UPRIGHT_CHECK(std::isfinite(tol) && tol > 0, "bisection tolerance %g", tol);
}

std::vector<double> Bisection::Pending() const {
  if (done_) return {};
  if (!ends_probed_) return {lo_, hi_};
  return {Midpoint()};
}

double Bisection::Midpoint() const {
  return RoundToSignificant(survived_ + (failing_ - survived_) / 2, 12);
}

void Bisection::Record(const std::vector<bool>& survived) {
  const std::vector<double> asked = Pending();
  UPRIGHT_CHECK(!asked.empty() && survived.size() == asked.size(),
                "bisection: %zu verdict(s) for %zu pending value(s)", survived.size(),
                asked.size());
  result_.probes += static_cast<int>(asked.size());
  if (!ends_probed_) {
    ends_probed_ = true;
    if (survived[0] == survived[1]) {
      result_.outcome =
          survived[0] ? BisectOutcome::kSurvivesWholeRange : BisectOutcome::kFailsAtBothEnds;
      done_ = true;
      return;
    }
    result_.outcome = BisectOutcome::kBracketed;
    result_.direction = survived[0] ? HarderDirection::kUpward : HarderDirection::kDownward;
    survived_ = survived[0] ? lo_ : hi_;
    failing_ = survived[0] ? hi_ : lo_;
  } else {
    (survived[0] ? survived_ : failing_) = asked[0];
  }
  result_.survived_value = survived_;
  result_.first_failing_value = failing_;
  // Done at the tolerance, or when the bracket cannot be split any finer.
  const double mid = Midpoint();
  done_ = std::abs(failing_ - survived_) <= tol_ ||
          !(std::min(survived_, failing_) < mid && mid < std::max(survived_, failing_));
}

BisectResult Bisect(double lo, double hi, double tol, const std::function<bool(double)>& survives) {
  Bisection bisection(lo, hi, tol);
  while (!bisection.done()) {
    std::vector<bool> verdicts;
    for (const double value : bisection.Pending()) verdicts.push_back(survives(value));
    bisection.Record(verdicts);
  }
  return bisection.result();
}

}  // namespace upright::runner
