// Text pieces every results table shares (runs, sweeps, envelopes): numbers in a fixed,
// locale-independent form, CSV fields quoted per RFC 4180, yes/no cells spelled alike, and
// Markdown cells made safe. The same value always gives the same bytes.
#pragma once

#include <string>
#include <string_view>

namespace upright::runner {

// Appends `value` as printf "%.6g" would in the "C" locale (std::to_chars); -0 prints as 0, NaN
// as nothing (an empty CSV field), ±inf as "inf" / "-inf".
void AppendNumber(std::string* out, double value);

// The same, as a new string.
std::string FormatNumber(double value);

// Appends `text` as one CSV field (RFC 4180 §2, rules 5–7): enclosed in double quotes when it
// holds a comma, a double quote, CR or LF, with each double quote doubled; as is otherwise.
void AppendCsvField(std::string* out, std::string_view text);

// A yes/no cell of every CSV file: "true" or "false".
const char* CsvBool(bool value);

// `value` rounded to 3 significant digits for reading, without an exponent for magnitudes from
// 0.001 up to 10^15 (integers keep all their digits: 1234 → "1234", 0.012345 → "0.0123");
// an exponent outside that range ("1.23e-05"). NaN → "—".
std::string FormatReadable(double value);

// `text` for a Markdown table cell: '|' escaped, line breaks as spaces.
std::string MarkdownCell(std::string_view text);

// Appends " <text> |": the next cell of a Markdown table row, `text` already made safe.
void AppendMarkdownCell(std::string* md, std::string_view text);

}  // namespace upright::runner
