// Paired tests for two controllers run on the same seeds or samples: the outcomes or the figure
// differences of the pairs in, a test statistic and a two-sided p-value out. The run tables'
// comparison and the sweeps' both use them. Pure functions of their arguments.
#pragma once

#include <cstddef>
#include <span>

namespace upright::runner {

// Two controllers run on the same samples: how their outcomes pair up.
struct PairedCounts {
  std::size_t both = 0;           // both survived
  std::size_t only_baseline = 0;  // the baseline survived, the other did not
  std::size_t only_other = 0;     // the other survived, the baseline did not
  std::size_t neither = 0;        // both fell (or failed)

  // Counts one pair by whether each side survived.
  void Add(bool baseline_survived, bool other_survived) {
    if (baseline_survived && other_survived) {
      ++both;
    } else if (baseline_survived) {
      ++only_baseline;
    } else if (other_survived) {
      ++only_other;
    } else {
      ++neither;
    }
  }
  std::size_t pairs() const { return both + only_baseline + only_other + neither; }
};

// Exact two-sided McNemar test (McNemar 1947) on the discordant pairs: under "no difference"
// only_baseline ~ Binomial(b + c, 1/2); p = min(1, 2 · P[X ≤ min(b, c)]). 1 when b + c = 0.
double McNemarExactP(const PairedCounts& counts);

// The fewest pairs with which the exact McNemar test can reach p < 0.05: with n pairs all
// discordant one way p = 2 · 2^−n, 0.0625 at n = 5 and 0.03125 at n = 6.
inline constexpr std::size_t kMcNemarMinPairs = 6;

// The paired t-test (Student 1908) on per-pair differences d_i (other − baseline).
struct PairedT {
  std::size_t pairs = 0;  // n
  double mean_diff = 0;   // d̄ = Σ d_i / n; NaN without pairs
  double sd_diff = 0;  // sample standard deviation of the d_i (n − 1 denominator); NaN if n < 2
  double t = 0;        // d̄ / (sd_diff / √n); NaN if n < 2
  double df = 0;       // n − 1
  double p_value = 0;  // two-sided, P[|T| ≥ |t|] for T ~ t(n − 1); NaN if n < 2
};

// The test on `differences` (none NaN). Identical differences have no spread: all zero give t NaN
// (undefined) and p 1 (no difference shown); all equal and non-zero give t ±inf and p 0, a
// difference present in every pair without any scatter, as SciPy's ttest_rel reports it.
PairedT PairedTTest(std::span<const double> differences);

}  // namespace upright::runner
