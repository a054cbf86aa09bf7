// Bisection against synthetic survival functions with a known threshold: the bracket found, the
// direction, the number of probes, and the honest answers when both ends agree.
#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "upright/runner/envelope/bisect.hpp"

namespace upright::runner {
namespace {

// The probe count of a bracketed bisection: both ends, then one midpoint per halving until the
// bracket is at most tol wide. From width w, k halvings leave w / 2^k, so k = ⌈log2(w / tol)⌉
// and the count is k + 2.

TEST(Bisect, FindsAThresholdWhenHarderUpward) {
  const double threshold = 3.37;
  std::vector<double> probed;
  const auto survives = [&](double v) {
    probed.push_back(v);
    return v <= threshold;
  };
  const double tol = 0.01;
  const BisectResult r = Bisect(0, 10, tol, survives);
  EXPECT_EQ(r.outcome, BisectOutcome::kBracketed);
  EXPECT_EQ(r.direction, HarderDirection::kUpward);
  EXPECT_LE(r.survived_value, threshold);
  EXPECT_GT(r.first_failing_value, threshold);
  EXPECT_GT(r.first_failing_value, r.survived_value);
  EXPECT_LE(r.first_failing_value - r.survived_value, tol);
  EXPECT_GE(r.survived_value, threshold - tol);
  // w / tol = 1000; 2^9 = 512 < 1000 <= 1024 = 2^10: 10 halvings, 12 probes.
  EXPECT_EQ(r.probes, 12);
  ASSERT_EQ(probed.size(), 12u);
  EXPECT_EQ(probed[0], 0);
  EXPECT_EQ(probed[1], 10);
  EXPECT_EQ(probed[2], 5);  // the first midpoint
}

TEST(Bisect, FindsAThresholdWhenHarderDownward) {
  // Like a friction coefficient: survives from 0.42 up.
  const double threshold = 0.42;
  int calls = 0;
  const auto survives = [&](double v) {
    ++calls;
    return v >= threshold;
  };
  const double tol = 0.004;
  const BisectResult r = Bisect(0, 1.5, tol, survives);
  EXPECT_EQ(r.outcome, BisectOutcome::kBracketed);
  EXPECT_EQ(r.direction, HarderDirection::kDownward);
  EXPECT_GE(r.survived_value, threshold);
  EXPECT_LT(r.first_failing_value, threshold);
  EXPECT_LE(r.survived_value - r.first_failing_value, tol);
  // w / tol = 375; 2^8 = 256 < 375 <= 512 = 2^9: 9 halvings, 11 probes.
  EXPECT_EQ(r.probes, 11);
  EXPECT_EQ(calls, 11);
}

TEST(Bisect, ProbeCountFollowsTheHalvingsOverManyWidths) {
  struct Case {
    double lo, hi, tol;
    int probes;  // ⌈log2((hi − lo) / tol)⌉ + 2, worked out by hand
  };
  const Case cases[] = {
      {0, 10, 3, 4},         // 10/3 = 3.3: 2 halvings
      {-5, 5, 0.1, 9},       // 100: 2^7 = 128, 7 halvings
      {40, 640, 3, 10},      // 200: 2^8 = 256, 8 halvings
      {100, 101, 1e-3, 12},  // 1000: 10 halvings
      {0, 1, 2, 2},          // the ends are already within the tolerance
  };
  for (const Case& c : cases) {
    const double threshold = c.lo + 0.3141 * (c.hi - c.lo);
    const BisectResult r = Bisect(c.lo, c.hi, c.tol, [&](double v) { return v <= threshold; });
    EXPECT_EQ(r.probes, c.probes) << c.lo << " " << c.hi << " " << c.tol;
    EXPECT_LE(r.survived_value, threshold);
    EXPECT_GT(r.first_failing_value, threshold);
    EXPECT_LE(r.first_failing_value - r.survived_value, c.tol);
  }
}

TEST(Bisect, ReportsSurvivalOfTheWholeRangeWithoutBisecting) {
  int calls = 0;
  const BisectResult r = Bisect(1, 2, 0.01, [&](double) {
    ++calls;
    return true;
  });
  EXPECT_EQ(r.outcome, BisectOutcome::kSurvivesWholeRange);
  EXPECT_EQ(r.direction, HarderDirection::kUnknown);
  EXPECT_EQ(r.probes, 2);
  EXPECT_EQ(calls, 2);
  EXPECT_TRUE(std::isnan(r.survived_value));
  EXPECT_TRUE(std::isnan(r.first_failing_value));
}

TEST(Bisect, ReportsFailureAtBothEndsWithoutBisecting) {
  const BisectResult r = Bisect(1, 2, 0.01, [](double) { return false; });
  EXPECT_EQ(r.outcome, BisectOutcome::kFailsAtBothEnds);
  EXPECT_EQ(r.direction, HarderDirection::kUnknown);
  EXPECT_EQ(r.probes, 2);
  EXPECT_TRUE(std::isnan(r.survived_value));
  EXPECT_TRUE(std::isnan(r.first_failing_value));
}

TEST(Bisection, AsksForBothEndsThenOneMidpointAtATime) {
  Bisection b(2, 6, 0.5);
  EXPECT_EQ(b.Pending(), (std::vector<double>{2, 6}));
  b.Record({false, true});  // harder downward
  EXPECT_FALSE(b.done());
  EXPECT_EQ(b.result().direction, HarderDirection::kDownward);
  EXPECT_EQ(b.Pending(), (std::vector<double>{4}));
  b.Record({true});  // bracket [2 failing, 4 survived]
  EXPECT_EQ(b.Pending(), (std::vector<double>{3}));
  b.Record({false});  // [3, 4]
  EXPECT_EQ(b.Pending(), (std::vector<double>{3.5}));
  b.Record({true});  // [3, 3.5]: 0.5 wide, done
  EXPECT_TRUE(b.done());
  EXPECT_TRUE(b.Pending().empty());
  EXPECT_EQ(b.result().survived_value, 3.5);
  EXPECT_EQ(b.result().first_failing_value, 3);
  EXPECT_EQ(b.result().probes, 5);
}

TEST(Bisect, NamesRoundTrip) {
  for (BisectOutcome o : {BisectOutcome::kBracketed, BisectOutcome::kSurvivesWholeRange,
                          BisectOutcome::kFailsAtBothEnds}) {
    BisectOutcome back = BisectOutcome::kBracketed;
    ASSERT_TRUE(FromString(ToString(o), &back));
    EXPECT_EQ(back, o);
  }
  for (HarderDirection d :
       {HarderDirection::kUnknown, HarderDirection::kUpward, HarderDirection::kDownward}) {
    HarderDirection back = HarderDirection::kUnknown;
    ASSERT_TRUE(FromString(ToString(d), &back));
    EXPECT_EQ(back, d);
  }
  BisectOutcome o;
  EXPECT_FALSE(FromString("bracket", &o));
}

}  // namespace
}  // namespace upright::runner
