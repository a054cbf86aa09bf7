// Two objectives at once: the non-dominated filter on a hand-made set (ties, duplicates, a point
// that misses a bound or falls while it would dominate), an evaluation read on two metrics, the
// metric names a front accepts, and the Pareto search on Schaffer's problem, whose front is known.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>

#include "succeeded.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tune/pareto.hpp"
#include "upright/runner/tune/pareto_search.hpp"

namespace upright::runner {
namespace {

bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

TEST(ParetoFront, KeepsTheNonDominatedEligiblePointsSortedByTheFirst) {
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  const std::vector<ParetoScore> points = {
      {1, 5, {-1}, 0},        // 0: on the front
      {2, 3, {0}, 0},         // 1: on the front (a bound met exactly)
      {2, 3, {-2}, 0},        // 2: a duplicate of 1: the first is kept
      {2, 4, {-1}, 0},        // 3: dominated by 1 (equal first, worse second)
      {0.5, 0.5, {0.1}, 0},   // 4: would dominate all, but misses its bound
      {0.1, 0.1, {-1}, 1.5},  // 5: would dominate all, but a run fell
      {4, 1, {-1}, 0},        // 6: on the front
      {3, 3, {-1}, 0},        // 7: dominated by 1
      {1, 5, {-1}, 0},        // 8: a duplicate of 0
      {5, 1, {-1}, 0},        // 9: dominated by 6 (equal second, worse first)
      {kNaN, 0, {-1}, 0},     // 10: a figure undefined
  };
  EXPECT_EQ(NonDominated(points), (std::vector<std::size_t>{0, 1, 6}));
  EXPECT_TRUE(Dominates(points[1], points[3]));
  EXPECT_FALSE(Dominates(points[1], points[2]));  // equal: neither dominates
  EXPECT_FALSE(Dominates(points[0], points[6]));  // a trade-off
  EXPECT_TRUE(NonDominated({}).empty());
  // With no eligible point there is no front.
  EXPECT_TRUE(NonDominated(std::vector<ParetoScore>{points[4], points[5]}).empty());
}

TEST(ParetoFront, ReadsAnEvaluationOnTwoMetrics) {
  const std::array<std::size_t, 2> columns = ParetoColumns({"max_tilt_deg", "energy_J"});
  const auto all = MetricColumns();
  EXPECT_EQ(std::string(all[columns[0]].name), "max_tilt_deg");
  EXPECT_EQ(std::string(all[columns[1]].name), "energy_J");
  EvaluationScore score;
  score.runs = score.survived = 3;
  score.mean_metrics.assign(all.size(), 1.0);
  score.mean_metrics[columns[0]] = 8.5;
  score.mean_metrics[columns[1]] = 24;
  score.violation = {-0.5};
  ParetoScore point = ParetoScoreOf(score, columns);
  EXPECT_EQ(point.first, 8.5);
  EXPECT_EQ(point.second, 24);
  EXPECT_EQ(point.constraints, std::vector<double>{-0.5});
  EXPECT_EQ(point.out, 0);
  EXPECT_TRUE(point.Eligible());
  // A fall: out is the objective in units of the fall penalty (1 + the share of time lost).
  score.survived = 2;
  score.objective = 1.25 * kFallPenalty;
  point = ParetoScoreOf(score, columns);
  EXPECT_DOUBLE_EQ(point.out, 1.25);
  EXPECT_FALSE(point.Eligible());
  // Every run survived but a figure is undefined.
  score.survived = 3;
  score.mean_metrics[columns[1]] = std::numeric_limits<double>::quiet_NaN();
  point = ParetoScoreOf(score, columns);
  EXPECT_EQ(point.out, 1);
}

TEST(ParetoFront, AcceptsTwoDifferentLowerIsBetterMetrics) {
  EXPECT_TRUE(Succeeded(ValidateParetoMetrics({})));
  EXPECT_TRUE(Succeeded(ValidateParetoMetrics({"max_tilt_deg", "energy_J"})));
  const std::string one = FailureOf(ValidateParetoMetrics({"max_tilt_deg"}));
  EXPECT_TRUE(Contains(one, "--pareto) = max_tilt_deg: give two metrics")) << one;
  const std::string unknown = FailureOf(ValidateParetoMetrics({"max_tilt_deg", "speed"}));
  EXPECT_TRUE(Contains(unknown, "speed is no metric a front can trade")) << unknown;
  EXPECT_TRUE(Contains(unknown, "accepted: max_tilt_deg, max_drift_m, ")) << unknown;
  // The end time and the fall time say nothing of a setting on which every run survives.
  EXPECT_FALSE(Contains(unknown, "end_time_s")) << unknown;
  EXPECT_FALSE(ValidateParetoMetrics({"end_time_s", "energy_J"}));
  EXPECT_TRUE(Contains(FailureOf(ValidateParetoMetrics({"energy_J", "energy_J"})), "must differ"));
}

// Schaffer's first problem: f1 = x², f2 = (x − 2)², whose Pareto-optimal set is x ∈ [0, 2]
// (J. D. Schaffer, "Multiple objective optimization with vector evaluated genetic algorithms",
// Proceedings of the First International Conference on Genetic Algorithms, 1985; from memory).
// Here on x ∈ [−5, 5], x = 10u − 5; `bound`: a constraint x <= bound when finite.
ParetoSearchResult Schaffer(int evaluations, double bound, std::uint64_t seed = 1) {
  ParetoSearchOptions options;
  options.search.dimensions = 1;
  options.search.evaluations = evaluations;
  options.search.seed = seed;
  options.search.constraints = std::isfinite(bound) ? 1 : 0;
  return ParetoSearch(options, [&](const std::vector<std::vector<double>>& points) {
    std::vector<ParetoScore> scores;
    for (const auto& p : points) {
      const double x = 10 * p[0] - 5;
      ParetoScore score{x * x, (x - 2) * (x - 2), {}, 0};
      if (std::isfinite(bound)) score.constraints.push_back(x - bound);
      scores.push_back(score);
    }
    return scores;
  });
}

// x of the history's record i.
double XOf(const ParetoSearchResult& found, std::size_t i) {
  return 10 * found.history[i].point[0] - 5;
}

TEST(ParetoSearch, FindsSchaffersFrontAndSpreadsAlongIt) {
  const ParetoSearchResult found = Schaffer(60, INFINITY);
  ASSERT_LE(found.history.size(), 60u);
  // 24 start points, then 36 evaluations: 4 polishes, the first metric's weight 1, ⅔, ⅓ and 0.
  ASSERT_EQ(found.weights.size(), 4u);
  EXPECT_EQ(found.weights.front(), 1);
  EXPECT_NEAR(found.weights[1], 2.0 / 3, 1e-15);
  EXPECT_EQ(found.weights.back(), 0);
  ASSERT_GE(found.front.size(), 8u);
  std::vector<double> xs;
  for (const std::size_t i : found.front) {
    const double x = XOf(found, i);
    // On the true front within the polish's tolerance, 1e-4 of the box = 1e-3 in x, and a
    // little (common practice): a point outside [0, 2] is dominated by the polished ends.
    EXPECT_GE(x, -0.002) << "record " << i;
    EXPECT_LE(x, 2.002) << "record " << i;
    xs.push_back(x);
  }
  // Sorted by f1 = x², so by x on the front.
  EXPECT_TRUE(std::is_sorted(xs.begin(), xs.end()));
  // Both ends reached by the weightings 1 and 0: each metric within 0.01 of its minimum 0, a
  // few 1e-4 of the ranges the start saw (about 25 and 49), and no gap along the front wider
  // than a sixth of it (common practice: about 8 polish evaluations per weighting).
  EXPECT_LE(found.history[found.front.front()].score.first, 0.01);
  EXPECT_LE(found.history[found.front.back()].score.second, 0.01);
  for (std::size_t i = 1; i < xs.size(); ++i) EXPECT_LE(xs[i] - xs[i - 1], 0.35) << "at " << i;
}

TEST(ParetoSearch, KeepsTheFrontWithinTheBounds) {
  // With x <= 1 the front is x ∈ [0, 1]: the bound cuts the second metric's end off.
  const ParetoSearchResult found = Schaffer(40, 1);
  ASSERT_GE(found.front.size(), 3u);
  double highest = -INFINITY;
  for (const std::size_t i : found.front) {
    const double x = XOf(found, i);
    EXPECT_GE(x, -0.002);
    EXPECT_LE(x, 1);  // a point beyond the bound is never on the front
    highest = std::max(highest, x);
  }
  EXPECT_NEAR(highest, 1, 0.01);  // the second metric's end, on the active bound
}

TEST(ParetoSearch, ReachesTheMiddleOfAConcaveFront) {
  // f1 = x, f2 = 1 − x² on x ∈ [0, 1]: every x is Pareto optimal and the front f2 = 1 − f1² bows
  // away from the origin, so a weighted sum of f1 and f2 (concave in x) is least at an end for
  // every weighting. The equal Chebyshev weighting is least where its two terms meet:
  // (x − z1)/r1 = (1 − x² − z2)/r2 with z and r the start's ideal point and ranges, a quadratic
  // in x (derived by hand); the augmentation moves it by about ρ = 1e-3 (common practice: 0.01).
  ParetoSearchOptions options;
  options.search.dimensions = 1;
  options.search.evaluations = 40;
  options.weightings = 3;  // weights 1, 0.5, 0
  const ParetoSearchResult found =
      ParetoSearch(options, [](const std::vector<std::vector<double>>& points) {
        std::vector<ParetoScore> scores;
        for (const auto& p : points) scores.push_back({p[0], 1 - p[0] * p[0], {}, 0});
        return scores;
      });
  ASSERT_EQ(found.weights, (std::vector<double>{1, 0.5, 0}));
  double lo[2] = {INFINITY, INFINITY}, hi[2] = {-INFINITY, -INFINITY};
  for (const ParetoRecord& record : found.history) {
    if (record.weighting != -1) continue;
    lo[0] = std::min(lo[0], record.score.first);
    hi[0] = std::max(hi[0], record.score.first);
    lo[1] = std::min(lo[1], record.score.second);
    hi[1] = std::max(hi[1], record.score.second);
  }
  const double r1 = hi[0] - lo[0], r2 = hi[1] - lo[1];
  // x²/r2 + x/r1 − ((1 − z2)/r2 + z1/r1) = 0, its positive root.
  const double qa = 1 / r2, qb = 1 / r1, qc = -((1 - lo[1]) / r2 + lo[0] / r1);
  const double meet = (-qb + std::sqrt(qb * qb - 4 * qa * qc)) / (2 * qa);
  EXPECT_NEAR(meet, 0.618, 0.05);  // (√5 − 1)/2 when z = 0 and r = 1
  // The middle polish's best point.
  double best_x = NAN, best = INFINITY;
  for (const ParetoRecord& record : found.history) {
    if (record.weighting != 1) continue;
    const double a = (record.score.first - lo[0]) / r1, b = (record.score.second - lo[1]) / r2;
    const double value = std::max(0.5 * a, 0.5 * b) + 1e-3 * (a + b);
    if (value < best) {
      best = value;
      best_x = record.point[0];
    }
  }
  EXPECT_NEAR(best_x, meet, 0.01);
}

TEST(ParetoSearch, IsFixedByTheSeed) {
  const ParetoSearchResult one = Schaffer(30, INFINITY, 7);
  const ParetoSearchResult two = Schaffer(30, INFINITY, 7);
  const ParetoSearchResult other = Schaffer(30, INFINITY, 8);
  ASSERT_EQ(one.history.size(), two.history.size());
  for (std::size_t i = 0; i < one.history.size(); ++i) {
    EXPECT_EQ(one.history[i].point, two.history[i].point);
  }
  EXPECT_EQ(one.front, two.front);
  EXPECT_NE(one.history.front().point, other.history.front().point);
}

}  // namespace
}  // namespace upright::runner
