#include "upright/sim/push.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <numbers>
#include <string>
#include <vector>

#include "succeeded.hpp"
#include "upright/model/conventions.hpp"

namespace upright::sim {
namespace {

Push MakePush(PushShape shape, double start_s, double duration_s, double peak_N) {
  Push p;
  p.shape = shape;
  p.start_s = start_s;
  p.duration_s = duration_s;
  p.peak_N = peak_N;
  return p;
}

// Σ MeanForce · step over a grid of fixed steps from `t0_s` that covers [t0_s, t_end_s].
double GridImpulse(const Push& push, double t0_s, double step_s, double t_end_s) {
  double impulse = 0;
  for (long k = 0;; ++k) {
    const double a = t0_s + static_cast<double>(k) * step_s;
    if (a >= t_end_s) break;
    const double b = a + step_s;
    impulse += push.MeanForce(a, b) * (b - a);
  }
  return impulse;
}

TEST(Push, RectangularImpulseIsPeakInsideAndZeroOutside) {
  const Push p = MakePush(PushShape::kImpulse, 1.0, 0.2, 50);
  EXPECT_EQ(p.ForceAt(0.99), 0);
  EXPECT_EQ(p.ForceAt(1.0), 50);
  EXPECT_EQ(p.ForceAt(1.1), 50);
  EXPECT_EQ(p.ForceAt(1.19), 50);
  EXPECT_EQ(p.ForceAt(1.21), 0);
  EXPECT_DOUBLE_EQ(p.end_s(), 1.2);
}

TEST(Push, NegativePeakPushesTheOtherWay) {
  const Push p = MakePush(PushShape::kImpulse, 0, 0.1, -30);
  EXPECT_EQ(p.ForceAt(0.05), -30);
  EXPECT_NEAR(p.MeanForce(0, 0.1), -30, 1e-12);
}

TEST(Push, HalfSineFollowsTheSineProfile) {
  const Push p = MakePush(PushShape::kHalfSine, 2.0, 0.4, 100);
  // F(t) = F sin(π (t − start) / T) (the profile's definition).
  EXPECT_EQ(p.ForceAt(1.9), 0);
  EXPECT_NEAR(p.ForceAt(2.0), 0, 1e-12);
  EXPECT_NEAR(p.ForceAt(2.1), 100 * std::sin(std::numbers::pi / 4), 1e-9);
  EXPECT_NEAR(p.ForceAt(2.2), 100, 1e-9);
  EXPECT_NEAR(p.ForceAt(2.3), 100 * std::sin(3 * std::numbers::pi / 4), 1e-9);
  EXPECT_EQ(p.ForceAt(2.41), 0);
}

TEST(Push, FiniteStepIsFlatForItsDuration) {
  const Push p = MakePush(PushShape::kStep, 0.5, 1.5, 20);
  EXPECT_EQ(p.ForceAt(0.49), 0);
  EXPECT_EQ(p.ForceAt(0.5), 20);
  EXPECT_EQ(p.ForceAt(1.9), 20);
  EXPECT_EQ(p.ForceAt(2.01), 0);
}

TEST(Push, EndlessStepNeverEnds) {
  const Push p = MakePush(PushShape::kStep, 0.5, std::numeric_limits<double>::infinity(), 20);
  EXPECT_TRUE(Succeeded(p.Validate()));
  EXPECT_EQ(p.ForceAt(0.4), 0);
  EXPECT_EQ(p.ForceAt(0.5), 20);
  EXPECT_EQ(p.ForceAt(1e6), 20);
  // A step of 0.1 s straddling the start is on for 0.03 s of it.
  EXPECT_NEAR(p.MeanForce(0.47, 0.57), 20 * 0.07 / 0.1, 1e-9);
  EXPECT_NEAR(p.MeanForce(0.3, 0.4), 0, 1e-12);
  EXPECT_NEAR(p.MeanForce(1e5, 1e5 + 0.001), 20, 1e-6);
}

TEST(Push, RectangleDeliversPeakTimesDurationOnAnyStepGrid) {
  const Push p = MakePush(PushShape::kImpulse, 0.1234, 0.0505, 80);
  const double expected = 80 * 0.0505;  // J = F·T for a rectangle (calculus)
  for (double step : {0.001, 0.0005, 0.0007, 0.003, 0.02, 0.1}) {
    for (double offset : {0.0, 0.00013, 0.00049, 0.000999}) {
      SCOPED_TRACE("step " + std::to_string(step) + " offset " + std::to_string(offset));
      EXPECT_NEAR(GridImpulse(p, offset, step, 0.5), expected, 1e-9 * expected);
    }
  }
}

TEST(Push, HalfSineDeliversTwoPeakDurationOverPiOnAnyStepGrid) {
  const Push p = MakePush(PushShape::kHalfSine, 0.2001, 0.0333, 150);
  // ∫ F sin(π t / T) dt over [0, T] = 2 F T / π (calculus, from memory).
  const double expected = 2 * 150 * 0.0333 / std::numbers::pi;
  for (double step : {0.001, 0.0005, 0.0007, 0.003, 0.02, 0.1}) {
    for (double offset : {0.0, 0.00013, 0.00049, 0.000999}) {
      SCOPED_TRACE("step " + std::to_string(step) + " offset " + std::to_string(offset));
      EXPECT_NEAR(GridImpulse(p, offset, step, 0.5), expected, 1e-9 * expected);
    }
  }
}

TEST(Push, MeanForceOfAStepInsideTheHalfSineIsItsExactAverage) {
  const Push p = MakePush(PushShape::kHalfSine, 0, 1.0, 10);
  // (1/Δ) ∫ F sin(π t) dt over [0.25, 0.5] = F (cos(π/4) − cos(π/2)) / (π Δ) (calculus).
  const double expected = 10 * (std::cos(std::numbers::pi / 4) - std::cos(std::numbers::pi / 2)) /
                          (std::numbers::pi * 0.25);
  EXPECT_NEAR(p.MeanForce(0.25, 0.5), expected, 1e-12);
}

TEST(Push, FiniteStepDeliversPeakTimesDurationOnAnyStepGrid) {
  const Push p = MakePush(PushShape::kStep, 0.01, 0.25, -12);
  const double expected = -12 * 0.25;  // J = F·T (calculus)
  for (double step : {0.001, 0.0007, 0.03}) {
    for (double offset : {0.0, 0.00031}) {
      EXPECT_NEAR(GridImpulse(p, offset, step, 1.0), expected, 1e-9 * std::abs(expected));
    }
  }
}

TEST(Push, ValidPushPasses) {
  EXPECT_TRUE(Succeeded(MakePush(PushShape::kHalfSine, 0, 0.1, 10).Validate()));
}

struct BadPush {
  const char* field;
  Push push;
  const char* expected_text;  // the field and its value as the message must show them
};

TEST(Push, ValidateNamesTheBrokenFieldAndItsValue) {
  const double inf = std::numeric_limits<double>::infinity();
  const double nan = std::numeric_limits<double>::quiet_NaN();
  std::vector<BadPush> cases;
  Push p = MakePush(PushShape::kImpulse, -1, 0.1, 10);
  cases.push_back({"start_s", p, "Push::start_s = -1"});
  p = MakePush(PushShape::kImpulse, 0, 0, 10);
  cases.push_back({"duration_s zero", p, "Push::duration_s = 0"});
  p = MakePush(PushShape::kImpulse, 0, -0.5, 10);
  cases.push_back({"duration_s negative", p, "Push::duration_s = -0.5"});
  p = MakePush(PushShape::kHalfSine, 0, inf, 10);
  cases.push_back({"endless half-sine", p, "Push::duration_s = inf"});
  p = MakePush(PushShape::kImpulse, 0, inf, 10);
  cases.push_back({"endless impulse", p, "Push::duration_s = inf"});
  p = MakePush(PushShape::kImpulse, 0, 0.1, nan);
  cases.push_back({"peak_N", p, "Push::peak_N = nan"});
  p = MakePush(PushShape::kImpulse, 0, 0.1, 10);
  p.direction_deg = inf;
  cases.push_back({"direction_deg", p, "Push::direction_deg = inf"});
  p = MakePush(PushShape::kImpulse, 0, 0.1, 10);
  p.height_m = nan;
  cases.push_back({"height_m", p, "Push::height_m = nan"});
  for (const BadPush& c : cases) {
    const Status valid = c.push.Validate();
    ASSERT_FALSE(valid.has_value()) << c.field;
    const std::string& error = valid.error();
    EXPECT_NE(error.find(c.expected_text), std::string::npos)
        << c.field << ": message '" << error << "' lacks '" << c.expected_text << "'";
  }
}

TEST(Push, ShapeNamesRoundTrip) {
  for (PushShape shape : {PushShape::kImpulse, PushShape::kStep, PushShape::kHalfSine}) {
    PushShape parsed = shape == PushShape::kStep ? PushShape::kImpulse : PushShape::kStep;
    ASSERT_TRUE(FromString(ToString(shape), &parsed)) << ToString(shape);
    EXPECT_EQ(parsed, shape);
  }
  EXPECT_STREQ(ToString(PushShape::kHalfSine), "half-sine");
  PushShape untouched = PushShape::kStep;
  EXPECT_FALSE(FromString("Impulse", &untouched));
  EXPECT_FALSE(FromString("", &untouched));
  EXPECT_EQ(untouched, PushShape::kStep);
}

}  // namespace
}  // namespace upright::sim
