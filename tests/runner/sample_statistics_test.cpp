// Sweep statistics: the Wilson score interval against published values and the closed form, and
// the percentile against NumPy (the exact McNemar test is checked in paired_tests_test.cpp).
#include "upright/runner/common/sample_statistics.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

namespace upright::runner {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

// 95 % Wilson score interval (Wilson 1927) for 8 of 10: [0.490, 0.943], to the 3 decimals
// tabulated (from memory of published examples; the closed-form test below agrees).
TEST(WilsonInterval, MatchesThePublishedEightOfTen) {
  const Interval interval = WilsonInterval(8, 10);
  EXPECT_NEAR(interval.lo, 0.490, 0.0005);
  EXPECT_NEAR(interval.hi, 0.943, 0.0005);
}

// Newcombe (1998), "Two-sided confidence intervals for the single proportion: comparison of
// seven methods", Stat. Med. 17:857–872, score method without continuity correction, examples
// 81/263, 15/148, 0/20, 1/29, given to 4 decimals (from memory; they agree with the closed form
// values in the next test to the digits shown).
TEST(WilsonInterval, MatchesNewcombesExamples) {
  struct Case {
    std::size_t k, n;
    double lo, hi;
  };
  for (const Case& c : {Case{81, 263, 0.2553, 0.3662}, Case{15, 148, 0.0624, 0.1605},
                        Case{0, 20, 0.0000, 0.1611}, Case{1, 29, 0.0061, 0.1718}}) {
    const Interval interval = WilsonInterval(c.k, c.n);
    EXPECT_NEAR(interval.lo, c.lo, 0.00005) << c.k << "/" << c.n;
    EXPECT_NEAR(interval.hi, c.hi, 0.00005) << c.k << "/" << c.n;
  }
}

// The closed form evaluated in double precision with SciPy's z:
//   /usr/bin/python3 -c "from scipy.stats import norm; import math
//   z=norm.ppf(0.975)  # 1.959963984540054
//   w=lambda k,n:((k/n+z*z/(2*n))/(1+z*z/n)-z*math.sqrt(k/n*(1-k/n)/n+z*z/(4*n*n))/(1+z*z/n),
//                 (k/n+z*z/(2*n))/(1+z*z/n)+z*math.sqrt(k/n*(1-k/n)/n+z*z/(4*n*n))/(1+z*z/n))
//   print([w(k,n) for k,n in [(0,10),(10,10),(50,100),(8,10)]])"
// kZ95 = 1.959964 differs from SciPy's z by 1.5e-8, which moves the ends by less than 1e-8.
TEST(WilsonInterval, MatchesTheClosedFormComputedWithScipy) {
  struct Case {
    std::size_t k, n;
    double lo, hi;
  };
  for (const Case& c :
       {Case{0, 10, 0.0, 0.2775327999}, Case{10, 10, 0.7224672001, 1.0},
        Case{50, 100, 0.4038315304, 0.5961684696}, Case{8, 10, 0.4901624715, 0.9433178485}}) {
    const Interval interval = WilsonInterval(c.k, c.n);
    EXPECT_NEAR(interval.lo, c.lo, 1e-8) << c.k << "/" << c.n;
    EXPECT_NEAR(interval.hi, c.hi, 1e-8) << c.k << "/" << c.n;
  }
}

TEST(WilsonInterval, WithoutTrialsIsTheWholeRange) {
  const Interval interval = WilsonInterval(0, 0);
  EXPECT_EQ(interval.lo, 0);
  EXPECT_EQ(interval.hi, 1);
}

TEST(WilsonInterval, NarrowsAsTrialsGrowAtTheSameRate) {
  const Interval small = WilsonInterval(9, 10), large = WilsonInterval(900, 1000);
  EXPECT_LT(large.hi - large.lo, small.hi - small.lo);
  EXPECT_LT(large.lo, 0.9);
  EXPECT_GT(large.hi, 0.9);
}

// NumPy 1.24.2, numpy.percentile's default ('linear') method:
//   /usr/bin/python3 -c "import numpy as np
//   for x in ([3.1,-2.0,7.5,0.25,4.0,11.0,5.5],[2.0],[1.0,2.0],
//             [0.3,0.1,0.2,0.9,0.5,0.7,0.4,0.8,0.6,1.0,0.05,0.15]):
//     print([float(np.percentile(x,p)) for p in (0,50,90,99,100,37.5)])"
TEST(Percentile, MatchesNumpysLinearMethod) {
  struct Case {
    std::vector<double> values;
    std::vector<double> expected;  // at 0, 50, 90, 99, 100, 37.5 %
  };
  const std::vector<Case> cases = {
      {{3.1, -2.0, 7.5, 0.25, 4.0, 11.0, 5.5}, {-2.0, 4.0, 8.900000000000002, 10.79, 11.0, 3.325}},
      {{2.0}, {2.0, 2.0, 2.0, 2.0, 2.0, 2.0}},
      {{1.0, 2.0}, {1.0, 1.5, 1.9, 1.99, 2.0, 1.375}},
      {{0.3, 0.1, 0.2, 0.9, 0.5, 0.7, 0.4, 0.8, 0.6, 1.0, 0.05, 0.15},
       {0.05, 0.45, 0.89, 0.9890000000000001, 1.0, 0.3125}},
  };
  const double percents[] = {0, 50, 90, 99, 100, 37.5};
  for (const Case& c : cases) {
    for (std::size_t i = 0; i < 6; ++i) {
      EXPECT_NEAR(Percentile(c.values, percents[i]), c.expected[i], 1e-12)
          << "p" << percents[i] << " of " << c.values.size() << " values";
    }
  }
}

TEST(Percentile, IsNanWithoutValues) {
  EXPECT_TRUE(std::isnan(Percentile(std::vector<double>{}, 50)));
}

// An unsettled run (infinity) sorts last: it decides a percentile only where it takes part.
TEST(Percentile, InfinityTakesPartOnlyAtTheTop) {
  const std::vector<double> values = {1.0, kInf, 2.0, 3.0, 4.0};
  EXPECT_EQ(Percentile(values, 50), 3.0);   // h = 2: the third smallest
  EXPECT_EQ(Percentile(values, 75), 4.0);   // h = 3 exactly
  EXPECT_EQ(Percentile(values, 90), kInf);  // between 4 and infinity
  const std::vector<double> unsettled = {kInf, kInf};
  EXPECT_EQ(Percentile(unsettled, 50), kInf);
}

// A percent outside [0, 100] (or NaN) would index past the sorted values: it is a broken caller,
// stopped by UPRIGHT_CHECK with the percent in the message, with or without values.
TEST(PercentileDeathTest, RefusesAPercentOutsideZeroToHundred) {
  const std::vector<double> values = {1.0, 2.0};
  EXPECT_EQ(Percentile(values, 0), 1.0);  // both edges are allowed
  EXPECT_EQ(Percentile(values, 100), 2.0);
  EXPECT_DEATH(Percentile(values, -0.5), "Percentile at -0\\.5 %, must be in \\[0, 100\\]");
  EXPECT_DEATH(Percentile(values, 100.5), "Percentile at 100\\.5 %, must be in \\[0, 100\\]");
  EXPECT_DEATH(Percentile(values, std::nan("")), "Percentile at -?nan %");
  EXPECT_DEATH(Percentile(std::vector<double>{}, 101), "Percentile at 101 %");
}

TEST(PercentileDeathTest, RefusesANanValue) {
  const std::vector<double> values = {1.0, std::nan(""), 2.0};
  EXPECT_DEATH(Percentile(values, 50), "Percentile over a NaN value");
}

}  // namespace
}  // namespace upright::runner
