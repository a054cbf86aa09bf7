#include "decimate.hpp"

#include <cmath>
#include <utility>

#include "upright/model/check.hpp"

namespace upright::runner::internal {

std::vector<std::size_t> MinMaxDecimate(const std::vector<double>& values, std::size_t max_points) {
  UPRIGHT_CHECK(max_points >= 4, "max_points = %zu, must be >= 4", max_points);
  const std::size_t n = values.size();
  std::vector<std::size_t> keep;
  if (n <= max_points) {
    keep.reserve(n);
    for (std::size_t i = 0; i < n; ++i) keep.push_back(i);
    return keep;
  }
  const std::size_t buckets = max_points / 2;
  keep.reserve(max_points + 2);
  keep.push_back(0);
  for (std::size_t b = 0; b < buckets; ++b) {
    // Bucket b holds [n·b/buckets, n·(b+1)/buckets): every index once, sizes differing by one.
    const std::size_t begin = n * b / buckets;
    const std::size_t end = n * (b + 1) / buckets;
    std::size_t lo = end, hi = end, gap = end;
    for (std::size_t i = begin; i < end; ++i) {
      const double v = values[i];
      if (std::isnan(v)) {
        if (gap == end) gap = i;
        continue;
      }
      if (lo == end || v < values[lo]) lo = i;
      if (hi == end || v > values[hi]) hi = i;
    }
    std::size_t picks[3] = {lo, hi, gap};
    // Three at most; a tiny sort keeps them in index order.
    for (int a = 0; a < 3; ++a) {
      for (int c = a + 1; c < 3; ++c) {
        if (picks[c] < picks[a]) std::swap(picks[a], picks[c]);
      }
    }
    for (const std::size_t i : picks) {
      if (i == end || i <= keep.back()) continue;
      keep.push_back(i);
    }
  }
  if (keep.back() != n - 1) keep.push_back(n - 1);
  return keep;
}

}  // namespace upright::runner::internal
