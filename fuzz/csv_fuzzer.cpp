// libFuzzer target: any bytes as a results table the report reads back (RFC 4180 CSV), every
// cell then read as a number and as a yes/no cell, as the report's sections read them.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "upright/runner/report/csv_reader.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const auto table = upright::runner::ParseCsv(text, "fuzz.csv");
  if (!table) return 0;
  for (std::size_t r = 0; r < table->rows.size(); ++r) {
    for (std::size_t c = 0; c < table->rows[r].size(); ++c) {
      (void)upright::runner::CsvNumber(table->rows[r][c]);
      (void)upright::runner::CsvBoolAt(*table, r, static_cast<int>(c), "fuzz.csv");
    }
  }
  return 0;
}
