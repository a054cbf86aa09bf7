// The search core against optima known in closed form: the damping ratio of a second-order plant
// that minimises the integral of the squared error of a unit step, scored through the project's
// metric recorder (a linear plant, not the robot: the physics plant has no damping-ratio knob);
// the same with the natural frequency as a second knob; and a quadratic with an active
// constraint. Also the ranking rule and the start's determinism.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "succeeded.hpp"
#include "upright/runner/metrics/metric_recorder.hpp"
#include "upright/runner/tune/knob.hpp"
#include "upright/runner/tune/search.hpp"

namespace upright::runner {
namespace {

// ∫₀ᵀ e² dt for e = 1 − y, y the unit-step response of ω_n² / (s² + 2ζω_n s + ω_n²), integrated
// by classical Runge–Kutta at dt and summed by the metric recorder: its RMS tilt is
// √(Σ e² / n) in degrees, so Σ e² dt = (RMS in rad)² · n · dt.
double StepIse(double zeta, double omega_n) {
  constexpr double kDt = 1e-3;
  constexpr double kDuration = 40;
  const long steps = std::lround(kDuration / kDt);
  MetricRecorder recorder(MetricSettings{}, kDt, kDuration, {});
  double y = 0, v = 0;  // output and its rate
  const auto accel = [&](double y_, double v_) {
    return omega_n * omega_n * (1 - y_) - 2 * zeta * omega_n * v_;
  };
  for (long i = 0; i < steps; ++i) {
    StepSample sample;
    sample.time_s = static_cast<double>(i) * kDt;
    sample.tilt_rad = 1 - y;
    recorder.Add(sample);
    const double k1y = v, k1v = accel(y, v);
    const double k2y = v + 0.5 * kDt * k1v, k2v = accel(y + 0.5 * kDt * k1y, v + 0.5 * kDt * k1v);
    const double k3y = v + 0.5 * kDt * k2v, k3v = accel(y + 0.5 * kDt * k2y, v + 0.5 * kDt * k2v);
    const double k4y = v + kDt * k3v, k4v = accel(y + kDt * k3y, v + kDt * k3v);
    y += kDt / 6 * (k1y + 2 * k2y + 2 * k3y + k4y);
    v += kDt / 6 * (k1v + 2 * k2v + 2 * k3v + k4v);
  }
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  const double rms_rad = m.rms_tilt_deg * std::numbers::pi / 180;
  return rms_rad * rms_rad * static_cast<double>(steps) * kDt;
}

// ISE = (1 + 4ζ²) / (4ζω_n) for the unit step of the standard second-order system (K. Ogata,
// Modern Control Engineering, the section on the integral of squared error as a performance
// index; from memory). d/dζ [1/(4ζ) + ζ] / ω_n = 0 gives ζ = 0.5 and ISE = 1/ω_n (derived by
// hand).
double ClosedFormIse(double zeta, double omega_n) {
  return (1 + 4 * zeta * zeta) / (4 * zeta * omega_n);
}

TEST(TuneSearch, TheRecorderGivesTheClosedFormIse) {
  // The objective itself first: the recorder's figure against the closed form, within the
  // rectangle rule's dt·e(0)²/2 = 5e-4 and a little (common practice).
  for (const double zeta : {0.2, 0.5, 1.0}) {
    EXPECT_NEAR(StepIse(zeta, 2), ClosedFormIse(zeta, 2), 1e-3) << "zeta " << zeta;
  }
}

TEST(TuneSearch, FindsTheDampingRatioThatMinimisesTheStepIse) {
  const Knob zeta{"zeta", 0.1, 2, KnobScale::kLinear};
  SearchOptions options;
  options.dimensions = 1;
  options.evaluations = 30;
  const SearchResult found = Search(options, [&](const std::vector<std::vector<double>>& points) {
    std::vector<PointScore> scores;
    for (const auto& p : points) scores.push_back({StepIse(zeta.ValueAt(p[0]), 2), {}});
    return scores;
  });
  ASSERT_LE(found.history.size(), 30u);
  const SearchRecord& best = found.history[found.best];
  // ISE ≈ (1 + 2(ζ − 0.5)²) / ω_n near the optimum, so ζ within 0.01 is the ISE within 1e-4.
  EXPECT_NEAR(zeta.ValueAt(best.point[0]), 0.5, 0.01);
  EXPECT_NEAR(best.score.objective, 0.5, 1e-3);  // 1 / ω_n, ω_n = 2
  EXPECT_EQ(best.stage, SearchStage::kLocal);    // the polish improved on the start
}

TEST(TuneSearch, FindsTheDampingRatioAndTheFastestPlantWithTwoKnobs) {
  // ISE falls as 1/ω_n, so the optimum is the range's top ω_n = 3 with ζ = 0.5, ISE = 1/3.
  const Knob zeta{"zeta", 0.1, 2, KnobScale::kLinear};
  const Knob omega{"omega_n", 0.5, 3, KnobScale::kLog};
  SearchOptions options;
  options.dimensions = 2;
  options.evaluations = 60;
  const SearchResult found = Search(options, [&](const std::vector<std::vector<double>>& points) {
    std::vector<PointScore> scores;
    for (const auto& p : points) {
      scores.push_back({StepIse(zeta.ValueAt(p[0]), omega.ValueAt(p[1])), {}});
    }
    return scores;
  });
  const SearchRecord& best = found.history[found.best];
  EXPECT_NEAR(zeta.ValueAt(best.point[0]), 0.5, 0.02);
  EXPECT_NEAR(omega.ValueAt(best.point[1]), 3, 0.01);
  EXPECT_NEAR(best.score.objective, 1.0 / 3, 1e-3);
}

TEST(TuneSearch, StopsOnTheActiveConstraint) {
  // Minimise (x − 2)² + (y − 1)² subject to x + y <= 2 on [0, 3]². The free minimum (2, 1)
  // breaks the bound, so it is active: on x + y = 2, ∇f = −λ∇g gives x − 2 = y − 1, hence
  // (x, y) = (1.5, 0.5) and f = 0.5 (derived by hand).
  SearchOptions options;
  options.dimensions = 2;
  options.constraints = 1;
  options.evaluations = 80;
  const SearchResult found = Search(options, [](const std::vector<std::vector<double>>& points) {
    std::vector<PointScore> scores;
    for (const auto& p : points) {
      const double x = 3 * p[0], y = 3 * p[1];
      scores.push_back({(x - 2) * (x - 2) + (y - 1) * (y - 1), {x + y - 2}});
    }
    return scores;
  });
  const SearchRecord& best = found.history[found.best];
  EXPECT_NEAR(3 * best.point[0], 1.5, 0.01);
  EXPECT_NEAR(3 * best.point[1], 0.5, 0.01);
  EXPECT_LE(best.score.constraints[0], 0);  // the best meets the bound
  EXPECT_NEAR(best.score.objective, 0.5, 0.01);
}

TEST(TuneSearch, RanksMeetingTheBoundsBeforeTheObjective) {
  EXPECT_TRUE(Better({5, {0}}, {1, {0.1}}));    // met beats missed, whatever the objective
  EXPECT_TRUE(Better({1, {-1}}, {2, {0}}));     // both met: the lower objective
  EXPECT_TRUE(Better({9, {0.1}}, {1, {0.2}}));  // both missed: the smaller miss
  EXPECT_FALSE(Better({1, {}}, {1, {}}));       // a tie keeps the earlier
}

TEST(TuneSearch, TheStartIsALatinHypercubeFixedByTheSeed) {
  SearchOptions options;
  options.dimensions = 3;
  options.evaluations = 10;
  options.global_points = 9;
  std::vector<std::vector<double>> first, second, other;
  const auto record = [](std::vector<std::vector<double>>* out) {
    return [out](const std::vector<std::vector<double>>& points) {
      if (out->empty()) *out = points;
      return std::vector<PointScore>(points.size(), PointScore{1, {}});
    };
  };
  Search(options, record(&first));
  Search(options, record(&second));
  options.seed = 2;
  Search(options, record(&other));
  ASSERT_EQ(first.size(), 9u);
  EXPECT_EQ(first, second);
  EXPECT_NE(first, other);
  // One point in each ninth of every axis.
  for (std::size_t axis = 0; axis < 3; ++axis) {
    std::vector<int> hits(9, 0);
    for (const auto& p : first) ++hits[static_cast<std::size_t>(p[axis] * 9)];
    EXPECT_EQ(hits, std::vector<int>(9, 1)) << "axis " << axis;
  }
}

TEST(TuneKnob, MapsTheUnitIntervalOntoItsRange) {
  const Knob log_knob{"max_tilt_deg", 1, 100, KnobScale::kLog};
  EXPECT_EQ(log_knob.ValueAt(0), 1);
  EXPECT_EQ(log_knob.ValueAt(1), 100);
  EXPECT_DOUBLE_EQ(log_knob.ValueAt(0.5), 10);  // the geometric mean
  EXPECT_EQ(log_knob.ValueAt(-1), 1);           // clamped
  const Knob linear{"x", -2, 2, KnobScale::kLinear};
  EXPECT_DOUBLE_EQ(linear.ValueAt(0.25), -1);
  EXPECT_DOUBLE_EQ(Knob({"x", 1, 3, KnobScale::kLog}).ValueAt(0.5), 1.73205);  // √3, 6 digits
}

TEST(TuneKnob, RefusesBadRanges) {
  EXPECT_NE(FailureOf(Knob{"x", 2, 1, KnobScale::kLinear}.Validate()).find("must be below"),
            std::string::npos);
  EXPECT_NE(FailureOf(Knob{"x", 0, 1, KnobScale::kLog}.Validate()).find("log scale"),
            std::string::npos);
  EXPECT_NE(FailureOf(Knob{"x", 1, INFINITY, KnobScale::kLinear}.Validate()).find("finite"),
            std::string::npos);
  EXPECT_TRUE(Succeeded(Knob{"x", -1, 1, KnobScale::kLinear}.Validate()));
}

}  // namespace
}  // namespace upright::runner
