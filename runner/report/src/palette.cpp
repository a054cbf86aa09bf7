#include "palette.hpp"

#include <array>

namespace upright::runner::internal {

const SeriesStyle& StyleFor(std::size_t index) {
  static constexpr std::array<SeriesStyle, 6> kStyles = {{
      {"#000000", ""},
      {"#e66100", "8 3"},
      {"#5d3a9b", "10 3 2 3"},
      {"#40b0a6", "4 2"},
      {"#994f00", "14 3 3 3 3 3"},
      {"#8c8c8c", "6 2 2 2"},
  }};
  return kStyles[index % kStyles.size()];
}

}  // namespace upright::runner::internal
