#include "upright/runner/report/csv_reader.hpp"

#include <charconv>
#include <limits>

#include "read_file.hpp"

namespace upright::runner {
namespace {

// A record split into fields, and the line it started on.
struct RecordParse {
  std::vector<std::string> fields;
  int start_line = 1;
};

// Parses one record starting at text[*at] (on line *line); advances both past its line break.
Result<RecordParse> ParseRecord(std::string_view text, std::size_t* at, int* line,
                                const std::string& path) {
  RecordParse record;
  record.start_line = *line;
  std::string field;
  std::size_t i = *at;
  while (true) {
    field.clear();
    if (i < text.size() && text[i] == '"') {
      const int quote_line = *line;
      ++i;
      while (true) {
        if (i >= text.size()) {
          return Failure(path + ":" + std::to_string(quote_line) +
                         ": a quoted field is never closed (expected a closing '\"')");
        }
        const char c = text[i];
        if (c == '"') {
          if (i + 1 < text.size() && text[i + 1] == '"') {
            field += '"';
            i += 2;
            continue;
          }
          ++i;
          break;
        }
        if (c == '\n') ++*line;
        field += c;
        ++i;
      }
      if (i < text.size() && text[i] != ',' && text[i] != '\n' &&
          !(text[i] == '\r' && i + 1 < text.size() && text[i + 1] == '\n')) {
        return Failure(path + ":" + std::to_string(*line) + ": '" + std::string(1, text[i]) +
                       "' after a closing quote (expected ',' or the end of the line)");
      }
    } else {
      while (i < text.size() && text[i] != ',' && text[i] != '\n' &&
             !(text[i] == '\r' && i + 1 < text.size() && text[i + 1] == '\n')) {
        if (text[i] == '"') {
          return Failure(path + ":" + std::to_string(*line) +
                         ": a quote inside an unquoted field (expected the whole field in quotes)");
        }
        field += text[i];
        ++i;
      }
    }
    record.fields.push_back(field);
    if (i < text.size() && text[i] == ',') {
      ++i;
      continue;
    }
    // The end of the record: a line break or the end of the text.
    if (i < text.size()) {
      i += text[i] == '\r' ? 2 : 1;
      ++*line;
    }
    *at = i;
    return record;
  }
}

}  // namespace

int CsvTable::Column(std::string_view name) const {
  for (std::size_t c = 0; c < header.size(); ++c) {
    if (header[c] == name) return static_cast<int>(c);
  }
  return -1;
}

Result<CsvTable> ParseCsv(std::string_view text, const std::string& path) {
  if (text.empty()) return Failure(path + ":1: empty file (expected a header line)");
  std::size_t at = 0;
  int line = 1;
  Result<RecordParse> header = ParseRecord(text, &at, &line, path);
  if (!header) return Failure(header.error());
  CsvTable table;
  table.header = std::move(header->fields);
  while (at < text.size()) {
    Result<RecordParse> record = ParseRecord(text, &at, &line, path);
    if (!record) return Failure(record.error());
    if (record->fields.size() != table.header.size()) {
      return Failure(path + ":" + std::to_string(record->start_line) + ": " +
                     std::to_string(record->fields.size()) + " field(s) (expected " +
                     std::to_string(table.header.size()) + ", as in the header)");
    }
    table.rows.push_back(std::move(record->fields));
    table.lines.push_back(record->start_line);
  }
  return table;
}

Result<CsvTable> ReadCsvFile(const std::string& path) {
  const Result<std::string> text = internal::ReadWholeFile(path);
  if (!text) return Failure(text.error());
  return ParseCsv(*text, path);
}

double CsvNumber(std::string_view cell) {
  double value = std::numeric_limits<double>::quiet_NaN();
  if (cell.empty()) return value;
  const char* first = cell.data();
  const char* last = cell.data() + cell.size();
  // from_chars takes no leading '+'; the tables never write one, but accept it.
  if (*first == '+') ++first;
  const auto [end, ec] = std::from_chars(first, last, value);
  if (ec != std::errc() || end != last) return std::numeric_limits<double>::quiet_NaN();
  return value;
}

Result<bool> CsvBoolAt(const CsvTable& table, std::size_t row, int column,
                       const std::string& path) {
  const std::string& cell = table.rows.at(row).at(static_cast<std::size_t>(column));
  if (cell == "true" || cell == "false") return cell == "true";
  return Failure(path + ":" + std::to_string(table.lines.at(row)) + ": " +
                 table.header.at(static_cast<std::size_t>(column)) + " = '" + cell +
                 "': expected true or false");
}

}  // namespace upright::runner
