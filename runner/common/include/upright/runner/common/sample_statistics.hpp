// Statistics of a sample of runs, shared by the sweep and the report: survival counts in, a
// confidence interval for the survival rate out; figures over runs in, percentiles out. (Paired
// comparisons of two controllers live with the tables: paired_tests.hpp.) Pure functions of their
// arguments.
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

// The `percent` percentile of `values` by linear interpolation between order statistics
// (NumPy's default, 'linear'): with x sorted ascending and h = (n − 1) · percent / 100,
// x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋ + 1] − x[⌊h⌋]). +inf values sort last and give +inf where they take
// part. NaN for no values. Preconditions (UPRIGHT_CHECK): percent in [0, 100], no NaN value.
double Percentile(std::span<const double> values, double percent);

}  // namespace upright::runner
