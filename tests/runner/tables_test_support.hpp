// Test helpers for the result tables: runs with figures set by their summary.csv column name (so a
// test does not depend on the catalogue's other columns), a batch written into a scratch folder,
// and CSV files read back by column name.
#pragma once

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <initializer_list>
#include <map>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/results_writer.hpp"

namespace upright::runner::testing {

// The RunMetrics field of summary.csv column `name`; a test failure and null when the catalogue
// has no such column.
inline double RunMetrics::*FieldOf(const std::string& name) {
  for (const MetricColumn& column : MetricColumns()) {
    if (name == column.name) return column.field;
  }
  ADD_FAILURE() << "no metric column " << name;
  return nullptr;
}

using Figures = std::initializer_list<std::pair<const char*, double>>;

// A run of `steps` physics steps with the figures in `figures`; every other figure as RunMetrics
// starts it.
inline RunResult MakeTableRun(const std::string& scenario, const std::string& controller,
                              std::uint64_t seed, bool baseline, RunStatus status,
                              Figures figures = {}, long steps = 1000) {
  RunResult run;
  run.scenario = scenario;
  run.controller = controller;
  run.seed = seed;
  run.baseline = baseline;
  run.steps = steps;
  run.metrics.status = status;
  run.metrics.message = status == RunStatus::kOk ? "survived" : "did not survive";
  run.metrics.end_time_s = 0.001 * static_cast<double>(steps);
  for (const auto& [name, value] : figures) {
    if (auto field = FieldOf(name)) run.metrics.*field = value;
  }
  return run;
}

// The scratch folder of this test process, removed when the process ends.
inline const std::filesystem::path& TablesScratchRoot() {
  struct Root {
    std::filesystem::path path = std::filesystem::temp_directory_path() /
                                 ("upright-tables-test-" + std::to_string(::getpid()));
    ~Root() {
      std::error_code ec;
      std::filesystem::remove_all(path, ec);
    }
  };
  static const Root root;
  return root.path;
}

// Writes `batch` into a fresh scratch folder named after `name` and returns the folder.
inline std::filesystem::path WriteTables(const BatchResult& batch, const std::string& name) {
  const auto dir = TablesScratchRoot() / name;
  std::filesystem::remove_all(dir);
  const Status written = WriteResults(dir.string(), batch);
  EXPECT_TRUE(written) << written.error();
  return dir;
}

inline std::string ReadText(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// A CSV file without quoted fields, its records as maps from column name to cell.
struct CsvRecords {
  std::vector<std::string> header;
  std::vector<std::map<std::string, std::string>> rows;

  // The first record whose cells match every (column, value) of `keys`; a test failure and an
  // empty record when there is none.
  std::map<std::string, std::string> Find(
      std::initializer_list<std::pair<const char*, std::string>> keys) const {
    for (const auto& row : rows) {
      bool match = true;
      for (const auto& [column, value] : keys) {
        const auto cell = row.find(column);
        match = match && cell != row.end() && cell->second == value;
      }
      if (match) return row;
    }
    ADD_FAILURE() << "no record with the keys asked for";
    return {};
  }
};

inline std::vector<std::string> SplitRecord(const std::string& line) {
  std::vector<std::string> cells;
  std::string cell;
  std::stringstream stream(line);
  while (std::getline(stream, cell, ',')) cells.push_back(cell);
  if (!line.empty() && line.back() == ',') cells.push_back("");
  return cells;
}

inline CsvRecords ReadRecords(const std::filesystem::path& path) {
  CsvRecords csv;
  std::stringstream text(ReadText(path));
  std::string line;
  if (std::getline(text, line)) csv.header = SplitRecord(line);
  while (std::getline(text, line)) {
    const std::vector<std::string> cells = SplitRecord(line);
    EXPECT_EQ(cells.size(), csv.header.size()) << line;
    std::map<std::string, std::string> row;
    for (std::size_t i = 0; i < cells.size() && i < csv.header.size(); ++i) {
      row[csv.header[i]] = cells[i];
    }
    csv.rows.push_back(std::move(row));
  }
  return csv;
}

}  // namespace upright::runner::testing
