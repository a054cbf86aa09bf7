// Reading the results tables back: CSV text (RFC 4180) in, a header and rows of fields out, with
// the line each row starts on for messages. The report reads every table of a results folder
// through it.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner {

struct CsvTable {
  std::vector<std::string> header;             // the first record's fields
  std::vector<std::vector<std::string>> rows;  // every later record, each as wide as the header
  std::vector<int> lines;                      // the 1-based line each row starts on

  // The index of the column named `name`, or -1 when the header has none.
  int Column(std::string_view name) const;
};

// Parses RFC 4180 text: fields separated by commas, records by LF or CRLF, the first record the
// header; a field in double quotes may hold commas, line breaks and doubled quotes (""). A last
// line break is optional. Fails ("<path>:<line>: <what>") when the text is empty, a quote is never
// closed, a character follows a closing quote, a quote appears inside an unquoted field, or a
// record's field count differs from the header's.
Result<CsvTable> ParseCsv(std::string_view text, const std::string& path);

// Reads and parses the file at `path`; a file that cannot be read gives
// "cannot read <path>: <reason>".
Result<CsvTable> ReadCsvFile(const std::string& path);

// A cell as a number: "" → NaN; "inf", "-inf" and any decimal or exponent form as written
// (std::from_chars, locale-independent). Text that is not a number gives NaN too.
double CsvNumber(std::string_view cell);

// The yes/no cell in `column` of row `row` (indices into table.rows and the header): "true" or
// "false", as every results table writes them. Any other text is no answer:
// "<path>:<line>: <column name> = '<text>': expected true or false".
Result<bool> CsvBoolAt(const CsvTable& table, std::size_t row, int column, const std::string& path);

}  // namespace upright::runner
