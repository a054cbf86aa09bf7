#include "upright/base/number_text.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <system_error>

namespace upright {
namespace {

// Room for any double in fixed notation (309 digits before the point) with 30 decimals and a sign.
constexpr int kBufferSize = 352;
constexpr int kMaxDigits = 17;
constexpr int kMaxDecimals = 30;

const char* NanMark(NanAs nan) {
  switch (nan) {
    case NanAs::kWord:
      return "nan";
    case NanAs::kEmpty:
      return "";
    case NanAs::kDash:
      return "—";
  }
  return "nan";
}

// Appends what std::to_chars writes for a finite or infinite `value`, applying the rules for zero
// and infinity; `convert` calls to_chars on [first, last).
template <class Convert>
void AppendConverted(std::string* out, double value, NanAs nan, Convert convert) {
  if (std::isnan(value)) {
    out->append(NanMark(nan));
    return;
  }
  if (std::isinf(value)) {
    out->append(value > 0 ? "inf" : "-inf");
    return;
  }
  if (value == 0) value = 0;  // -0 → 0
  char buffer[kBufferSize];
  const auto [end, status] = convert(buffer, buffer + sizeof buffer, value);
  if (status != std::errc{}) {  // cannot happen with the buffer above; say so rather than crash
    out->append("?");
    return;
  }
  const char* begin = buffer;
  const char* const stop = end;
  // A negative value that rounds to zero at the precision asked ("-0.00") loses its sign.
  const auto digit = [](char c) { return c != '0' && c != '.'; };
  if (*begin == '-' && std::find_if(begin + 1, stop, digit) == stop) ++begin;
  out->append(begin, stop);
}

}  // namespace

void AppendShortest(std::string* out, double value, NanAs nan) {
  AppendConverted(out, value, nan,
                  [](char* first, char* last, double v) { return std::to_chars(first, last, v); });
}

std::string ShortestText(double value, NanAs nan) {
  std::string text;
  AppendShortest(&text, value, nan);
  return text;
}

std::string ShortestFixedText(double value) {
  std::string text;
  AppendConverted(&text, value, NanAs::kWord, [](char* first, char* last, double v) {
    return std::to_chars(first, last, v, std::chars_format::fixed);
  });
  return text;
}

std::string WholeOrShortestText(double value) {
  if (value == std::floor(value) && std::abs(value) < 1e15) {
    // A whole number below 10^15 is exact in a long long and prints as its digits.
    char buffer[24];
    const auto result =
        std::to_chars(buffer, buffer + sizeof buffer, static_cast<long long>(value));
    return std::string(buffer, result.ptr);
  }
  return ShortestText(value);
}

void AppendSignificant(std::string* out, double value, int digits, NanAs nan) {
  digits = std::clamp(digits, 1, kMaxDigits);
  AppendConverted(out, value, nan, [digits](char* first, char* last, double v) {
    return std::to_chars(first, last, v, std::chars_format::general, digits);
  });
}

std::string SignificantText(double value, int digits, NanAs nan) {
  std::string text;
  AppendSignificant(&text, value, digits, nan);
  return text;
}

std::string SignedSignificantText(double value, int digits) {
  std::string text = SignificantText(value, digits);
  if (text.front() != '-') text.insert(text.begin(), '+');
  return text;
}

std::string ComplexText(std::complex<double> value, int digits) {
  std::string text = SignificantText(value.real(), digits);
  if (value.imag() == 0) return text;
  return text + SignedSignificantText(value.imag(), digits) + "i";
}

std::string FixedText(double value, int decimals, NanAs nan) {
  decimals = std::clamp(decimals, 0, kMaxDecimals);
  std::string text;
  AppendConverted(&text, value, nan, [decimals](char* first, char* last, double v) {
    return std::to_chars(first, last, v, std::chars_format::fixed, decimals);
  });
  return text;
}

std::string ReadableText(double value, NanAs nan) {
  if (!std::isfinite(value) || value == 0) return SignificantText(value, 3, nan);
  // Round to 3 significant digits first, so the decimals below follow the rounded magnitude
  // (9.996 → 10.0, not 10.00).
  const double rounded = RoundToSignificant(value, 3);
  const double magnitude = std::fabs(rounded);
  if (magnitude < 1e-3 || magnitude >= 1e15) return SignificantText(value, 3);
  const int exponent = static_cast<int>(std::floor(std::log10(magnitude)));
  // Whole numbers of 3 digits and more: no decimals, and all the digits of the value itself.
  if (exponent >= 2) return FixedText(value, 0);
  return FixedText(rounded, 2 - exponent);
}

void AppendTenths(std::string* out, long tenths) {
  if (tenths < 0) out->push_back('-');
  // The magnitude as unsigned, so the most negative long has one too.
  const unsigned long magnitude =
      tenths < 0 ? 0UL - static_cast<unsigned long>(tenths) : static_cast<unsigned long>(tenths);
  const unsigned long whole = magnitude / 10;
  const unsigned long fraction = magnitude % 10;
  if (whole != 0 || fraction == 0) {
    char buffer[24];
    const auto result = std::to_chars(buffer, buffer + sizeof buffer, whole);
    out->append(buffer, result.ptr);
  }
  if (fraction != 0) {
    out->push_back('.');
    out->push_back(static_cast<char>('0' + fraction));
  }
}

double RoundToSignificant(double value, int digits) {
  if (!std::isfinite(value)) return value;
  const std::string text = SignificantText(value, digits);
  double rounded = value;
  std::from_chars(text.data(), text.data() + text.size(), rounded);
  return rounded;
}

}  // namespace upright
