// Bisection over a survival predicate on [lo, hi]: survival verdicts at probe values in, the last
// value survived and the first value failed (with the direction in which the parameter gets
// harder) out. Generic: it knows nothing of robots; the envelope feeds it probe runs.
#pragma once

#include <functional>
#include <limits>
#include <string>
#include <vector>

namespace upright::runner {

// What bisection found.
enum class BisectOutcome {
  kBracketed,           // one end survived, the other failed: bisected down to the tolerance
  kSurvivesWholeRange,  // both ends survived: no bisection
  kFailsAtBothEnds,     // both ends failed: no bisection
};

// Which way the parameter gets harder to survive.
enum class HarderDirection {
  kUnknown,   // both ends gave the same verdict
  kUpward,    // lo survived, hi failed: the answer is the largest value survived
  kDownward,  // hi survived, lo failed: the answer is the smallest value survived
};

const char* ToString(BisectOutcome outcome);  // "bracketed", "survives_whole_range", ...
bool FromString(const std::string& text, BisectOutcome* outcome);
const char* ToString(HarderDirection direction);  // "unknown", "upward", "downward"
bool FromString(const std::string& text, HarderDirection* direction);

struct BisectResult {
  BisectOutcome outcome = BisectOutcome::kFailsAtBothEnds;
  HarderDirection direction = HarderDirection::kUnknown;
  // kBracketed: the final bracket, |survived_value − first_failing_value| ≤ tol; otherwise NaN.
  double survived_value = std::numeric_limits<double>::quiet_NaN();
  double first_failing_value = std::numeric_limits<double>::quiet_NaN();
  int probes = 0;  // predicate evaluations, both ends included
};

// Bisection as a state machine, so that a caller can run many bisections side by side and
// evaluate their probes together: ask Pending() for the values to probe, hand their verdicts to
// Record(), until done().
//
// Survival is assumed monotone in the parameter: every value on the easy side of the threshold
// survives, every value on the hard side fails. A non-monotone response (a window of failure
// inside the range, or survival that comes and goes) is not detected; the bracket found is then
// one of its edges, and both-ends verdicts hide anything in between.
//
// Probe count: the two ends, then while the bracket is wider than tol, one midpoint, halving it.
// From a width w = hi − lo that takes k = ⌈log2(w / tol)⌉ halvings (0 when w ≤ tol; the rounding
// of midpoints to 12 significant digits matters only when w / tol is within about 1e-11 of a
// power of two), so a bracketed result used k + 2 probes; the other outcomes used 2.
class Bisection {
 public:
  // lo < hi and tol > 0, all finite (checked: callers validate user input first).
  Bisection(double lo, double hi, double tol);

  bool done() const { return done_; }
  // The values to probe next: {lo, hi} at first, then one midpoint at a time (rounded to 12
  // significant digits); empty when done.
  std::vector<double> Pending() const;
  // The verdicts for the values Pending() returned, in the same order.
  void Record(const std::vector<bool>& survived);
  // The answer so far; final once done().
  const BisectResult& result() const { return result_; }

 private:
  // The middle of the current bracket, rounded to 12 significant digits so that a probe value
  // prints and reads back exactly.
  double Midpoint() const;

  double lo_, hi_, tol_;
  bool ends_probed_ = false;
  bool done_ = false;
  double survived_ = 0, failing_ = 0;  // the current bracket once the ends are probed
  BisectResult result_;
};

// Runs a whole bisection with `survives` as the predicate, one probe at a time.
BisectResult Bisect(double lo, double hi, double tol, const std::function<bool(double)>& survives);

}  // namespace upright::runner
