// Bar charts of the report, one inline SVG each: the survival envelope of every controller
// (the range it survives, the first failing value marked), survival rates of a sweep with their
// confidence intervals as error bars, and the linear-vs-physics peak tilt of each run as paired
// bars. Shapes and words carry the meaning; colour only repeats it.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace upright::runner::internal {

inline constexpr double kNoValue = std::numeric_limits<double>::quiet_NaN();

struct EnvelopeBar {
  std::string name;                 // the controller
  std::size_t style = 0;            // palette index
  double survived = kNoValue;       // the hardest value survived; NaN when none was
  double first_failing = kNoValue;  // the first value that failed; NaN when none did
  bool downward = false;            // smaller is harder: the survived range runs up to the top
  std::string note;                 // the outcome in words, under the bar
};

struct EnvelopeChart {
  std::string scenario;   // the data-scenario attribute
  std::string parameter;  // its path, with the unit in the axis title
  std::string unit;
  double lo = 0, hi = 1;             // the range searched
  double scenario_value = kNoValue;  // the file's own value, drawn as a reference line
  std::vector<EnvelopeBar> bars;
};

// <svg data-chart="envelope">: per controller a bar over the range it survives and a cross at the
// first failing value, over an axis spanning the range searched.
std::string RenderEnvelopeBars(const EnvelopeChart& chart);

struct RateBar {
  std::string name;
  std::size_t style = 0;
  std::size_t survived = 0, runs = 0;
  double lo = 0, hi = 1;  // the interval of the rate, 0–1
};

// <svg data-chart="sweep">: per controller the survival rate as a bar from 0 to 100 % and its
// interval as an error bar with end caps; the counts and bounds written under it.
std::string RenderSurvivalRates(const std::string& scenario, const std::vector<RateBar>& bars);

struct GapPair {
  std::string name;  // the run ("lqr, seed 1")
  double linear_deg = kNoValue;
  double plant_deg = kNoValue;
  std::string note;  // how the run ended, when the two parted
};

// <svg data-chart="gap">: per run the peak tilt of the linear model (outlined, dashed) above the
// plant's (filled), with their values.
std::string RenderGapBars(const std::string& scenario, const std::vector<GapPair>& pairs);

}  // namespace upright::runner::internal
