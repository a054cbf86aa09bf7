// Statistics of a Monte Carlo sweep: survival counts in, a confidence interval for the survival
// rate, percentiles of a figure over runs, and the paired comparison of two controllers on the
// same samples out. Pure functions of their arguments.
#pragma once

#include <cstddef>
#include <span>

namespace upright::runner {

// z for a two-sided 95 % interval: the standard normal's 0.975 quantile.
inline constexpr double kZ95 = 1.959964;

struct Interval {
  double lo = 0;
  double hi = 1;
};

// Wilson score interval (Wilson 1927) for a binomial proportion from `successes` of `trials`:
// (p + z²/2n ± z √(p(1−p)/n + z²/4n²)) / (1 + z²/n), p = successes / trials. Stays within
// [0, 1] and is not empty at 0 or n successes. No trials: [0, 1].
Interval WilsonInterval(std::size_t successes, std::size_t trials, double z = kZ95);

// The `percent` percentile (0–100) of `values` by linear interpolation between order statistics
// (NumPy's default, 'linear'): with x sorted ascending and h = (n − 1) · percent / 100,
// x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋ + 1] − x[⌊h⌋]). +inf values sort last and give +inf where they take
// part. NaN for no values; the values must not be NaN (UPRIGHT_CHECK).
double Percentile(std::span<const double> values, double percent);

// Two controllers run on the same samples: how their outcomes pair up.
struct PairedCounts {
  std::size_t both = 0;           // both survived
  std::size_t only_baseline = 0;  // the baseline survived, the other did not
  std::size_t only_other = 0;     // the other survived, the baseline did not
  std::size_t neither = 0;        // both fell (or failed)
};

// Exact two-sided McNemar test (McNemar 1947) on the discordant pairs: under "no difference"
// only_baseline ~ Binomial(b + c, 1/2); p = min(1, 2 · P[X ≤ min(b, c)]). 1 when b + c = 0.
double McNemarExactP(const PairedCounts& counts);

}  // namespace upright::runner
