// Wilson score interval and linear-interpolation percentiles.
#include "upright/runner/common/sample_statistics.hpp"

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
  UPRIGHT_CHECK(percent >= 0 && percent <= 100, "Percentile at %g %%, must be in [0, 100]",
                percent);
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

}  // namespace upright::runner
