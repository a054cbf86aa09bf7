// Shared pieces of the report's SVG charts: an axis with round tick values mapped onto pixels,
// pixel numbers in a short fixed form, and text elements. Charts are SVG written by hand: see
// line_plot.hpp for why.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace upright::runner::internal {

// A linear axis: data values from lo to hi (both multiples of step) onto pixels px_lo to px_hi.
struct Axis {
  double lo = 0, hi = 1, step = 1;
  int decimals = 0;  // digits after the point that show every tick value exactly
  double px_lo = 0, px_hi = 1;

  double ToPixel(double value) const { return px_lo + (value - lo) / (hi - lo) * (px_hi - px_lo); }
  // lo, lo + step, ..., hi.
  std::vector<double> Ticks() const;
  // A tick value as text with `decimals` digits after the point.
  std::string Label(double value) const;
};

// An axis covering [data_lo, data_hi] with about `target_ticks` intervals of 1, 2 or 5 times a
// power of ten, widened outward to whole steps. An empty or single-valued range is widened by
// one (or by 10 % of the value) on each side; non-finite bounds give 0 to 1.
Axis NiceAxis(double data_lo, double data_hi, int target_ticks, double px_lo, double px_hi);

// A pixel position rounded to a tenth, shortest form ("12.3", "12", ".5").
std::string PixelText(double pixels);

// Appends <text x=.. y=.. ATTRS>escaped text</text>; `attributes` (without a leading space)
// may be empty.
void AppendSvgText(std::string* svg, double x, double y, std::string_view text,
                   std::string_view attributes = {});

// Appends <line x1.. y1.. x2.. y2.. ATTRS/>.
void AppendSvgLine(std::string* svg, double x1, double y1, double x2, double y2,
                   std::string_view attributes);

}  // namespace upright::runner::internal
