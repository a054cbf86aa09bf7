#include "upright/runner/csv_reader.hpp"

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
bool ParseRecord(std::string_view text, std::size_t* at, int* line, const std::string& path,
                 RecordParse* record, std::string* error) {
  record->fields.clear();
  record->start_line = *line;
  std::string field;
  std::size_t i = *at;
  while (true) {
    field.clear();
    if (i < text.size() && text[i] == '"') {
      const int quote_line = *line;
      ++i;
      while (true) {
        if (i >= text.size()) {
          *error = path + ":" + std::to_string(quote_line) +
                   ": a quoted field is never closed (expected a closing '\"')";
          return false;
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
        *error = path + ":" + std::to_string(*line) + ": '" + std::string(1, text[i]) +
                 "' after a closing quote (expected ',' or the end of the line)";
        return false;
      }
    } else {
      while (i < text.size() && text[i] != ',' && text[i] != '\n' &&
             !(text[i] == '\r' && i + 1 < text.size() && text[i + 1] == '\n')) {
        if (text[i] == '"') {
          *error = path + ":" + std::to_string(*line) +
                   ": a quote inside an unquoted field (expected the whole field in quotes)";
          return false;
        }
        field += text[i];
        ++i;
      }
    }
    record->fields.push_back(field);
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
    return true;
  }
}

}  // namespace

int CsvTable::Column(std::string_view name) const {
  for (std::size_t c = 0; c < header.size(); ++c) {
    if (header[c] == name) return static_cast<int>(c);
  }
  return -1;
}

bool ParseCsv(std::string_view text, const std::string& path, CsvTable* table, std::string* error) {
  *table = CsvTable{};
  if (text.empty()) {
    *error = path + ":1: empty file (expected a header line)";
    return false;
  }
  std::size_t at = 0;
  int line = 1;
  RecordParse record;
  if (!ParseRecord(text, &at, &line, path, &record, error)) return false;
  table->header = record.fields;
  while (at < text.size()) {
    if (!ParseRecord(text, &at, &line, path, &record, error)) return false;
    if (record.fields.size() != table->header.size()) {
      *error = path + ":" + std::to_string(record.start_line) + ": " +
               std::to_string(record.fields.size()) + " field(s) (expected " +
               std::to_string(table->header.size()) + ", as in the header)";
      return false;
    }
    table->rows.push_back(record.fields);
    table->lines.push_back(record.start_line);
  }
  return true;
}

bool ReadCsvFile(const std::string& path, CsvTable* table, std::string* error) {
  std::string text;
  if (!report::ReadWholeFile(path, &text, error)) return false;
  return ParseCsv(text, path, table, error);
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

bool CsvBoolAt(const CsvTable& table, std::size_t row, int column, const std::string& path,
               bool* value, std::string* error) {
  const std::string& cell = table.rows.at(row).at(static_cast<std::size_t>(column));
  if (cell == "true" || cell == "false") {
    *value = cell == "true";
    return true;
  }
  *error = path + ":" + std::to_string(table.lines.at(row)) + ": " +
           table.header.at(static_cast<std::size_t>(column)) + " = '" + cell +
           "': expected true or false";
  return false;
}

}  // namespace upright::runner
