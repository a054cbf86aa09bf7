// Text pieces of the report: strings made safe for HTML and SVG (which the report writes as
// well-formed XML), and numbers in a fixed, locale-independent form, so the same inputs always
// give the same bytes.
#pragma once

#include <string>
#include <string_view>

namespace upright::runner::report {

// `text` with & < > " ' replaced by entity references, for element content and attribute values.
std::string Escape(std::string_view text);

// `value` with `digits` significant digits as printf "%.<digits>g" would in the "C" locale
// (std::to_chars); -0 as "0"; NaN as ""; ±inf as "inf" / "-inf".
std::string FormatSignificant(double value, int digits);

// `value` with `decimals` digits after the point, "C" locale; -0 as "0"; NaN as "".
std::string FormatFixed(double value, int decimals);

// Appends a length in tenths of a unit as the shortest decimal: 123 → "12.3", 120 → "12",
// 5 → ".5", -5 → "-.5". Coordinates in SVG paths, where every byte counts.
void AppendTenths(std::string* out, long tenths);

}  // namespace upright::runner::report
