// The generator against the published reference algorithms (known answers), then its
// determinism and the moments and fractions of its uniform and Gaussian draws.
#include "upright/sim/random.hpp"

#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <cstdint>

namespace upright::sim {
namespace {

constexpr int kDraws = 200000;

// Known answers. The reference algorithms are Vigna's splitmix64.c and Blackman and Vigna's
// xoshiro256plusplus.c (public domain, prng.di.unimi.it); their published next() functions are:
//
//   uint64_t next(void) {                       /* splitmix64.c, static uint64_t x */
//     uint64_t z = (x += 0x9e3779b97f4a7c15);
//     z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9;
//     z = (z ^ (z >> 27)) * 0x94d049bb133111eb;
//     return z ^ (z >> 31);
//   }
//   static inline uint64_t rotl(const uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
//   uint64_t next(void) {                       /* xoshiro256plusplus.c, static uint64_t s[4] */
//     const uint64_t result = rotl(s[0] + s[3], 23) + s[0];
//     const uint64_t t = s[1] << 17;
//     s[2] ^= s[0]; s[3] ^= s[1]; s[1] ^= s[2]; s[0] ^= s[3];
//     s[2] ^= t;
//     s[3] = rotl(s[3], 45);
//     return result;
//   }
//
// The expected outputs below are the widely reproduced first outputs of each (from memory), and
// they are what those two functions print when compiled on their own as C99 (gcc 12, -O2).

TEST(Random, SplitMix64MatchesTheReferenceFromSeedZero) {
  // splitmix64 with x = 0: e220a8397b1dcdaf, 6e789e6aa1b965f4, 06c45d188009454f, f88bb8a8724c81ec
  // (from memory; the reference C above prints the same).
  const std::uint64_t expected[] = {0xe220a8397b1dcdafULL, 0x6e789e6aa1b965f4ULL,
                                    0x06c45d188009454fULL, 0xf88bb8a8724c81ecULL};
  std::uint64_t state = 0;
  for (const std::uint64_t e : expected) EXPECT_EQ(SplitMix64(&state), e);
  EXPECT_EQ(state, 4 * 0x9e3779b97f4a7c15ULL);  // the state only counts by the increment
}

TEST(Random, Xoshiro256PlusPlusMatchesTheReferenceFromStateOneTwoThreeFour) {
  // xoshiro256++ with s = {1, 2, 3, 4}: the first ten outputs (from memory; the reference C above
  // prints the same). The first two by hand: rotl(1 + 4, 23) + 1 = 5·2²³ + 1 = 41943041; the
  // step leaves s = {7, 0, 262146, 6·2⁴⁵}, and rotl(7 + 6·2⁴⁵, 23) + 7 = 7·2²³ + 3·2⁵ + 7 =
  // 58720359.
  const std::uint64_t expected[] = {41943041ULL,
                                    58720359ULL,
                                    3588806011781223ULL,
                                    3591011842654386ULL,
                                    9228616714210784205ULL,
                                    9973669472204895162ULL,
                                    14011001112246962877ULL,
                                    12406186145184390807ULL,
                                    15849039046786891736ULL,
                                    10450023813501588000ULL};
  Random r = Random::FromState({1, 2, 3, 4});
  for (int i = 0; i < 10; ++i) EXPECT_EQ(r.NextU64(), expected[i]) << "output " << i;
}

TEST(Random, SeedingFillsTheStateWithFourSplitMix64Outputs) {
  for (const std::uint64_t seed : {0ULL, 42ULL, 0xffffffffffffffffULL}) {
    std::uint64_t x = seed;
    std::array<std::uint64_t, 4> state;
    for (auto& s : state) s = SplitMix64(&x);
    Random seeded(seed);
    Random direct = Random::FromState(state);
    for (int i = 0; i < 100; ++i) ASSERT_EQ(seeded.NextU64(), direct.NextU64()) << "seed " << seed;
  }
}

TEST(RandomDeathTest, RefusesTheAllZeroState) {
  // xoshiro256++ stays at zero forever from the all-zero state (every step XORs and shifts zeros).
  EXPECT_DEATH(Random::FromState({0, 0, 0, 0}), "no all-zero state");
}

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
