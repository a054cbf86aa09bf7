// Time plots of the report: series of (time, value) per controller in, one inline SVG figure out,
// with axes, ticks and units, a legend, the scenario's events as labelled vertical lines and the
// end of each run that did not survive marked on its line.
//
// The charts are SVG written here by hand rather than drawn by a charting library: the report
// stays one small file that opens offline with nothing to fetch or bundle, there is no library
// licence or version to carry, and the bytes are a pure function of the data (no script, no
// random ids, no clock), so the same results give the same report.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace upright::runner::internal {

struct PlotSeries {
  std::string name;       // legend text
  std::size_t style = 0;  // palette index (StyleFor)
  bool twin = false;      // the linear twin (or a sampled curve): thin, dotted, the style's colour
  std::vector<double> time_s;  // the x values: time in s on a time plot
  std::vector<double> value;   // NaN: a break in the line
  bool guide = false;  // a reference line (a limit, the unit circle): thin grey, not in the legend
};

// A disturbance: a dashed vertical line tagged `tag` ("E1"); `label` shows on hover.
struct PlotEvent {
  double time_s = 0;
  std::string tag;
  std::string label;
};

// A point to flag (a fall): a cross in the style's colour and `text` beside it.
struct PlotMark {
  double time_s = 0;
  double value = 0;
  std::size_t style = 0;
  std::string text;
};

struct LinePlot {
  std::string kind;      // the data-plot attribute ("tilt", "drift", ...)
  std::string scenario;  // the data-scenario attribute
  std::string title;
  std::string y_label;  // with its unit: "tilt (deg)"
  double x_max_s = 0;   // the time axis runs from 0 to at least this
  std::vector<PlotSeries> series;
  std::vector<PlotEvent> events;
  std::vector<PlotMark> marks;

  // Other kinds of plot (frequency responses, Nyquist): the x axis's title; x on a log scale
  // with a tick a decade (from the data's smallest positive x, not from 0; x <= 0 left out);
  // a fixed window [x_lo, x_hi] × [y_lo, y_hi] where both bounds of an axis are finite (lines
  // clipped at its edge); with equal_aspect the y window is centred on the middle of y_lo and
  // y_hi and sized so a unit is as long on both axes; the figure's height in pixels.
  std::string x_label = "time (s)";
  bool x_log10 = false;
  double x_lo = kFromData, x_hi = kFromData, y_lo = kFromData, y_hi = kFromData;
  bool equal_aspect = false;
  double height_px = 250;
  // The legend also names the dotted lines: "" for the linear twin's words.
  std::string twin_legend;

  static constexpr double kFromData = std::numeric_limits<double>::quiet_NaN();
};

// The plot as one <svg> element. Each series is thinned to at most `max_points` samples by
// MinMaxDecimate before drawing.
std::string RenderLinePlot(const LinePlot& plot, std::size_t max_points);

}  // namespace upright::runner::internal
