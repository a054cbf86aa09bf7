#include "upright/model/seconds_hint.hpp"

#include <charconv>
#include <string>
#include <system_error>

namespace upright {
namespace {

// The shortest decimal that reads back as `value`, in plain digits (0.0005, not 5e-04).
std::string Plain(double value) {
  char buffer[400];  // room for any double in fixed notation
  const auto [end, status] =
      std::to_chars(buffer, buffer + sizeof buffer, value, std::chars_format::fixed);
  return status == std::errc{} ? std::string(buffer, end) : std::string("?");
}

}  // namespace

std::string SecondsHint(double value_s) {
  return "the field is in seconds: " + Plain(value_s) + " ms is " + Plain(value_s / 1000);
}

}  // namespace upright
