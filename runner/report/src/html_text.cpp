#include "html_text.hpp"

#include <charconv>
#include <cmath>

namespace upright::runner::report {
namespace {

std::string ToChars(double value, std::chars_format format, int precision) {
  if (std::isnan(value)) return "";
  if (std::isinf(value)) return value > 0 ? "inf" : "-inf";
  char buffer[64];
  const auto [end, ec] = std::to_chars(buffer, buffer + sizeof buffer, value, format, precision);
  if (ec != std::errc()) return "";
  std::string text(buffer, end);
  // A value that rounds to zero prints without its sign.
  if (text[0] == '-' && text.find_first_not_of("-0.e+") == std::string::npos) text.erase(0, 1);
  return text;
}

}  // namespace

std::string Escape(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

std::string FormatSignificant(double value, int digits) {
  return ToChars(value, std::chars_format::general, digits);
}

std::string FormatFixed(double value, int decimals) {
  return ToChars(value, std::chars_format::fixed, decimals);
}

void AppendTenths(std::string* out, long tenths) {
  if (tenths < 0) {
    *out += '-';
    tenths = -tenths;
  }
  const long whole = tenths / 10;
  const long fraction = tenths % 10;
  if (whole != 0 || fraction == 0) *out += std::to_string(whole);
  if (fraction != 0) {
    *out += '.';
    *out += static_cast<char>('0' + fraction);
  }
}

}  // namespace upright::runner::report
