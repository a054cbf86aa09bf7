#include "svg_axis.hpp"

#include <algorithm>
#include <cmath>

#include "html_text.hpp"
#include "upright/base/number_text.hpp"

namespace upright::runner::internal {

std::vector<double> Axis::Ticks() const {
  std::vector<double> ticks;
  const long first = std::lround(lo / step);
  const long count = std::lround((hi - lo) / step);
  for (long k = 0; k <= count; ++k) ticks.push_back(static_cast<double>(first + k) * step);
  return ticks;
}

std::string Axis::Label(double value) const {
  // A tick that is zero to within rounding prints as 0, never as -0 or 1e-17.
  if (std::fabs(value) < step * 1e-6) value = 0;
  return FixedText(value, decimals, NanAs::kEmpty);
}

Axis NiceAxis(double data_lo, double data_hi, int target_ticks, double px_lo, double px_hi) {
  Axis axis;
  axis.px_lo = px_lo;
  axis.px_hi = px_hi;
  if (!std::isfinite(data_lo) || !std::isfinite(data_hi)) {
    data_lo = 0;
    data_hi = 1;
  }
  if (data_hi < data_lo) std::swap(data_lo, data_hi);
  if (data_hi - data_lo <= 1e-12 * std::max(1.0, std::fabs(data_hi))) {
    const double half = data_lo == 0 ? 1.0 : 0.1 * std::fabs(data_lo);
    data_lo -= half;
    data_hi += half;
  }
  const double raw = (data_hi - data_lo) / std::max(1, target_ticks);
  const double magnitude = std::pow(10.0, std::floor(std::log10(raw)));
  const double norm = raw / magnitude;
  const double factor = norm <= 1 ? 1 : norm <= 2 ? 2 : norm <= 5 ? 5 : 10;
  axis.step = factor * magnitude;
  // A hair of tolerance so a bound that is already a whole step stays put.
  axis.lo = std::floor(data_lo / axis.step + 1e-9) * axis.step;
  axis.hi = std::ceil(data_hi / axis.step - 1e-9) * axis.step;
  axis.decimals = std::max(0, static_cast<int>(-std::floor(std::log10(axis.step) + 1e-9)));
  return axis;
}

std::string PixelText(double pixels) {
  std::string text;
  AppendTenths(&text, std::lround(pixels * 10));
  return text;
}

void AppendSvgText(std::string* svg, double x, double y, std::string_view text,
                   std::string_view attributes) {
  *svg += "<text x=\"" + PixelText(x) + "\" y=\"" + PixelText(y) + "\"";
  if (!attributes.empty()) {
    *svg += ' ';
    *svg += attributes;
  }
  *svg += '>';
  *svg += Escape(text);
  *svg += "</text>";
}

void AppendSvgLine(std::string* svg, double x1, double y1, double x2, double y2,
                   std::string_view attributes) {
  *svg += "<line x1=\"" + PixelText(x1) + "\" y1=\"" + PixelText(y1) + "\" x2=\"" + PixelText(x2) +
          "\" y2=\"" + PixelText(y2) + "\" ";
  *svg += attributes;
  *svg += "/>";
}

}  // namespace upright::runner::internal
