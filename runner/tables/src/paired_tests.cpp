// The exact McNemar test and the paired t-test.
#include "upright/runner/tables/paired_tests.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "upright/runner/tables/student_t.hpp"

namespace upright::runner {

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

PairedT PairedTTest(std::span<const double> differences) {
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  PairedT result;
  result.pairs = differences.size();
  result.mean_diff = kNaN;
  result.sd_diff = kNaN;
  result.t = kNaN;
  result.df = result.pairs > 0 ? static_cast<double>(result.pairs - 1) : 0;
  result.p_value = kNaN;
  if (differences.empty()) return result;
  const double n = static_cast<double>(result.pairs);
  const bool identical = std::all_of(differences.begin(), differences.end(),
                                     [&](double d) { return d == differences.front(); });
  double sum = 0;
  for (const double d : differences) sum += d;
  // Identical differences: their mean is that value exactly, not a rounded sum over n.
  result.mean_diff = identical ? differences.front() : sum / n;
  if (result.pairs < 2) return result;
  if (identical) {
    result.sd_diff = 0;
    if (result.mean_diff == 0) {
      result.p_value = 1;
    } else {
      result.t = std::copysign(std::numeric_limits<double>::infinity(), result.mean_diff);
      result.p_value = 0;
    }
    return result;
  }
  double squares = 0;
  for (const double d : differences) squares += (d - result.mean_diff) * (d - result.mean_diff);
  result.sd_diff = std::sqrt(squares / (n - 1));
  result.t = result.mean_diff / (result.sd_diff / std::sqrt(n));
  result.p_value = StudentTTwoSidedP(result.t, result.df);
  return result;
}

}  // namespace upright::runner
