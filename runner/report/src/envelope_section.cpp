// The section of an `upright envelope` results folder.
#include <algorithm>
#include <cmath>
#include <filesystem>

#include "bar_charts.hpp"
#include "html_table.hpp"
#include "html_text.hpp"
#include "sections.hpp"
#include "survival_map.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner::internal {
namespace {

namespace fs = std::filesystem;

std::string Words(std::string text) {
  std::replace(text.begin(), text.end(), '_', ' ');
  return text;
}

std::string WithUnit(double value, const std::string& unit) {
  return SignificantText(value, 4, NanAs::kEmpty) + (unit.empty() ? "" : " " + unit);
}

// The outcome in a few words, under the bar; the failure itself goes in the table.
std::string Note(const std::vector<std::string>& row, int outcome, int survived, int failing,
                 const std::string& unit) {
  const std::string& code = row[outcome];
  const double s = CsvNumber(row[survived]);
  const double f = CsvNumber(row[failing]);
  std::string note;
  if (code == "bracketed") {
    note = "survives up to " + WithUnit(s, unit) + ", fails at " + WithUnit(f, unit);
  } else if (code == "survives_whole_range") {
    note = "survives the whole range";
  } else if (code == "fails_at_both_ends") {
    note = "fails at both ends of the range";
  } else {
    note = code;
  }
  return note;
}

// envelope_map.csv as read: the table, its columns by name and every row's survived cell.
struct MapTable {
  CsvTable table;
  // controller, parameter, value, parameter2, value2, survived, seeds_survived, seeds
  int c[8];
  std::vector<bool> all_survived;  // per row
};

// Reads envelope_map.csv: every column it needs, and every survived cell read before anything is
// drawn (true, false, or the table is refused).
Result<MapTable> ReadMapTable(const std::string& path) {
  Result<CsvTable> read = ReadCsvFile(path);
  if (!read) return Failure(read.error());
  MapTable map;
  map.table = std::move(*read);
  const char* kNames[] = {"controller", "parameter", "value",          "parameter2",
                          "value2",     "survived",  "seeds_survived", "seeds"};
  for (int k = 0; k < 8; ++k) {
    map.c[k] = map.table.Column(kNames[k]);
    if (map.c[k] < 0) {
      return Failure(path + ":1: no column '" + std::string(kNames[k]) + "' in the header");
    }
  }
  map.all_survived.resize(map.table.rows.size());
  for (std::size_t r = 0; r < map.table.rows.size(); ++r) {
    const Result<bool> survived = CsvBoolAt(map.table, r, map.c[5], path);
    if (!survived) return Failure(survived.error());
    map.all_survived[r] = *survived;
  }
  return map;
}

// One controller's survival map from the table's rows, the axes labelled with their units.
SurvivalMap ControllerMapOf(const MapTable& read, const std::string& controller,
                            const std::string& scenario_name, const std::string& unit1,
                            const std::string& unit2) {
  const auto label = [](const std::string& name, const std::string& unit) {
    return unit.empty() ? name : name + " (" + unit + ")";
  };
  const int* c = read.c;
  const std::vector<std::vector<std::string>>& rows = read.table.rows;
  SurvivalMap map;
  map.scenario = scenario_name;
  map.controller = controller;
  for (const auto& row : rows) {
    if (row[c[0]] != controller) continue;
    map.x_label = label(row[c[1]], unit1);
    map.y_label = label(row[c[3]], unit2);
    const double x = CsvNumber(row[c[2]]), y = CsvNumber(row[c[4]]);
    if (std::find(map.xs.begin(), map.xs.end(), x) == map.xs.end()) map.xs.push_back(x);
    if (std::find(map.ys.begin(), map.ys.end(), y) == map.ys.end()) map.ys.push_back(y);
  }
  std::sort(map.xs.begin(), map.xs.end());
  std::sort(map.ys.begin(), map.ys.end());
  map.cells.assign(map.xs.size() * map.ys.size(), MapOutcome::kMissing);
  for (std::size_t r = 0; r < rows.size(); ++r) {
    const auto& row = rows[r];
    if (row[c[0]] != controller) continue;
    const double x = CsvNumber(row[c[2]]), y = CsvNumber(row[c[4]]);
    const auto xi = std::find(map.xs.begin(), map.xs.end(), x) - map.xs.begin();
    const auto yi = std::find(map.ys.begin(), map.ys.end(), y) - map.ys.begin();
    MapOutcome outcome = MapOutcome::kNone;
    if (row[c[6]].empty()) {
      outcome = MapOutcome::kNotRun;
    } else if (read.all_survived[r]) {
      outcome = MapOutcome::kAll;
    } else if (CsvNumber(row[c[6]]) > 0) {
      outcome = MapOutcome::kSome;
    }
    map.cells[static_cast<std::size_t>(yi) * map.xs.size() + static_cast<std::size_t>(xi)] =
        outcome;
  }
  return map;
}

// envelope_map.csv into one map per controller, in file order.
Status AppendMaps(const std::string& path, const std::string& scenario_name,
                  const ResultsFolder& folder, const ManifestInfo& manifest, ReportPage* page) {
  const Result<MapTable> read = ReadMapTable(path);
  if (!read) return Failure(read.error());
  if (read->table.rows.empty()) return {};
  std::string unit1, unit2;
  if (manifest.parameters.size() >= 2) {
    unit1 = manifest.parameters[0].unit;
    unit2 = manifest.parameters[1].unit;
  }
  std::vector<std::string> controllers;
  for (const auto& row : read->table.rows) {
    const std::string& controller = row[read->c[0]];
    if (std::find(controllers.begin(), controllers.end(), controller) == controllers.end()) {
      controllers.push_back(controller);
    }
  }
  const std::string id = folder.id + "map";
  page->toc.push_back({id, "Survival map", 2});
  page->body += "<h3 id=\"" + id +
                "\">Survival map</h3><p>Every controller on a grid of both "
                "parameters (envelope_map.csv); each cell's symbol tells the outcome, its "
                "shade only repeats it.</p><div class=\"figures\">";
  for (const std::string& controller : controllers) {
    page->body +=
        RenderSurvivalMap(ControllerMapOf(*read, controller, scenario_name, unit1, unit2));
  }
  page->body += "</div>";
  return {};
}

}  // namespace

Status AppendEnvelopeSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                             ReportPage* page) {
  const std::string path = (fs::path(folder.path) / "envelope.csv").string();
  const Result<CsvTable> read = ReadCsvFile(path);
  if (!read) return Failure(read.error());
  const CsvTable& table = *read;
  const char* kNames[] = {
      "scenario",  "controller",     "parameter",           "unit",    "lo",     "hi",
      "direction", "survived_value", "first_failing_value", "outcome", "message"};
  int c[11];
  for (int k = 0; k < 11; ++k) {
    c[k] = table.Column(kNames[k]);
    if (c[k] < 0) {
      return Failure(path + ":1: no column '" + std::string(kNames[k]) + "' in the header");
    }
  }
  const std::string section_id = folder.id + "envelope";
  const std::string where = folder.relative == "." ? "this folder" : folder.relative + "/";
  page->toc.push_back({section_id, "Survival envelope: " + where, 1});
  std::string& html = page->body;
  html += "<section><h2 id=\"" + section_id + "\">Survival envelope: " + Escape(where) + "</h2>";
  if (table.rows.empty()) {
    html += "<p class=\"muted\">envelope.csv holds no controller.</p></section>\n";
    return {};
  }
  EnvelopeChart chart;
  const auto& first = table.rows.front();
  chart.scenario = first[c[0]];
  chart.parameter = first[c[2]];
  chart.unit = first[c[3]];
  chart.lo = CsvNumber(first[c[4]]);
  chart.hi = CsvNumber(first[c[5]]);
  if (!manifest.parameters.empty() && manifest.parameters[0].has_scenario_value) {
    chart.scenario_value = manifest.parameters[0].scenario_value;
  }
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const auto& row = table.rows[r];
    EnvelopeBar bar;
    bar.name = row[c[1]];
    bar.style = r;
    bar.survived = CsvNumber(row[c[7]]);
    bar.first_failing = CsvNumber(row[c[8]]);
    bar.downward = row[c[6]] == "downward";
    bar.note = Note(row, c[9], c[7], c[8], chart.unit);
    chart.bars.push_back(std::move(bar));
  }
  html += "<p>Scenario " + Escape(chart.scenario) + ": the hardest value of <code>" +
          Escape(chart.parameter) + "</code> each controller survives on every seed (bar), and " +
          "the first value that failed (cross), from envelope.csv. The limit lies between them "
          "if survival is monotone in the parameter.</p>";
  html += RenderEnvelopeBars(chart);
  const std::string unit = chart.unit.empty() ? "" : " (" + chart.unit + ")";
  HtmlTable details(
      {"controller", "survived" + unit, "first failing" + unit, "outcome", "what failed"},
      {false, true, true, false, false});
  for (const auto& row : table.rows) {
    details.AddRow({{row[c[1]], false, ""},
                    NumberCell(row[c[7]]),
                    NumberCell(row[c[8]]),
                    {Words(row[c[9]]), false, ""},
                    {row[c[10]], false, ""}});
  }
  html += details.Html("Envelope (envelope.csv)");
  const std::string map_path = (fs::path(folder.path) / "envelope_map.csv").string();
  std::error_code ec;
  if (fs::is_regular_file(map_path, ec)) {
    if (Status maps = AppendMaps(map_path, chart.scenario, folder, manifest, page); !maps) {
      return maps;
    }
  }
  page->body += "</section>\n";
  return {};
}

}  // namespace upright::runner::internal
