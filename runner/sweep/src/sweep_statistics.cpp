// Wilson score interval, linear-interpolation percentiles and the exact McNemar test.
#include "upright/runner/sweep_statistics.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

#include "upright/model/check.hpp"

namespace upright::runner {

Interval WilsonInterval(std::size_t successes, std::size_t trials, double z) {
  if (trials == 0) return {0, 1};
  const double n = static_cast<double>(trials);
  const double p = static_cast<double>(successes) / n;
  const double z2 = z * z;
  const double denominator = 1 + z2 / n;
  const double centre = (p + z2 / (2 * n)) / denominator;
  const double half = z * std::sqrt(p * (1 - p) / n + z2 / (4 * n * n)) / denominator;
  return {std::max(0.0, centre - half), std::min(1.0, centre + half)};
}

double Percentile(std::span<const double> values, double percent) {
  if (values.empty()) return std::numeric_limits<double>::quiet_NaN();
  std::vector<double> x(values.begin(), values.end());
  for (const double v : x) UPRIGHT_CHECK(!std::isnan(v), "Percentile over a NaN value");
  std::sort(x.begin(), x.end());
  const double h = static_cast<double>(x.size() - 1) * percent / 100;
  const double below = std::floor(h);
  const std::size_t i = static_cast<std::size_t>(below);
  const double fraction = h - below;
  if (fraction == 0 || i + 1 >= x.size()) return x[i];
  if (std::isinf(x[i + 1])) return x[i + 1];
  return x[i] + fraction * (x[i + 1] - x[i]);
}

double McNemarExactP(const PairedCounts& counts) {
  const std::size_t n = counts.only_baseline + counts.only_other;
  if (n == 0) return 1;
  const std::size_t k = std::min(counts.only_baseline, counts.only_other);
  // P[X <= k] for X ~ Binomial(n, 1/2), term by term in logarithms (n may be large).
  const double log_half_n = static_cast<double>(n) * std::log(0.5);
  const double log_n_fact = std::lgamma(static_cast<double>(n) + 1);
  double tail = 0;
  for (std::size_t j = 0; j <= k; ++j) {
    const double log_choose = log_n_fact - std::lgamma(static_cast<double>(j) + 1) -
                              std::lgamma(static_cast<double>(n - j) + 1);
    tail += std::exp(log_choose + log_half_n);
  }
  return std::min(1.0, 2 * tail);
}

}  // namespace upright::runner
