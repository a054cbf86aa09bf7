#include "upright/model/number_text.hpp"

#include <charconv>
#include <cmath>

namespace upright {

std::string NumberText(double value) {
  char buffer[32];
  // Whole numbers in plain digits (100000, not 1e+05); others in the shortest exact form.
  const bool whole = value == std::floor(value) && std::abs(value) < 1e15;
  const auto [end, status] =
      whole ? std::to_chars(buffer, buffer + sizeof buffer, static_cast<long long>(value))
            : std::to_chars(buffer, buffer + sizeof buffer, value);
  return status == std::errc{} ? std::string(buffer, end) : std::string("?");
}

}  // namespace upright
