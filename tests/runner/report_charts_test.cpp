// The report's chart helpers: min/max decimation keeps every extreme and stays within its bound,
// axes land on 1-2-5 steps, and coordinates and text are written in a fixed, safe form.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "decimate.hpp"
#include "html_text.hpp"
#include "svg_axis.hpp"

namespace upright::runner::internal {
namespace {

TEST(MinMaxDecimate, KeepsEverySampleWhenFewEnough) {
  const std::vector<double> v = {3, 1, 4, 1, 5};
  EXPECT_EQ(MinMaxDecimate(v, 5), (std::vector<std::size_t>{0, 1, 2, 3, 4}));
}

TEST(MinMaxDecimate, KeepsEachBucketsExtremesInOrderWithinTheBound) {
  // A slow sine with one narrow spike: plain striding would miss the spike, min/max must not.
  std::vector<double> v(10000);
  for (std::size_t i = 0; i < v.size(); ++i) v[i] = std::sin(static_cast<double>(i) * 1e-3);
  v[4321] = 50;
  v[777] = -50;
  const std::vector<std::size_t> keep = MinMaxDecimate(v, 100);
  EXPECT_LE(keep.size(), 102u);
  EXPECT_GE(keep.size(), 50u);
  EXPECT_EQ(keep.front(), 0u);
  EXPECT_EQ(keep.back(), v.size() - 1);
  for (std::size_t k = 1; k < keep.size(); ++k) EXPECT_LT(keep[k - 1], keep[k]);
  EXPECT_NE(std::find(keep.begin(), keep.end(), 4321u), keep.end());
  EXPECT_NE(std::find(keep.begin(), keep.end(), 777u), keep.end());
  // Every bucket of 200 samples contributes its own largest and smallest value.
  for (std::size_t b = 0; b < 50; ++b) {
    const auto begin = v.begin() + static_cast<long>(200 * b);
    const auto end = begin + 200;
    const auto hi = static_cast<std::size_t>(std::max_element(begin, end) - v.begin());
    const auto lo = static_cast<std::size_t>(std::min_element(begin, end) - v.begin());
    EXPECT_NE(std::find(keep.begin(), keep.end(), hi), keep.end()) << "bucket " << b;
    EXPECT_NE(std::find(keep.begin(), keep.end(), lo), keep.end()) << "bucket " << b;
  }
}

TEST(MinMaxDecimate, KeepsABreakWhereValuesAreMissing) {
  std::vector<double> v(1000, 1.0);
  for (std::size_t i = 500; i < 520; ++i) v[i] = std::numeric_limits<double>::quiet_NaN();
  const std::vector<std::size_t> keep = MinMaxDecimate(v, 40);
  EXPECT_NE(std::find_if(keep.begin(), keep.end(), [&](std::size_t i) { return std::isnan(v[i]); }),
            keep.end());
}

// The 1-2-5 rule for tick steps (common practice in plotting).
TEST(NiceAxis, StepsOfOneTwoOrFiveWidenedToWholeSteps) {
  const Axis time = NiceAxis(0, 8.3, 8, 0, 100);
  EXPECT_DOUBLE_EQ(time.step, 2.0);  // 8.3 / 8 = 1.04 → 2
  EXPECT_DOUBLE_EQ(time.lo, 0.0);
  EXPECT_DOUBLE_EQ(time.hi, 10.0);
  const Axis tilt = NiceAxis(-11.2, 0.4, 5, 200, 0);
  EXPECT_DOUBLE_EQ(tilt.step, 5.0);  // 11.6 / 5 = 2.32 → 5
  EXPECT_DOUBLE_EQ(tilt.lo, -15.0);
  EXPECT_DOUBLE_EQ(tilt.hi, 5.0);
  EXPECT_EQ(tilt.Ticks(), (std::vector<double>{-15, -10, -5, 0, 5}));
  EXPECT_DOUBLE_EQ(tilt.ToPixel(-15), 200.0);
  EXPECT_DOUBLE_EQ(tilt.ToPixel(5), 0.0);
  const Axis slip = NiceAxis(-0.0004, 0.0031, 5, 0, 1);
  EXPECT_DOUBLE_EQ(slip.step, 0.001);
  EXPECT_EQ(slip.decimals, 3);
  EXPECT_EQ(slip.Label(slip.lo), "-0.001");
  EXPECT_EQ(slip.Label(1e-19), "0.000");
  // A flat line still gets an axis around it.
  const Axis flat = NiceAxis(0, 0, 5, 0, 1);
  EXPECT_LT(flat.lo, 0.0);
  EXPECT_GT(flat.hi, 0.0);
}

TEST(HtmlText, EscapesMarkupCharacters) {
  EXPECT_EQ(Escape("a<b>&\"c'"), "a&lt;b&gt;&amp;&quot;c&#39;");
  EXPECT_EQ(Escape("° ▲"), "° ▲");
}

// The forms themselves are tested with the base's number text; here, the report's use of them.
TEST(SvgText, CoordinatesInTenthsOfAPixel) {
  EXPECT_EQ(PixelText(-0.04), "0");
  EXPECT_EQ(PixelText(-123.44), "-123.4");
  EXPECT_EQ(PixelText(12.345), "12.3");
}

}  // namespace
}  // namespace upright::runner::internal
