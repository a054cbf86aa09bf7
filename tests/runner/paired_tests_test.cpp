// The paired tests behind the comparisons: Student's t and the regularised incomplete beta
// function against SciPy, the paired t-test against SciPy's ttest_rel and at its edges (no spread,
// one pair, none), and the exact McNemar p-value against SciPy.
#include "upright/runner/tables/paired_tests.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

#include "upright/runner/tables/student_t.hpp"

namespace upright::runner {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

// SciPy 1.10.1, scipy.special.betainc (the regularised incomplete beta function):
//   /usr/bin/python3 -c "from scipy.special import betainc
//   for a,b,x in [(1,1,0.3),(2,3,0.4),(0.5,0.5,0.2),(10,0.5,0.9),(0.5,10,0.01),(30,40,0.45)]:
//     print(a,b,x,repr(betainc(a,b,x)))"
TEST(RegularisedIncompleteBeta, MatchesScipy) {
  struct Case {
    double a, b, x, expected;
  };
  for (const Case& c :
       {Case{1, 1, 0.3, 0.3}, Case{2, 3, 0.4, 0.5247999999999999},
        Case{0.5, 0.5, 0.2, 0.29516723530086664}, Case{10, 0.5, 0.9, 0.15164090963470997},
        Case{0.5, 10, 0.01, 0.3420718248432155}, Case{30, 40, 0.45, 0.6447480085585666}}) {
    EXPECT_NEAR(RegularisedIncompleteBeta(c.a, c.b, c.x), c.expected, 1e-13)
        << "a " << c.a << " b " << c.b << " x " << c.x;
  }
}

TEST(RegularisedIncompleteBeta, IsZeroAndOneAtTheEndsAndNanOutside) {
  EXPECT_EQ(RegularisedIncompleteBeta(2, 3, 0), 0);
  EXPECT_EQ(RegularisedIncompleteBeta(2, 3, 1), 1);
  EXPECT_TRUE(std::isnan(RegularisedIncompleteBeta(2, 3, 1.5)));
  EXPECT_TRUE(std::isnan(RegularisedIncompleteBeta(0, 3, 0.5)));
}

// SciPy 1.10.1, scipy.stats.t.sf:
//   /usr/bin/python3 -c "from scipy.stats import t
//   for tt,df in [(0.0,2),(1.0,1),(2.0,2),(-2.0,2),(4.302652729749464,2),(2.5,5),(10.0,3),
//                 (-0.5,7),(3.0,30),(50.0,4),(1.5,0.5),(2.0,200)]:
//     print(tt,df,repr(t.sf(tt,df)))"
TEST(StudentT, UpperTailMatchesScipy) {
  struct Case {
    double t, df, sf;
  };
  for (const Case& c :
       {Case{0.0, 2, 0.5}, Case{1.0, 1, 0.24999999999999978}, Case{2.0, 2, 0.09175170953613696},
        Case{-2.0, 2, 0.908248290463863}, Case{4.302652729749464, 2, 0.024999999999999994},
        Case{2.5, 5, 0.027245049671188102}, Case{10.0, 3, 0.0010641995292070747},
        Case{-0.5, 7, 0.6837964321553578}, Case{3.0, 30, 0.002694982032825972},
        Case{50.0, 4, 4.787226828484846e-07}, Case{1.5, 0.5, 0.2539508953240542},
        Case{2.0, 200, 0.023426593093535494}}) {
    EXPECT_NEAR(StudentTUpperTail(c.t, c.df), c.sf, 1e-13 + 1e-10 * c.sf)
        << "t " << c.t << " df " << c.df;
  }
}

TEST(StudentT, TwoSidedPIsTwiceTheTailAndReachesItsEnds) {
  EXPECT_NEAR(StudentTTwoSidedP(-2.5, 5), 2 * 0.027245049671188102, 1e-13);  // SciPy, above
  EXPECT_EQ(StudentTTwoSidedP(0, 4), 1);
  EXPECT_EQ(StudentTTwoSidedP(kInf, 4), 0);
  EXPECT_EQ(StudentTTwoSidedP(-kInf, 4), 0);
  EXPECT_TRUE(std::isnan(StudentTTwoSidedP(std::nan(""), 4)));
  EXPECT_TRUE(std::isnan(StudentTTwoSidedP(1, 0)));
}

// SciPy 1.10.1, scipy.stats.ttest_rel(controller, baseline) on fixed numbers:
//   /usr/bin/python3 -c "from scipy.stats import ttest_rel
//   for b,c in [([2.0,4.0,3.5],[1.5,3.0,3.2]),
//               ([10.0,12.5,11.0,9.0,13.5,10.5,12.0],[10.4,12.1,11.9,9.8,13.9,11.6,12.2]),
//               ([1.0,2.0,3.0,4.0,5.0,6.0,7.0,8.0,9.0,10.0,11.0,12.0],
//                [1.1,1.9,3.3,4.2,4.8,6.5,7.1,8.4,8.7,10.6,11.2,12.9])]:
//     r=ttest_rel(c,b); print(repr(r.statistic), repr(r.pvalue))"
TEST(PairedTTest, MatchesScipysTtestRel) {
  struct Case {
    std::vector<double> baseline, other;
    double t, p;
  };
  const std::vector<Case> cases = {
      {{2.0, 4.0, 3.5}, {1.5, 3.0, 3.2}, -2.8823067684915675, 0.10224159750313042},
      {{10.0, 12.5, 11.0, 9.0, 13.5, 10.5, 12.0},
       {10.4, 12.1, 11.9, 9.8, 13.9, 11.6, 12.2},
       2.54602493912652,
       0.04372425242371249},
      {{1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 10.0, 11.0, 12.0},
       {1.1, 1.9, 3.3, 4.2, 4.8, 6.5, 7.1, 8.4, 8.7, 10.6, 11.2, 12.9},
       2.2650647306788065,
       0.04469308014571461},
  };
  for (const Case& c : cases) {
    std::vector<double> differences;
    double sum = 0;
    for (std::size_t i = 0; i < c.baseline.size(); ++i) {
      differences.push_back(c.other[i] - c.baseline[i]);
      sum += differences.back();
    }
    const PairedT test = PairedTTest(differences);
    EXPECT_EQ(test.pairs, c.baseline.size());
    EXPECT_EQ(test.df, static_cast<double>(c.baseline.size() - 1));
    EXPECT_NEAR(test.mean_diff, sum / static_cast<double>(c.baseline.size()), 1e-15);
    EXPECT_NEAR(test.t, c.t, 1e-12 * std::fabs(c.t));
    EXPECT_NEAR(test.p_value, c.p, 1e-12);
  }
}

// No spread to test: identical non-zero differences are a sure difference (t infinite, p 0, as
// SciPy's ttest_rel reports them), identical zeros none (t undefined, p 1).
TEST(PairedTTest, IdenticalDifferencesAreSureOrNone) {
  const std::vector<double> same_shift = {0.1, 0.1, 0.1};
  const PairedT shifted = PairedTTest(same_shift);
  EXPECT_EQ(shifted.mean_diff, 0.1);
  EXPECT_EQ(shifted.sd_diff, 0);
  EXPECT_EQ(shifted.t, kInf);
  EXPECT_EQ(shifted.p_value, 0);
  const std::vector<double> lower = {-2.5, -2.5};
  EXPECT_EQ(PairedTTest(lower).t, -kInf);
  EXPECT_EQ(PairedTTest(lower).p_value, 0);
  const std::vector<double> zeros = {0, 0, 0, 0};
  const PairedT none = PairedTTest(zeros);
  EXPECT_EQ(none.mean_diff, 0);
  EXPECT_TRUE(std::isnan(none.t));
  EXPECT_EQ(none.p_value, 1);
}

TEST(PairedTTest, OnePairHasAMeanButNoTest) {
  const std::vector<double> one = {0.75};
  const PairedT test = PairedTTest(one);
  EXPECT_EQ(test.pairs, 1u);
  EXPECT_EQ(test.mean_diff, 0.75);
  EXPECT_TRUE(std::isnan(test.sd_diff));
  EXPECT_TRUE(std::isnan(test.t));
  EXPECT_TRUE(std::isnan(test.p_value));
  const PairedT none = PairedTTest(std::vector<double>{});
  EXPECT_EQ(none.pairs, 0u);
  EXPECT_TRUE(std::isnan(none.mean_diff));
  EXPECT_TRUE(std::isnan(none.p_value));
}

// SciPy's exact binomial test, which for p = 1/2 is the exact McNemar test:
//   /usr/bin/python3 -c "from scipy.stats import binomtest
//   for b,c in [(3,0),(0,6),(2,8),(5,5),(1,20),(40,60),(7,3)]:
//     print(b, c, binomtest(min(b,c), b+c, 0.5).pvalue)"
TEST(McNemarExactP, MatchesScipysBinomialTest) {
  struct Case {
    std::size_t b, c;
    double p;
  };
  for (const Case& k : {Case{3, 0, 0.25}, Case{0, 6, 0.03125}, Case{2, 8, 0.109375},
                        Case{5, 5, 1.0}, Case{1, 20, 2.09808349609375e-05},
                        Case{40, 60, 0.05688793364098088}, Case{7, 3, 0.34375}}) {
    PairedCounts counts;
    counts.both = 11;  // concordant pairs do not enter the test
    counts.neither = 4;
    counts.only_baseline = k.b;
    counts.only_other = k.c;
    EXPECT_NEAR(McNemarExactP(counts), k.p, 1e-12 + 1e-9 * k.p) << k.b << " vs " << k.c;
  }
}

TEST(McNemarExactP, IsOneWithoutDiscordantPairs) {
  PairedCounts counts;
  counts.both = 7;
  counts.neither = 3;
  EXPECT_EQ(McNemarExactP(counts), 1.0);
}

// kMcNemarMinPairs is the fewest pairs with which the test can reach 5 %: every pair discordant
// one way.
TEST(McNemarExactP, CanReachFivePercentFromTheStatedMinimumOfPairs) {
  PairedCounts below, at;
  below.only_other = kMcNemarMinPairs - 1;
  at.only_other = kMcNemarMinPairs;
  EXPECT_GE(McNemarExactP(below), 0.05);
  EXPECT_LT(McNemarExactP(at), 0.05);
}

}  // namespace
}  // namespace upright::runner
