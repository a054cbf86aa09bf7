// Text pieces every results table shares (runs, sweeps, envelopes): CSV fields quoted per RFC 4180,
// yes/no cells spelled alike, and Markdown cells made safe. Numbers come from
// upright/base/number_text.hpp: CSV figures with 6 significant digits and NaN as an empty field,
// Markdown figures in the readable form with NaN as "—".
#pragma once

#include <string>
#include <string_view>

namespace upright::runner {

// Appends `text` as one CSV field (RFC 4180 §2, rules 5–7): enclosed in double quotes when it
// holds a comma, a double quote, CR or LF, with each double quote doubled; as is otherwise.
void AppendCsvField(std::string* out, std::string_view text);

// `text` with & < > " ' replaced by entity references, for XML or HTML element content and
// attribute values (the report's page, a tuned <controller> element).
std::string XmlEscaped(std::string_view text);

// A yes/no cell of every CSV file: "true" or "false".
const char* CsvBool(bool value);

// `text` for a Markdown table cell: '|' escaped, line breaks as spaces.
std::string MarkdownCell(std::string_view text);

// Appends " <text> |": the next cell of a Markdown table row, `text` already made safe.
void AppendMarkdownCell(std::string* md, std::string_view text);

}  // namespace upright::runner
