#include "upright/sim/random.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>

namespace upright::sim {
namespace {

constexpr int kDraws = 200000;

TEST(Random, SameSeedGivesTheSameSequence) {
  Random a(42), b(42);
  for (int i = 0; i < 1000; ++i) {
    ASSERT_EQ(a.NextU64(), b.NextU64()) << "draw " << i;
  }
  for (int i = 0; i < 1000; ++i) {
    ASSERT_EQ(a.Gaussian(), b.Gaussian()) << "Gaussian draw " << i;
  }
}

TEST(Random, DifferentSeedsGiveDifferentSequences) {
  for (std::uint64_t seed : {0ULL, 1ULL, 2ULL, 0xffffffffffffffffULL}) {
    Random a(seed), b(seed + 1);
    int equal = 0;
    for (int i = 0; i < 1000; ++i) equal += a.NextU64() == b.NextU64() ? 1 : 0;
    // Two independent 64-bit streams agree on a draw with probability 2^-64.
    EXPECT_EQ(equal, 0) << "seed " << seed;
  }
}

TEST(Random, SeedZeroIsAUsableStream) {
  Random r(0);
  int zeros = 0;
  for (int i = 0; i < 100; ++i) zeros += r.NextU64() == 0 ? 1 : 0;
  EXPECT_EQ(zeros, 0);
}

TEST(Random, UniformStaysInTheHalfOpenUnitInterval) {
  Random r(7);
  for (int i = 0; i < kDraws; ++i) {
    const double u = r.Uniform();
    ASSERT_GE(u, 0.0);
    ASSERT_LT(u, 1.0);
  }
}

TEST(Random, UniformHasMeanOneHalfAndVarianceOneTwelfth) {
  Random r(2024);
  double sum = 0, sum_sq = 0;
  for (int i = 0; i < kDraws; ++i) {
    const double u = r.Uniform();
    sum += u;
    sum_sq += (u - 0.5) * (u - 0.5);
  }
  const double n = kDraws;
  // U(0, 1): mean 1/2, variance 1/12 (probability handbook, from memory).
  // Tolerances are 5 standard errors: the mean's is √(1/12 / n) = 6.5e-4; that of the mean of
  // (u − ½)² is √((E(u − ½)⁴ − 1/144) / n) = √((1/80 − 1/144) / n) = √(1/180 / n) = 1.7e-4.
  EXPECT_NEAR(sum / n, 0.5, 5 * std::sqrt(1.0 / 12 / n));
  EXPECT_NEAR(sum_sq / n, 1.0 / 12, 5 * std::sqrt(1.0 / 180 / n));
}

TEST(Random, UniformFillsEveryTenthOfTheInterval) {
  Random r(99);
  int bins[10] = {};
  for (int i = 0; i < kDraws; ++i) ++bins[static_cast<int>(r.Uniform() * 10)];
  // Each bin count is binomial(n, 0.1): σ = √(n · 0.1 · 0.9) = 134; tolerance 5σ.
  const double sigma = std::sqrt(kDraws * 0.1 * 0.9);
  for (int b = 0; b < 10; ++b) EXPECT_NEAR(bins[b], kDraws / 10.0, 5 * sigma) << "bin " << b;
}

TEST(Random, GaussianHasMeanZeroAndVarianceOne) {
  Random r(31337);
  double sum = 0, sum_sq = 0;
  for (int i = 0; i < kDraws; ++i) {
    const double g = r.Gaussian();
    sum += g;
    sum_sq += g * g;
  }
  const double n = kDraws;
  // Standard normal: mean 0, variance 1; Var(g²) = E g⁴ − 1 = 3 − 1 = 2 (normal moments, from
  // memory). Tolerances are 5 standard errors: 5 √(1/n) = 0.011 and 5 √(2/n) = 0.016.
  EXPECT_NEAR(sum / n, 0.0, 5 * std::sqrt(1.0 / n));
  EXPECT_NEAR(sum_sq / n, 1.0, 5 * std::sqrt(2.0 / n));
}

TEST(Random, GaussianPutsTheNormalFractionsWithinOneAndTwoSigma) {
  Random r(5);
  int inside_1 = 0, inside_2 = 0;
  for (int i = 0; i < kDraws; ++i) {
    const double g = std::abs(r.Gaussian());
    inside_1 += g < 1 ? 1 : 0;
    inside_2 += g < 2 ? 1 : 0;
  }
  const double n = kDraws;
  // P(|Z| < 1) = 0.6827, P(|Z| < 2) = 0.9545 (standard normal table, from memory). A fraction's
  // standard error is √(p (1 − p) / n) (binomial); tolerance 5 standard errors.
  const double p1 = 0.6827, p2 = 0.9545;
  EXPECT_NEAR(inside_1 / n, p1, 5 * std::sqrt(p1 * (1 - p1) / n));
  EXPECT_NEAR(inside_2 / n, p2, 5 * std::sqrt(p2 * (1 - p2) / n));
}

TEST(Random, GaussianIsSymmetric) {
  Random r(11);
  int positive = 0;
  for (int i = 0; i < kDraws; ++i) positive += r.Gaussian() > 0 ? 1 : 0;
  // Binomial(n, ½): σ = √(n / 4) = 224; tolerance 5σ.
  EXPECT_NEAR(positive, kDraws / 2.0, 5 * std::sqrt(kDraws / 4.0));
}

}  // namespace
}  // namespace upright::sim
