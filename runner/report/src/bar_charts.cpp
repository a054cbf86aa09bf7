#include "bar_charts.hpp"

#include <algorithm>
#include <cmath>

#include "html_text.hpp"
#include "palette.hpp"
#include "svg_axis.hpp"
#include "upright/base/number_text.hpp"

namespace upright::runner::internal {
namespace {

constexpr double kWidth = 600;
constexpr double kLabelRight = 118;  // controller names end here
constexpr double kPlotLeft = 126;
constexpr double kPlotRight = kWidth - 20;
constexpr double kTop = 30;

std::string OpenSvg(const char* chart, const std::string& scenario, double height,
                    const std::string& label) {
  return std::string("<svg class=\"chart\" data-chart=\"") + chart + "\" data-scenario=\"" +
         Escape(scenario) + "\" viewBox=\"0 0 " + PixelText(kWidth) + " " + PixelText(height) +
         "\" width=\"" + PixelText(kWidth) + "\" height=\"" + PixelText(height) +
         "\" role=\"img\" aria-label=\"" + Escape(label) + "\">";
}

// Vertical grid lines with tick labels under the rows, and the axis title below them.
void AppendValueAxis(std::string* svg, const Axis& axis, double top, double bottom,
                     const std::string& title, const std::string& suffix = "") {
  *svg += "<g class=\"axes\">";
  for (const double v : axis.Ticks()) {
    AppendSvgLine(svg, axis.ToPixel(v), top, axis.ToPixel(v), bottom, "class=\"grid\"");
    AppendSvgText(svg, axis.ToPixel(v), bottom + 14, axis.Label(v) + suffix,
                  "text-anchor=\"middle\"");
  }
  AppendSvgLine(svg, axis.px_lo, bottom, axis.px_hi, bottom, "class=\"baseline\"");
  AppendSvgText(svg, (axis.px_lo + axis.px_hi) / 2, bottom + 30, title, "text-anchor=\"middle\"");
  *svg += "</g>";
}

void AppendRect(std::string* svg, double x, double y, double width, double height,
                const std::string& attributes) {
  *svg += "<rect x=\"" + PixelText(x) + "\" y=\"" + PixelText(y) + "\" width=\"" +
          PixelText(std::max(0.0, width)) + "\" height=\"" + PixelText(height) + "\" " +
          attributes + "/>";
}

void AppendCross(std::string* svg, double x, double y, double half) {
  *svg += "<path class=\"cross\" d=\"M" + PixelText(x - half) + " " + PixelText(y - half) + "l" +
          PixelText(2 * half) + " " + PixelText(2 * half) + "m0 -" + PixelText(2 * half) + "l-" +
          PixelText(2 * half) + " " + PixelText(2 * half) + "\"/>";
}

std::string WithUnit(double value, const std::string& unit) {
  const std::string text = SignificantText(value, 4, NanAs::kEmpty);
  return unit.empty() ? text : text + " " + unit;
}

}  // namespace

std::string RenderEnvelopeBars(const EnvelopeChart& chart) {
  constexpr double kRow = 36;
  constexpr double kRowsTop = kTop + 14;  // room for the reference line's label
  const double bottom = kRowsTop + kRow * static_cast<double>(chart.bars.size());
  const double height = bottom + 40;
  const std::string axis_title =
      chart.parameter + (chart.unit.empty() ? "" : " (" + chart.unit + ")");
  std::string svg = OpenSvg("envelope", chart.scenario, height,
                            "Survival envelope over " + axis_title + " per controller");
  // The legend: what the bar and the cross mean.
  AppendRect(&svg, kPlotLeft, 8, 22, 10, "class=\"bar\" fill=\"#777777\"");
  AppendSvgText(&svg, kPlotLeft + 28, 17, "survived");
  AppendCross(&svg, kPlotLeft + 110, 13, 4.5);
  AppendSvgText(&svg, kPlotLeft + 120, 17, "first failing value");
  const Axis axis = NiceAxis(std::min(chart.lo, chart.hi), std::max(chart.lo, chart.hi), 6,
                             kPlotLeft, kPlotRight);
  AppendValueAxis(&svg, axis, kRowsTop - 4, bottom, axis_title);
  if (std::isfinite(chart.scenario_value)) {
    const double px = axis.ToPixel(chart.scenario_value);
    const std::string text = "scenario's value " + WithUnit(chart.scenario_value, chart.unit);
    const bool left = px + 3 + 5.6 * static_cast<double>(text.size()) > kPlotRight;
    svg += "<g class=\"reference\">";
    AppendSvgLine(&svg, px, kRowsTop - 8, px, bottom, "");
    AppendSvgText(&svg, left ? px - 3 : px + 3, kRowsTop - 8, text,
                  left ? "class=\"note\" text-anchor=\"end\"" : "class=\"note\"");
    svg += "</g>";
  }
  for (std::size_t i = 0; i < chart.bars.size(); ++i) {
    const EnvelopeBar& bar = chart.bars[i];
    const double y = kRowsTop + kRow * static_cast<double>(i);
    AppendSvgText(&svg, kLabelRight, y + 11, bar.name, "text-anchor=\"end\"");
    if (std::isfinite(bar.survived)) {
      const double from = axis.ToPixel(bar.downward ? bar.survived : chart.lo);
      const double to = axis.ToPixel(bar.downward ? chart.hi : bar.survived);
      AppendRect(&svg, std::min(from, to), y + 2, std::fabs(to - from), 12,
                 std::string("class=\"bar\" fill=\"") + StyleFor(bar.style).colour + "\"");
    }
    if (std::isfinite(bar.first_failing))
      AppendCross(&svg, axis.ToPixel(bar.first_failing), y + 8, 5);
    AppendSvgText(&svg, kPlotLeft, y + 27, bar.note, "class=\"note\"");
  }
  svg += "</svg>";
  return svg;
}

std::string RenderSurvivalRates(const std::string& scenario, const std::vector<RateBar>& bars) {
  constexpr double kRow = 36;
  const double bottom = kTop + kRow * static_cast<double>(bars.size());
  const double height = bottom + 40;
  std::string svg = OpenSvg("sweep", scenario, height,
                            "Survival rate per controller with its 95 % Wilson interval");
  AppendRect(&svg, kPlotLeft, 8, 22, 10, "class=\"bar\" fill=\"#777777\"");
  AppendSvgText(&svg, kPlotLeft + 28, 17, "survival rate");
  AppendSvgLine(&svg, kPlotLeft + 130, 13, kPlotLeft + 160, 13, "class=\"whisker\"");
  AppendSvgLine(&svg, kPlotLeft + 130, 8, kPlotLeft + 130, 18, "class=\"whisker\"");
  AppendSvgLine(&svg, kPlotLeft + 160, 8, kPlotLeft + 160, 18, "class=\"whisker\"");
  AppendSvgText(&svg, kPlotLeft + 166, 17, "95 % Wilson interval");
  Axis axis = NiceAxis(0, 100, 5, kPlotLeft, kPlotRight);
  AppendValueAxis(&svg, axis, kTop - 4, bottom, "runs survived (%)", " %");
  for (std::size_t i = 0; i < bars.size(); ++i) {
    const RateBar& bar = bars[i];
    const double y = kTop + kRow * static_cast<double>(i);
    AppendSvgText(&svg, kLabelRight, y + 11, bar.name, "text-anchor=\"end\"");
    const double rate =
        bar.runs == 0 ? 0 : static_cast<double>(bar.survived) / static_cast<double>(bar.runs);
    AppendRect(&svg, axis.ToPixel(0), y + 2, axis.ToPixel(100 * rate) - axis.ToPixel(0), 12,
               std::string("class=\"bar\" fill=\"") + StyleFor(bar.style).colour + "\"");
    const double lo = axis.ToPixel(100 * bar.lo), hi = axis.ToPixel(100 * bar.hi);
    AppendSvgLine(&svg, lo, y + 8, hi, y + 8, "class=\"whisker\"");
    AppendSvgLine(&svg, lo, y + 2, lo, y + 14, "class=\"whisker\"");
    AppendSvgLine(&svg, hi, y + 2, hi, y + 14, "class=\"whisker\"");
    AppendSvgText(&svg, kPlotLeft, y + 27,
                  std::to_string(bar.survived) + " of " + std::to_string(bar.runs) +
                      " survived: " + FixedText(100 * rate, 1, NanAs::kEmpty) +
                      " % (95 % interval " + FixedText(100 * bar.lo, 1, NanAs::kEmpty) + "–" +
                      FixedText(100 * bar.hi, 1, NanAs::kEmpty) + " %)",
                  "class=\"note\"");
  }
  svg += "</svg>";
  return svg;
}

std::string RenderGapBars(const std::string& scenario, const std::vector<GapPair>& pairs) {
  constexpr double kRow = 40;
  const double bottom = kTop + kRow * static_cast<double>(pairs.size());
  const double height = bottom + 40;
  double most = 0;
  for (const GapPair& p : pairs) {
    if (std::isfinite(p.linear_deg)) most = std::max(most, p.linear_deg);
    if (std::isfinite(p.plant_deg)) most = std::max(most, p.plant_deg);
  }
  std::string svg = OpenSvg("gap", scenario, height,
                            "Peak tilt per run: the linear model against the physics plant");
  AppendRect(&svg, kPlotLeft, 8, 22, 9, "class=\"linear\"");
  AppendSvgText(&svg, kPlotLeft + 28, 17, "linear model");
  AppendRect(&svg, kPlotLeft + 130, 8, 22, 9, "class=\"plant\"");
  AppendSvgText(&svg, kPlotLeft + 158, 17, "physics plant");
  // Room on the right for the value written after the longest bar.
  const Axis axis = NiceAxis(0, most > 0 ? most : 1, 6, kPlotLeft, kPlotRight - 40);
  AppendValueAxis(&svg, axis, kTop - 4, bottom, "peak tilt (deg)");
  for (std::size_t i = 0; i < pairs.size(); ++i) {
    const GapPair& p = pairs[i];
    const double y = kTop + kRow * static_cast<double>(i);
    AppendSvgText(&svg, kLabelRight, y + 14, p.name, "text-anchor=\"end\"");
    const double values[2] = {p.linear_deg, p.plant_deg};
    const char* classes[2] = {"class=\"linear\"", "class=\"plant\""};
    for (int k = 0; k < 2; ++k) {
      const double top = y + 1 + 10 * k;
      if (!std::isfinite(values[k])) {
        AppendSvgText(&svg, axis.ToPixel(0) + 3, top + 8, "no value", "class=\"note\"");
        continue;
      }
      AppendRect(&svg, axis.ToPixel(0), top, axis.ToPixel(values[k]) - axis.ToPixel(0), 9,
                 classes[k]);
      AppendSvgText(&svg, axis.ToPixel(values[k]) + 4, top + 8,
                    SignificantText(values[k], 3, NanAs::kEmpty) + "°", "class=\"value\"");
    }
    AppendSvgText(&svg, kPlotLeft, y + 32, p.note, "class=\"note\"");
  }
  svg += "</svg>";
  return svg;
}

}  // namespace upright::runner::internal
