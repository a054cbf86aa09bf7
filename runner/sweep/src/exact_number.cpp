#include "exact_number.hpp"

#include <charconv>
#include <cmath>

namespace upright::runner::internal {

void AppendExactNumber(std::string* out, double value) {
  if (std::isnan(value)) return;
  if (value == 0) value = 0;  // -0 → 0
  char buffer[32];
  const auto result = std::to_chars(buffer, buffer + sizeof buffer, value);
  out->append(buffer, result.ptr);
}

}  // namespace upright::runner::internal
