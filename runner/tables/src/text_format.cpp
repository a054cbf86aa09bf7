#include "upright/runner/text_format.hpp"

#include <charconv>
#include <cmath>

namespace upright::runner {

void AppendNumber(std::string* out, double value) {
  if (std::isnan(value)) return;
  if (value == 0) value = 0;  // -0 → 0
  char buffer[32];
  // chars_format::general with a precision is defined as printf's %.*g in the "C" locale.
  const auto result =
      std::to_chars(buffer, buffer + sizeof buffer, value, std::chars_format::general, 6);
  out->append(buffer, result.ptr);
}

std::string FormatNumber(double value) {
  std::string text;
  AppendNumber(&text, value);
  return text;
}

void AppendCsvField(std::string* out, std::string_view text) {
  // RFC 4180 §2: fields containing line breaks (CRLF), double quotes or commas should be enclosed
  // in double quotes (rule 6); a double quote inside such a field is escaped by preceding it with
  // another double quote (rule 7). Records here end in LF, which CSV readers accept alike.
  if (text.find_first_of(",\"\r\n") == std::string_view::npos) {
    out->append(text);
    return;
  }
  out->push_back('"');
  for (char c : text) {
    if (c == '"') out->push_back('"');
    out->push_back(c);
  }
  out->push_back('"');
}

const char* CsvBool(bool value) { return value ? "true" : "false"; }

std::string FormatReadable(double value) {
  if (std::isnan(value)) return "—";
  if (value == 0) return "0";
  if (std::isinf(value)) return value > 0 ? "inf" : "-inf";
  char buffer[64];
  // Round to 3 significant digits first, so the decimals below follow the rounded magnitude
  // (9.996 → 10.0, not 10.00).
  auto result = std::to_chars(buffer, buffer + sizeof buffer, value, std::chars_format::general, 3);
  double rounded = 0;
  std::from_chars(buffer, result.ptr, rounded);
  const double magnitude = std::fabs(rounded);
  if (magnitude < 1e-3 || magnitude >= 1e15) return std::string(buffer, result.ptr);
  const int exponent = static_cast<int>(std::floor(std::log10(magnitude)));
  const int decimals = exponent >= 2 ? 0 : 2 - exponent;
  // Integers of 4 digits and more keep all of them: format the original value, not the rounded.
  result = std::to_chars(buffer, buffer + sizeof buffer, exponent >= 2 ? value : rounded,
                         std::chars_format::fixed, decimals);
  return std::string(buffer, result.ptr);
}

std::string MarkdownCell(std::string_view text) {
  std::string cell;
  cell.reserve(text.size());
  for (char c : text) {
    if (c == '|') {
      cell += "\\|";
    } else if (c == '\n' || c == '\r') {
      cell += ' ';
    } else {
      cell += c;
    }
  }
  return cell;
}

void AppendMarkdownCell(std::string* md, std::string_view text) {
  md->push_back(' ');
  md->append(text);
  md->append(" |");
}

}  // namespace upright::runner
