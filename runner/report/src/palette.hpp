// The look of each controller in the report's charts: a colour and a dash pattern by position, so
// lines stay apart in grey print and for readers who do not tell the colours apart.
#pragma once

#include <cstddef>

namespace upright::runner::internal {

struct SeriesStyle {
  const char* colour;  // "#rrggbb"
  const char* dash;    // SVG stroke-dasharray; "" for a solid line
};

// The style of the controller at `index` in its scenario's order (cycling after six). The first
// four colours are far apart in grey (Rec. 709 luma, 0–255: black 0, orange 118, purple 73, teal
// 151), and every style has its own dash pattern as well.
const SeriesStyle& StyleFor(std::size_t index);

// The linear twin's line: the controller's colour, thin, in this dotted pattern.
inline constexpr const char* kTwinDash = "1 2.5";

}  // namespace upright::runner::internal
