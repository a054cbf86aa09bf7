#include "line_plot.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "decimate.hpp"
#include "html_text.hpp"
#include "palette.hpp"
#include "svg_axis.hpp"
#include "upright/base/number_text.hpp"

namespace upright::runner::internal {
namespace {

constexpr double kWidth = 600;
constexpr double kLeft = 58;
constexpr double kRight = kWidth - 14;
constexpr double kBelowAxis = 34;   // from the plot area's bottom to the figure's
constexpr double kCharWidth = 6.2;  // rough width of an 11 px sans-serif character

// Where an x value lands on its axis: itself, or its log10 on a log axis (NaN for x <= 0).
double AxisValue(const LinePlot& plot, double x) {
  if (!plot.x_log10) return x;
  return x > 0 ? std::log10(x) : std::numeric_limits<double>::quiet_NaN();
}

// Appends a number of tenths to a path, with a space before it unless its sign separates it.
void AppendPathNumber(std::string* d, long tenths) {
  if (!d->empty() && tenths >= 0) *d += ' ';
  AppendTenths(d, tenths);
}

// The path data of one series: absolute moves after breaks, relative line segments otherwise, in
// tenths of a pixel; repeated points dropped.
std::string SeriesPath(const LinePlot& plot, const PlotSeries& s, const Axis& x, const Axis& y,
                       std::size_t max_points) {
  const std::vector<std::size_t> keep = MinMaxDecimate(s.value, max_points);
  std::string d;
  bool pen_down = false;
  long last_x = 0, last_y = 0;
  for (const std::size_t i : keep) {
    const double v = s.value[i];
    const double at = i < s.time_s.size() ? AxisValue(plot, s.time_s[i])
                                           : std::numeric_limits<double>::quiet_NaN();
    if (!std::isfinite(v) || !std::isfinite(at)) {
      pen_down = false;
      continue;
    }
    const long px = std::lround(x.ToPixel(at) * 10);
    const long py = std::lround(y.ToPixel(v) * 10);
    if (!pen_down) {
      if (!d.empty() && d.back() == 'l') d.pop_back();  // a lone point before a break
      d += 'M';
      AppendTenths(&d, px);
      AppendPathNumber(&d, py);
      d += 'l';
      pen_down = true;
    } else if (px != last_x || py != last_y) {
      if (d.back() != 'l') {
        AppendPathNumber(&d, px - last_x);
      } else {
        AppendTenths(&d, px - last_x);
      }
      AppendPathNumber(&d, py - last_y);
    }
    last_x = px;
    last_y = py;
  }
  // A move with no segment after it ("M1 2l") draws nothing: drop the dangling command letters.
  if (!d.empty() && d.back() == 'l') d.pop_back();
  return d;
}

std::string StrokeAttributes(const PlotSeries& s) {
  if (s.guide) return "stroke=\"#777777\" stroke-width=\"1\" stroke-dasharray=\"4 3\"";
  const SeriesStyle& style = StyleFor(s.style);
  std::string a = std::string("stroke=\"") + style.colour + "\"";
  if (s.twin) return a + " stroke-width=\"1.2\" stroke-dasharray=\"" + kTwinDash + "\"";
  a += " stroke-width=\"1.6\"";
  if (*style.dash != '\0') a += std::string(" stroke-dasharray=\"") + style.dash + "\"";
  return a;
}

// The legend above the plot area, wrapped to the width; returns the y below its last row.
double AppendLegend(std::string* svg, const LinePlot& plot) {
  struct Entry {
    std::string name;
    PlotSeries sample;
  };
  std::vector<Entry> entries;
  bool has_twin = false;
  for (const PlotSeries& s : plot.series) {
    if (s.guide) continue;
    if (s.twin) {
      has_twin = true;
      continue;
    }
    PlotSeries sample;
    sample.style = s.style;
    entries.push_back({s.name, sample});
  }
  if (has_twin) {
    PlotSeries sample;
    sample.twin = true;
    sample.style = 0;
    entries.push_back({plot.twin_legend.empty() ? "linear twin (dotted, the controller's colour)"
                                                : plot.twin_legend,
                       sample});
  }
  double x = kLeft;
  double y = 34;
  *svg += "<g class=\"legend\">";
  for (const Entry& e : entries) {
    const double width = 30 + kCharWidth * static_cast<double>(e.name.size()) + 14;
    if (x + width > kRight && x > kLeft) {
      x = kLeft;
      y += 14;
    }
    AppendSvgLine(svg, x, y - 4, x + 26, y - 4, StrokeAttributes(e.sample));
    AppendSvgText(svg, x + 30, y, e.name);
    x += width;
  }
  *svg += "</g>";
  return y + 8;
}

// A tick's label: the value, or on a log axis the power of ten it stands for.
std::string TickLabel(const LinePlot& plot, const Axis& x, double t) {
  if (!plot.x_log10) return x.Label(t);
  return WholeOrShortestText(std::pow(10.0, std::round(t)));
}

// Grid, frame, ticks and their labels, and both axis titles.
void AppendAxes(std::string* svg, const LinePlot& plot, const Axis& x, const Axis& y,
                const std::vector<double>& x_ticks, const std::vector<double>& y_ticks, double top,
                double bottom) {
  *svg += "<g class=\"axes\">";
  for (const double t : x_ticks) {
    AppendSvgLine(svg, x.ToPixel(t), top, x.ToPixel(t), bottom,
                  std::fabs(t) < x.step * 1e-6 && !plot.x_log10 && x.lo < 0 ? "class=\"zero\""
                                                                            : "class=\"grid\"");
    AppendSvgText(svg, x.ToPixel(t), bottom + 14, TickLabel(plot, x, t), "text-anchor=\"middle\"");
  }
  for (const double v : y_ticks) {
    AppendSvgLine(svg, kLeft, y.ToPixel(v), kRight, y.ToPixel(v),
                  std::fabs(v) < y.step * 1e-6 ? "class=\"zero\"" : "class=\"grid\"");
    AppendSvgText(svg, kLeft - 4, y.ToPixel(v) + 4, y.Label(v), "text-anchor=\"end\"");
  }
  *svg += "<rect class=\"frame\" x=\"" + PixelText(kLeft) + "\" y=\"" + PixelText(top) +
          "\" width=\"" + PixelText(kRight - kLeft) + "\" height=\"" + PixelText(bottom - top) +
          "\"/>";
  AppendSvgText(svg, (kLeft + kRight) / 2, bottom + kBelowAxis - 6, plot.x_label,
                "text-anchor=\"middle\"");
  *svg += "<text text-anchor=\"middle\" transform=\"translate(14 " + PixelText((top + bottom) / 2) +
          ") rotate(-90)\">" + Escape(plot.y_label) + "</text>";
  *svg += "</g>";
}

// Events: dashed verticals with their tag, staggered when they crowd.
void AppendEvents(std::string* svg, const std::vector<PlotEvent>& events, const Axis& x, double top,
                  double bottom) {
  double last_px = -1e9;
  int row = 0;
  for (const PlotEvent& e : events) {
    const double px = x.ToPixel(e.time_s);
    row = px - last_px < 22 ? (row + 1) % 3 : 0;
    last_px = px;
    *svg += "<g class=\"event\"><title>" + Escape(e.label) + "</title>";
    AppendSvgLine(svg, px, top, px, bottom, "");
    AppendSvgText(svg, px + 2, top + 10 + 10 * row, e.tag);
    *svg += "</g>";
  }
}

// Marks: a cross on the line and its text beside it, moved up (or down) a line at a time until
// it clears the texts already placed.
void AppendMarks(std::string* svg, const LinePlot& plot, const Axis& x, const Axis& y, double top,
                 double bottom) {
  const std::vector<PlotMark>& marks = plot.marks;
  struct Box {
    double x0, x1, y;
  };
  std::vector<Box> placed;
  for (const PlotMark& m : marks) {
    const double px = x.ToPixel(AxisValue(plot, m.time_s));
    const double py = std::isfinite(m.value) ? y.ToPixel(m.value) : bottom;
    const std::string colour = StyleFor(m.style).colour;
    *svg += "<g class=\"mark\"><path d=\"M" + PixelText(px - 5) + " " + PixelText(py - 5) +
            "l10 10m0 -10l-10 10\" stroke=\"" + colour + "\" stroke-width=\"2.2\"/>";
    const double text_width = kCharWidth * static_cast<double>(m.text.size());
    const bool left = px + 8 + text_width > kRight;
    const double x0 = left ? px - 8 - text_width : px + 8;
    const double x1 = x0 + text_width;
    const auto clashes = [&](double ty) {
      return std::any_of(placed.begin(), placed.end(), [&](const Box& b) {
        return x0 < b.x1 && b.x0 < x1 && std::fabs(ty - b.y) < 12;
      });
    };
    double ty = py - 7;
    while (clashes(ty) && ty > top + 12) ty -= 12;
    if (ty < top + 12 || clashes(ty)) {
      ty = py + 16;
      while (clashes(ty) && ty < bottom - 4) ty += 12;
    }
    placed.push_back({x0, x1, ty});
    AppendSvgText(svg, left ? px - 8 : px + 8, ty, m.text,
                  left ? "text-anchor=\"end\"" : std::string_view{});
    *svg += "</g>";
  }
}

// A fixed window's axis: exactly [lo, hi], its tick step (and digits) those NiceAxis picks for it;
// TicksInside gives the ticks.
Axis WindowAxis(double lo, double hi, int target_ticks, double px_lo, double px_hi) {
  Axis axis = NiceAxis(lo, hi, target_ticks, px_lo, px_hi);
  axis.lo = lo;
  axis.hi = hi;
  return axis;
}

// A log axis: whole decades around the data, a tick each.
Axis DecadeAxis(double log_lo, double log_hi, double px_lo, double px_hi) {
  Axis axis;
  axis.lo = std::floor(log_lo + 1e-9);
  axis.hi = std::max(axis.lo + 1, std::ceil(log_hi - 1e-9));
  axis.step = 1;
  axis.px_lo = px_lo;
  axis.px_hi = px_hi;
  return axis;
}

// The ticks of a window axis lie inside it: from the first whole step at or above lo.
std::vector<double> TicksInside(const Axis& axis) {
  std::vector<double> ticks;
  const double first = std::ceil(axis.lo / axis.step - 1e-9) * axis.step;
  for (double t = first; t <= axis.hi + axis.step * 1e-9; t += axis.step) {
    ticks.push_back(std::fabs(t) < axis.step * 1e-9 ? 0.0 : t);
  }
  return ticks;
}

bool Fixed(double lo, double hi) { return std::isfinite(lo) && std::isfinite(hi) && hi > lo; }

}  // namespace

std::string RenderLinePlot(const LinePlot& plot, std::size_t max_points) {
  constexpr double kInf = std::numeric_limits<double>::infinity();
  double x_lo = kInf, x_hi = -kInf;
  double y_lo = kInf, y_hi = -kInf;
  for (const PlotSeries& s : plot.series) {
    if (s.guide) continue;
    for (std::size_t i = 0; i < s.value.size() && i < s.time_s.size(); ++i) {
      const double at = AxisValue(plot, s.time_s[i]);
      if (!std::isfinite(s.value[i]) || !std::isfinite(at)) continue;
      y_lo = std::min(y_lo, s.value[i]);
      y_hi = std::max(y_hi, s.value[i]);
      x_lo = std::min(x_lo, at);
      x_hi = std::max(x_hi, at);
    }
  }
  if (!(y_lo <= y_hi)) y_lo = y_hi = 0;
  // A little room so a line along the edge stays visible.
  const double pad = 0.04 * (y_hi - y_lo);
  const double height = plot.height_px;
  const double bottom = height - kBelowAxis;
  std::string svg = "<svg class=\"plot\" data-plot=\"" + Escape(plot.kind) + "\" data-scenario=\"" +
                    Escape(plot.scenario) + "\" viewBox=\"0 0 " + PixelText(kWidth) + " " +
                    PixelText(height) + "\" width=\"" + PixelText(kWidth) + "\" height=\"" +
                    PixelText(height) + "\" role=\"img\" aria-label=\"" +
                    Escape(plot.title + ": " + plot.y_label + " against " +
                           (plot.x_label == LinePlot{}.x_label ? "time" : plot.x_label)) +
                    "\">";
  AppendSvgText(&svg, 8, 15, plot.title, "class=\"title\"");
  const double top = AppendLegend(&svg, plot);

  const bool x_fixed = Fixed(plot.x_lo, plot.x_hi);
  Axis x;
  if (x_fixed) {
    x = WindowAxis(AxisValue(plot, plot.x_lo), AxisValue(plot, plot.x_hi), 8, kLeft, kRight);
  } else if (plot.x_log10) {
    x = DecadeAxis(x_lo <= x_hi ? x_lo : 0, x_lo <= x_hi ? x_hi : 1, kLeft, kRight);
  } else {
    const double x_max = std::max(plot.x_max_s, x_lo <= x_hi ? x_hi : 0.0);
    x = NiceAxis(0, x_max > 0 ? x_max : 1, 8, kLeft, kRight);
  }
  bool y_fixed = Fixed(plot.y_lo, plot.y_hi);
  Axis y;
  if (plot.equal_aspect && x_fixed) {
    const double units_per_px = (x.hi - x.lo) / (kRight - kLeft);
    const double half = 0.5 * (bottom - top) * units_per_px;
    const double middle = Fixed(plot.y_lo, plot.y_hi) ? 0.5 * (plot.y_lo + plot.y_hi) : 0.0;
    y = WindowAxis(middle - half, middle + half, 5, bottom, top);
    y_fixed = true;
  } else if (y_fixed) {
    y = WindowAxis(plot.y_lo, plot.y_hi, 5, bottom, top);
  } else {
    y = NiceAxis(y_lo - pad, y_hi + pad, 5, bottom, top);
  }
  AppendAxes(&svg, plot, x, y, x_fixed ? TicksInside(x) : x.Ticks(),
             y_fixed ? TicksInside(y) : y.Ticks(), top, bottom);
  AppendEvents(&svg, plot.events, x, top, bottom);
  // Lines beyond a fixed window are clipped by a nested viewport of the plot area.
  const bool clip = x_fixed || y_fixed;
  if (clip) {
    svg += "<svg x=\"" + PixelText(kLeft) + "\" y=\"" + PixelText(top) + "\" width=\"" +
           PixelText(kRight - kLeft) + "\" height=\"" + PixelText(bottom - top) + "\" viewBox=\"" +
           PixelText(kLeft) + " " + PixelText(top) + " " + PixelText(kRight - kLeft) + " " +
           PixelText(bottom - top) + "\" overflow=\"hidden\">";
  }
  svg += "<g fill=\"none\" stroke-linejoin=\"round\">";
  // Guides first, under the data.
  for (const bool guides : {true, false}) {
    for (const PlotSeries& s : plot.series) {
      if (s.guide != guides) continue;
      const std::string d = SeriesPath(plot, s, x, y, max_points);
      if (d.empty()) continue;
      svg += "<path d=\"" + d + "\" " + StrokeAttributes(s) + "/>";
    }
  }
  svg += "</g>";
  if (clip) svg += "</svg>";
  AppendMarks(&svg, plot, x, y, top, bottom);
  svg += "</svg>";
  return svg;
}

}  // namespace upright::runner::internal
