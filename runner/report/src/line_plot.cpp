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
constexpr double kHeight = 250;
constexpr double kLeft = 58;
constexpr double kRight = kWidth - 14;
constexpr double kBottom = kHeight - 34;
constexpr double kCharWidth = 6.2;  // rough width of an 11 px sans-serif character

// Appends a number of tenths to a path, with a space before it unless its sign separates it.
void AppendPathNumber(std::string* d, long tenths) {
  if (!d->empty() && tenths >= 0) *d += ' ';
  AppendTenths(d, tenths);
}

// The path data of one series: absolute moves after breaks, relative line segments otherwise, in
// tenths of a pixel; repeated points dropped.
std::string SeriesPath(const PlotSeries& s, const Axis& x, const Axis& y, std::size_t max_points) {
  const std::vector<std::size_t> keep = MinMaxDecimate(s.value, max_points);
  std::string d;
  bool pen_down = false;
  long last_x = 0, last_y = 0;
  for (const std::size_t i : keep) {
    const double v = s.value[i];
    if (!std::isfinite(v) || !std::isfinite(s.time_s[i])) {
      pen_down = false;
      continue;
    }
    const long px = std::lround(x.ToPixel(s.time_s[i]) * 10);
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
    entries.push_back({"linear twin (dotted, the controller's colour)", sample});
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

// Grid, frame, ticks and their labels, and both axis titles.
void AppendAxes(std::string* svg, const LinePlot& plot, const Axis& x, const Axis& y, double top) {
  *svg += "<g class=\"axes\">";
  for (const double t : x.Ticks()) {
    AppendSvgLine(svg, x.ToPixel(t), top, x.ToPixel(t), kBottom, "class=\"grid\"");
    AppendSvgText(svg, x.ToPixel(t), kBottom + 14, x.Label(t), "text-anchor=\"middle\"");
  }
  for (const double v : y.Ticks()) {
    AppendSvgLine(svg, kLeft, y.ToPixel(v), kRight, y.ToPixel(v),
                  std::fabs(v) < y.step * 1e-6 ? "class=\"zero\"" : "class=\"grid\"");
    AppendSvgText(svg, kLeft - 4, y.ToPixel(v) + 4, y.Label(v), "text-anchor=\"end\"");
  }
  *svg += "<rect class=\"frame\" x=\"" + PixelText(kLeft) + "\" y=\"" + PixelText(top) +
          "\" width=\"" + PixelText(kRight - kLeft) + "\" height=\"" + PixelText(kBottom - top) +
          "\"/>";
  AppendSvgText(svg, (kLeft + kRight) / 2, kHeight - 6, "time (s)", "text-anchor=\"middle\"");
  *svg += "<text text-anchor=\"middle\" transform=\"translate(14 " +
          PixelText((top + kBottom) / 2) + ") rotate(-90)\">" + Escape(plot.y_label) + "</text>";
  *svg += "</g>";
}

// Events: dashed verticals with their tag, staggered when they crowd.
void AppendEvents(std::string* svg, const std::vector<PlotEvent>& events, const Axis& x,
                  double top) {
  double last_px = -1e9;
  int row = 0;
  for (const PlotEvent& e : events) {
    const double px = x.ToPixel(e.time_s);
    row = px - last_px < 22 ? (row + 1) % 3 : 0;
    last_px = px;
    *svg += "<g class=\"event\"><title>" + Escape(e.label) + "</title>";
    AppendSvgLine(svg, px, top, px, kBottom, "");
    AppendSvgText(svg, px + 2, top + 10 + 10 * row, e.tag);
    *svg += "</g>";
  }
}

// Marks: a cross on the line and its text beside it, moved up (or down) a line at a time until
// it clears the texts already placed.
void AppendMarks(std::string* svg, const std::vector<PlotMark>& marks, const Axis& x, const Axis& y,
                 double top) {
  struct Box {
    double x0, x1, y;
  };
  std::vector<Box> placed;
  for (const PlotMark& m : marks) {
    const double px = x.ToPixel(m.time_s);
    const double py = std::isfinite(m.value) ? y.ToPixel(m.value) : kBottom;
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
      while (clashes(ty) && ty < kBottom - 4) ty += 12;
    }
    placed.push_back({x0, x1, ty});
    AppendSvgText(svg, left ? px - 8 : px + 8, ty, m.text,
                  left ? "text-anchor=\"end\"" : std::string_view{});
    *svg += "</g>";
  }
}

}  // namespace

std::string RenderLinePlot(const LinePlot& plot, std::size_t max_points) {
  double x_max = plot.x_max_s;
  double y_lo = std::numeric_limits<double>::infinity();
  double y_hi = -std::numeric_limits<double>::infinity();
  for (const PlotSeries& s : plot.series) {
    for (std::size_t i = 0; i < s.value.size() && i < s.time_s.size(); ++i) {
      if (!std::isfinite(s.value[i]) || !std::isfinite(s.time_s[i])) continue;
      y_lo = std::min(y_lo, s.value[i]);
      y_hi = std::max(y_hi, s.value[i]);
      x_max = std::max(x_max, s.time_s[i]);
    }
  }
  if (!(y_lo <= y_hi)) y_lo = y_hi = 0;
  // A little room so a line along the edge stays visible.
  const double pad = 0.04 * (y_hi - y_lo);
  std::string svg = "<svg class=\"plot\" data-plot=\"" + Escape(plot.kind) + "\" data-scenario=\"" +
                    Escape(plot.scenario) + "\" viewBox=\"0 0 " + PixelText(kWidth) + " " +
                    PixelText(kHeight) + "\" width=\"" + PixelText(kWidth) + "\" height=\"" +
                    PixelText(kHeight) + "\" role=\"img\" aria-label=\"" +
                    Escape(plot.title + ": " + plot.y_label + " against time") + "\">";
  AppendSvgText(&svg, 8, 15, plot.title, "class=\"title\"");
  const double top = AppendLegend(&svg, plot);
  const Axis x = NiceAxis(0, x_max > 0 ? x_max : 1, 8, kLeft, kRight);
  const Axis y = NiceAxis(y_lo - pad, y_hi + pad, 5, kBottom, top);
  AppendAxes(&svg, plot, x, y, top);
  AppendEvents(&svg, plot.events, x, top);
  svg += "<g fill=\"none\" stroke-linejoin=\"round\">";
  for (const PlotSeries& s : plot.series) {
    const std::string d = SeriesPath(s, x, y, max_points);
    if (d.empty()) continue;
    svg += "<path d=\"" + d + "\" " + StrokeAttributes(s) + "/>";
  }
  svg += "</g>";
  AppendMarks(&svg, plot.marks, x, y, top);
  svg += "</svg>";
  return svg;
}

}  // namespace upright::runner::internal
