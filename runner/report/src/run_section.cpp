// The section of an `upright run` / `upright demo` results folder.
#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <filesystem>
#include <map>
#include <optional>

#include "bar_charts.hpp"
#include "html_table.hpp"
#include "html_text.hpp"
#include "line_plot.hpp"
#include "sections.hpp"
#include "trace_reader.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/metrics/run_metrics.hpp"
#include "upright/runner/report/csv_reader.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/metric_floors.hpp"
#include "upright/runner/tables/results_writer.hpp"
#include "upright/runner/tables/verdict.hpp"

namespace upright::runner::internal {
namespace {

namespace fs = std::filesystem;

// Column indices a table must have, or the first one missing.
Result<std::vector<int>> Columns(const CsvTable& table, const std::string& path,
                                 std::initializer_list<const char*> names) {
  std::vector<int> columns;
  for (const char* name : names) {
    const int c = table.Column(name);
    if (c < 0) return Failure(path + ":1: no column '" + name + "' in the header");
    columns.push_back(c);
  }
  return columns;
}

std::uint64_t SeedOf(const std::string& text) {
  std::uint64_t seed = 0;
  std::from_chars(text.data(), text.data() + text.size(), seed);
  return seed;
}

bool IsStatusWord(const std::string& label) {
  RunStatus status;
  return FromString(label, &status);
}

std::string Words(std::string text) {
  std::replace(text.begin(), text.end(), '_', ' ');
  return text;
}

// A column or metric name as a heading: the catalogue's label with its unit ("max tilt (deg)"),
// survival as "survival (%)", any other name with spaces for underscores.
std::string Heading(const std::string& name) {
  for (const MetricColumn& column : MetricColumns()) {
    if (name == column.name) return column.label;
  }
  if (name == "survival_rate") return "survival (%)";
  return Words(name);
}

// One row of summary.csv, by name.
struct RunRow {
  std::string scenario, controller, seed_text, status;
  std::uint64_t seed = 0;
  bool baseline = false;
  double fall_time_s = kNoValue;
  const std::vector<std::string>* cells = nullptr;
};

struct ScenarioRuns {
  std::string name;
  std::vector<std::string> controllers;  // in file order
  std::string baseline;
  std::vector<std::uint64_t> seeds;  // ascending
  std::vector<const RunRow*> rows;   // in file order
};

struct ControllerTrace {
  std::string controller;
  std::size_t style = 0;
  const RunRow* run = nullptr;
  bool loaded = false;
  TraceSignals signals;
};

struct Signal {
  const char* kind;
  const char* title;
  const char* y_label;
  std::vector<double> TraceSignals::*values;
  std::vector<double> TraceSignals::*twin;  // nullptr: no twin line
};

constexpr Signal kSignals[] = {
    {"tilt", "Tilt", "tilt, pitch (deg)", &TraceSignals::pitch_deg, &TraceSignals::twin_pitch_deg},
    {"position", "Position", "axle x (m)", &TraceSignals::x_m, &TraceSignals::twin_x_m},
    {"drift", "Drift from the commanded path", "drift (m)", &TraceSignals::drift_m, nullptr},
    {"torque", "Wheel torque, mean of left and right", "torque (N·m)", &TraceSignals::torque_Nm,
     nullptr},
    {"slip", "Slip ratio, the wheel with the larger |slip|", "slip ratio (–)", &TraceSignals::slip,
     nullptr},
};

double LastFinite(const std::vector<double>& values) {
  for (auto it = values.rbegin(); it != values.rend(); ++it) {
    if (std::isfinite(*it)) return *it;
  }
  return kNoValue;
}

// The trace file of `run`: the manifest's, which must lie inside the results folder (after
// links are followed), else traces/<TraceFileName>.
Result<std::string> TracePath(const ResultsFolder& folder, const ManifestInfo& manifest,
                              const RunRow& run) {
  for (const ManifestRun& m : manifest.runs) {
    if (m.scenario == run.scenario && m.controller == run.controller && m.seed == run.seed &&
        !m.trace.empty()) {
      const fs::path path = fs::path(folder.path) / m.trace;
      std::error_code ec;
      const fs::path inside = fs::weakly_canonical(folder.path, ec);
      const fs::path resolved = fs::weakly_canonical(path, ec);
      const fs::path relative = resolved.lexically_relative(inside);
      if (ec || fs::path(m.trace).is_absolute() || relative.empty() || *relative.begin() == "..") {
        return Failure((fs::path(folder.path) / "manifest.json").string() + ": the trace of " +
                       run.scenario + " " + run.controller + " seed " + run.seed_text + ", '" +
                       m.trace +
                       "', lies outside the results folder; the report reads only files inside "
                       "it");
      }
      return path.string();
    }
  }
  RunResult named;
  named.scenario = run.scenario;
  named.controller = run.controller;
  named.seed = run.seed;
  return (fs::path(folder.path) / "traces" / TraceFileName(named)).string();
}

// Each controller's plotted run of one scenario with its trace read, the controllers whose trace
// file is missing, and the seeds plotted.
struct PlottedRuns {
  std::vector<ControllerTrace> traces;
  std::vector<std::string> missing;
  std::vector<std::string> seeds;  // the seed texts plotted, each once, in controller order
};

// Seed 1 of each controller when it ran it, else its smallest seed; its trace read when the file
// is there. Fails when a trace file is malformed.
Result<PlottedRuns> LoadPlottedRuns(const ResultsFolder& folder, const ManifestInfo& manifest,
                                    const ScenarioRuns& scenario) {
  PlottedRuns plotted;
  for (std::size_t c = 0; c < scenario.controllers.size(); ++c) {
    ControllerTrace t;
    t.controller = scenario.controllers[c];
    t.style = c;
    for (const RunRow* row : scenario.rows) {
      if (row->controller != t.controller) continue;
      if (t.run == nullptr || (row->seed == 1) || (t.run->seed != 1 && row->seed < t.run->seed)) {
        t.run = row;
      }
    }
    if (t.run == nullptr) continue;
    const Result<std::string> traced = TracePath(folder, manifest, *t.run);
    if (!traced) return Failure(traced.error());
    const std::string& path = *traced;
    std::error_code ec;
    if (!fs::is_regular_file(path, ec)) {
      if (t.run->status != "setup_failed") plotted.missing.push_back(t.controller);
      plotted.traces.push_back(std::move(t));
      continue;
    }
    Result<TraceSignals> signals = ReadTrace(path);
    if (!signals) return Failure(signals.error());
    t.signals = std::move(*signals);
    t.loaded = !t.signals.time_s.empty();
    std::vector<std::string>& seeds = plotted.seeds;
    if (std::find(seeds.begin(), seeds.end(), t.run->seed_text) == seeds.end()) {
      seeds.push_back(t.run->seed_text);
    }
    plotted.traces.push_back(std::move(t));
  }
  return plotted;
}

// The scenario's events: from the trace that ran longest, since a run cut short shows only the
// events up to its end. Status marks ("fell") are drawn per run instead.
std::vector<PlotEvent> ScenarioEvents(const std::vector<ControllerTrace>& traces) {
  const ControllerTrace* longest = nullptr;
  for (const ControllerTrace& t : traces) {
    if (!t.loaded) continue;
    if (longest == nullptr || t.signals.time_s.back() > longest->signals.time_s.back()) {
      longest = &t;
    }
  }
  std::vector<PlotEvent> events;
  if (longest == nullptr) return events;
  for (const TraceLabel& label : longest->signals.labels) {
    if (IsStatusWord(label.label)) continue;
    events.push_back({label.time_s, "E" + std::to_string(events.size() + 1), label.label});
  }
  return events;
}

// The paragraphs above the figures: which seeds, how thinned, missing traces, the events.
void AppendPlotNotes(const PlottedRuns& plotted, const std::vector<PlotEvent>& events,
                     const ReportOptions& options, std::string* html) {
  std::string seeds_used;
  for (const std::string& seed : plotted.seeds) {
    seeds_used += (seeds_used.empty() ? "seed " : ", seed ") + seed;
  }
  *html += "<p>Traces of " + Escape(seeds_used.empty() ? "no seed" : seeds_used) +
           " (seed 1 when it was run, else each controller's first seed), thinned to at most " +
           std::to_string(options.max_points) +
           " samples per line by min/max decimation, which keeps every peak.";
  if (!plotted.missing.empty()) {
    std::string names;
    for (const auto& m : plotted.missing) names += (names.empty() ? "" : ", ") + m;
    *html += " No trace file for " + Escape(names) + ".";
  }
  *html += "</p>";
  if (!events.empty()) {
    *html += "<p>Events (dashed lines, at the trace row that carries them):";
    for (const PlotEvent& e : events) {
      *html += " <strong>" + Escape(e.tag) + "</strong> " + FixedText(e.time_s, 2, NanAs::kEmpty) +
               " s " + Escape(e.label) + ";";
    }
    html->back() = '.';
    *html += "</p>";
  }
}

// One figure of `signal`: every loaded trace, its twin when it has one, a mark where a run ended
// short of ok.
LinePlot SignalPlot(const Signal& signal, const std::string& scenario,
                    const std::vector<ControllerTrace>& traces,
                    const std::vector<PlotEvent>& events, double x_max) {
  LinePlot plot;
  plot.kind = signal.kind;
  plot.scenario = scenario;
  plot.title = signal.title;
  plot.y_label = signal.y_label;
  plot.x_max_s = x_max;
  plot.events = events;
  for (const ControllerTrace& t : traces) {
    if (!t.loaded) continue;
    const TraceSignals& s = t.signals;
    plot.series.push_back({t.controller, t.style, false, s.time_s, s.*signal.values});
    if (signal.twin != nullptr && s.has_twin) {
      plot.series.push_back(
          {t.controller + " (linear twin)", t.style, true, s.time_s, s.*signal.twin});
    }
    if (t.run->status != "ok") {
      const double at = std::isfinite(t.run->fall_time_s) ? t.run->fall_time_s : s.time_s.back();
      plot.marks.push_back({s.time_s.back(), LastFinite(s.*signal.values), t.style,
                            t.controller + " " + Words(t.run->status) + " at " +
                                FixedText(at, 3, NanAs::kEmpty) + " s"});
    }
  }
  return plot;
}

// The plots of one scenario: one figure per signal, every controller's first-seed trace in it.
Status AppendPlots(const ResultsFolder& folder, const ManifestInfo& manifest,
                   const ReportOptions& options, const ScenarioRuns& scenario, std::string* html) {
  const Result<PlottedRuns> loaded = LoadPlottedRuns(folder, manifest, scenario);
  if (!loaded) return Failure(loaded.error());
  const PlottedRuns& plotted = *loaded;
  const std::vector<ControllerTrace>& traces = plotted.traces;
  const bool any =
      std::any_of(traces.begin(), traces.end(), [](const ControllerTrace& t) { return t.loaded; });
  if (!any) {
    *html +=
        "<p class=\"muted\">No traces for this scenario in the folder (run with "
        "<code>--trace-rate</code> above 0 to plot them).</p>";
    return {};
  }
  const std::vector<PlotEvent> events = ScenarioEvents(traces);
  double x_max = 0;
  for (const ControllerTrace& t : traces) {
    if (t.loaded) x_max = std::max(x_max, t.signals.time_s.back());
  }
  AppendPlotNotes(plotted, events, options, html);
  *html += "<div class=\"figures\">";
  for (const Signal& signal : kSignals) {
    *html += RenderLinePlot(SignalPlot(signal, scenario.name, traces, events, x_max),
                            options.max_points);
  }
  *html += "</div>";
  return {};
}

HtmlCell StatusCell(const std::string& status) {
  if (status == "ok") return {"✔ ok", false, ""};
  if (status == "setup_failed" || status == "not_run") return {"! " + Words(status), false, "bad"};
  return {"✘ " + Words(status), false, "bad"};
}

void AppendSummaryTable(const CsvTable& summary, const ScenarioRuns& scenario, std::string* html) {
  std::vector<int> shown;
  std::vector<std::string> header;
  std::vector<bool> numeric;
  for (std::size_t c = 0; c < summary.header.size(); ++c) {
    const std::string& name = summary.header[c];
    if (name == "scenario" || name == "baseline" || name == "survived") continue;
    shown.push_back(static_cast<int>(c));
    header.push_back(name);
    numeric.push_back(name != "controller" && name != "status" && name != "message");
  }
  std::vector<std::string> headings;
  for (const std::string& name : header) headings.push_back(Heading(name));
  HtmlTable table(headings, numeric);
  for (const RunRow* row : scenario.rows) {
    std::vector<HtmlCell> cells;
    for (std::size_t k = 0; k < shown.size(); ++k) {
      const std::string& name = header[k];
      const std::string& cell = (*row->cells)[static_cast<std::size_t>(shown[k])];
      if (name == "controller") {
        cells.push_back({cell + (row->baseline ? " (baseline)" : ""), false, ""});
      } else if (name == "status") {
        cells.push_back(StatusCell(cell));
      } else if (numeric[k]) {
        cells.push_back(NumberCell(cell));
      } else {
        cells.push_back({cell, false, ""});
      }
    }
    table.AddRow(std::move(cells));
  }
  *html += table.Html("Summary: every run (summary.csv); – : does not apply");
}

// compare.csv of one scenario as metric rows × controller columns. Each controller is compared
// with the baseline over the seeds both survived, so a cell carries both means.
Status AppendCompareTable(const CsvTable& compare, const std::string& path,
                          const ScenarioRuns& scenario, std::string* html) {
  const Result<std::vector<int>> columns =
      Columns(compare, path,
              {"scenario", "baseline", "controller", "metric", "better_when", "baseline_mean",
               "controller_mean", "diff_abs", "diff_pct", "direction", "verdict"});
  if (!columns) return Failure(columns.error());
  const std::vector<int>& c = *columns;
  std::vector<std::string> metrics, controllers;
  std::map<std::pair<std::string, std::string>, const std::vector<std::string>*> cell;
  std::map<std::string, std::string> better_when;
  std::string baseline;
  for (const auto& row : compare.rows) {
    if (row[c[0]] != scenario.name) continue;
    baseline = row[c[1]];
    const std::string& controller = row[c[2]];
    const std::string& metric = row[c[3]];
    if (std::find(metrics.begin(), metrics.end(), metric) == metrics.end()) {
      metrics.push_back(metric);
      better_when[metric] = row[c[4]];
    }
    if (std::find(controllers.begin(), controllers.end(), controller) == controllers.end()) {
      controllers.push_back(controller);
    }
    cell[{metric, controller}] = &row;
  }
  if (metrics.empty()) return {};
  std::vector<std::string> header = {"figure", "better when"};
  std::vector<bool> numeric = {false, false};
  for (const auto& name : controllers) {
    header.push_back(name + " vs " + baseline);
    numeric.push_back(true);
  }
  HtmlTable table(header, numeric);
  for (const std::string& metric : metrics) {
    // Survival shows as a percentage of runs, as in compare.md.
    const bool survival = better_when[metric] == "higher";
    const auto mean_text = [&](const std::string& text) {
      const double value = CsvNumber(text);
      if (!std::isfinite(value)) return std::string("–");
      return survival ? SignificantText(value * 100, 3, NanAs::kEmpty) : NumberCell(text).text;
    };
    std::vector<HtmlCell> cells = {{Heading(metric), false, ""}, {better_when[metric], false, ""}};
    for (const std::string& controller : controllers) {
      const auto found = cell.find({metric, controller});
      if (found == cell.end()) {
        cells.push_back({"–", true, "na"});
        continue;
      }
      const auto& row = *found->second;
      std::string text = mean_text(row[c[6]]) + " vs " + mean_text(row[c[5]]);
      const double diff_abs = CsvNumber(row[c[7]]);
      if (std::isfinite(diff_abs)) {
        text += " (" +
                DifferenceText(diff_abs, CsvNumber(row[c[8]]), FloorOf(metric).unit, survival) +
                ")";
      }
      Verdict verdict = Verdict::kNotApplicable, direction = Verdict::kNotApplicable;
      FromString(row[c[10]], &verdict);
      FromString(row[c[9]], &direction);
      text += " " + VerdictMark(verdict, direction);
      std::string css = "na";
      if (verdict == Verdict::kBetter) css = "better";
      if (verdict == Verdict::kWorse) css = "worse";
      if (verdict == Verdict::kSame || verdict == Verdict::kIndicative) css = "";
      cells.push_back({text, true, css});
    }
    table.AddRow(std::move(cells));
  }
  *html += table.Html(
      "Against the baseline (compare.csv; compare.md gives the spreads and the paired tests): "
      "each cell is the controller's mean vs the baseline's, survival over every run and every "
      "other figure over the seeds both survived (a fall ends a run early, so its totals are not "
      "comparable); the difference in % of the baseline (in the figure's unit below its floor, "
      "\"abs.\"; survival in percentage points, pp). " +
      VerdictLegend() + ".");
  return {};
}

Status AppendGapChart(const CsvTable& gap, const std::string& path, const ScenarioRuns& scenario,
                      std::string* html) {
  const Result<std::vector<int>> columns =
      Columns(gap, path,
              {"scenario", "controller", "seed", "peak_tilt_linear_deg", "peak_tilt_plant_deg",
               "tilt_diverge_s", "drift_diverge_s", "plant_status", "twin_message"});
  if (!columns) return Failure(columns.error());
  const std::vector<int>& c = *columns;
  std::vector<GapPair> pairs;
  for (const auto& row : gap.rows) {
    if (row[c[0]] != scenario.name) continue;
    GapPair p;
    p.name = row[c[1]] + ", seed " + row[c[2]];
    p.linear_deg = CsvNumber(row[c[3]]);
    p.plant_deg = CsvNumber(row[c[4]]);
    p.note = "plant: " + Words(row[c[7]]);
    const double tilt = CsvNumber(row[c[5]]);
    const double drift = CsvNumber(row[c[6]]);
    p.note += std::isfinite(tilt) ? "; tilt parts at " + FixedText(tilt, 3, NanAs::kEmpty) + " s"
                                  : "; tilt within its band while both ran";
    if (std::isfinite(drift))
      p.note += "; drift parts at " + FixedText(drift, 3, NanAs::kEmpty) + " s";
    if (!row[c[8]].empty()) p.note += "; twin: " + row[c[8]];
    pairs.push_back(std::move(p));
  }
  if (pairs.empty()) return {};
  *html +=
      "<h4>The linear model against physics (gap.csv)</h4><p>Peak tilt of each run on the "
      "linear model the controllers were designed on (outlined, dashed) and on the physics "
      "plant (filled); \"parts\": the first time the two differ beyond the band in "
      "gap.csv.</p>";
  *html += RenderGapBars(scenario.name, pairs);
  return {};
}

void AppendRanking(const CsvTable& ranking, std::string* html) {
  std::vector<std::string> header;
  std::vector<bool> numeric;
  for (const std::string& name : ranking.header) {
    if (name.rfind("rank_", 0) == 0) {
      header.push_back("rank in " + name.substr(5));
    } else {
      header.push_back(name == "survival_rate" ? "survival rate (0–1)" : Words(name));
    }
    numeric.push_back(name != "controller" && name != "partial");
  }
  HtmlTable table(header, numeric);
  for (const auto& row : ranking.rows) {
    std::vector<HtmlCell> cells;
    for (std::size_t k = 0; k < row.size(); ++k) {
      cells.push_back(numeric[k] ? NumberCell(row[k]) : HtmlCell{row[k], false, ""});
    }
    table.AddRow(std::move(cells));
  }
  *html += table.Html(
      "Ranking across scenarios (ranking.csv): survival rate first, then the "
      "weighted score (lower is better); a partial controller, scored on fewer scenarios than "
      "another, is ranked apart after the others (ranking.md states the rule); one column per "
      "scenario with the rank there");
}

// The table at `path`, nullopt when there is no such file.
Result<std::optional<CsvTable>> ReadOptional(const std::string& path) {
  std::error_code ec;
  if (!fs::is_regular_file(path, ec)) return std::optional<CsvTable>();
  Result<CsvTable> table = ReadCsvFile(path);
  if (!table) return Failure(table.error());
  return std::optional<CsvTable>(std::move(*table));
}

// summary.csv's rows by name (pointing into `summary`), or the first required column missing.
Result<std::vector<RunRow>> ReadRunRows(const CsvTable& summary, const std::string& summary_path) {
  const Result<std::vector<int>> columns =
      Columns(summary, summary_path, {"scenario", "controller", "seed", "status"});
  if (!columns) return Failure(columns.error());
  const std::vector<int>& c = *columns;
  const int baseline_column = summary.Column("baseline");
  const int fall_column = summary.Column("fall_time_s");
  std::vector<RunRow> rows;
  rows.reserve(summary.rows.size());
  for (const auto& cells : summary.rows) {
    RunRow row;
    row.scenario = cells[c[0]];
    row.controller = cells[c[1]];
    row.seed_text = cells[c[2]];
    row.seed = SeedOf(row.seed_text);
    row.status = cells[c[3]];
    row.baseline = baseline_column >= 0 && cells[baseline_column] == "true";
    if (fall_column >= 0) row.fall_time_s = CsvNumber(cells[fall_column]);
    row.cells = &cells;
    rows.push_back(std::move(row));
  }
  return rows;
}

// The rows grouped by scenario, scenarios and controllers in file order, seeds ascending.
std::vector<ScenarioRuns> GroupByScenario(const std::vector<RunRow>& rows) {
  std::vector<ScenarioRuns> scenarios;
  for (const RunRow& row : rows) {
    auto it = std::find_if(scenarios.begin(), scenarios.end(),
                           [&](const ScenarioRuns& s) { return s.name == row.scenario; });
    if (it == scenarios.end()) {
      scenarios.push_back({row.scenario, {}, {}, {}, {}});
      it = scenarios.end() - 1;
    }
    if (std::find(it->controllers.begin(), it->controllers.end(), row.controller) ==
        it->controllers.end()) {
      it->controllers.push_back(row.controller);
    }
    if (row.baseline) it->baseline = row.controller;
    if (std::find(it->seeds.begin(), it->seeds.end(), row.seed) == it->seeds.end()) {
      it->seeds.push_back(row.seed);
    }
    it->rows.push_back(&row);
  }
  for (ScenarioRuns& s : scenarios) std::sort(s.seeds.begin(), s.seeds.end());
  return scenarios;
}

// The tables a run folder holds beside summary.csv, each when present.
struct RunTables {
  CsvTable summary;
  std::optional<CsvTable> compare, ranking, gap;
  std::string compare_path, ranking_path, gap_path;
};

// Reads compare.csv, ranking.csv and gap.csv of `dir` into *tables, each when present.
Status ReadOptionalTables(const std::string& dir, RunTables* tables) {
  tables->compare_path = (fs::path(dir) / "compare.csv").string();
  tables->ranking_path = (fs::path(dir) / "ranking.csv").string();
  tables->gap_path = (fs::path(dir) / "gap.csv").string();
  const std::pair<const std::string*, std::optional<CsvTable>*> optional[] = {
      {&tables->compare_path, &tables->compare},
      {&tables->ranking_path, &tables->ranking},
      {&tables->gap_path, &tables->gap}};
  for (const auto& [path, table] : optional) {
    Result<std::optional<CsvTable>> read = ReadOptional(*path);
    if (!read) return Failure(read.error());
    *table = std::move(*read);
  }
  return {};
}

// One scenario's subsection: its file, robot and seeds, the plots, every run, the comparison and
// the gap.
Status AppendScenario(const ResultsFolder& folder, const ManifestInfo& manifest,
                      const ReportOptions& options, const RunTables& tables,
                      const ScenarioRuns& scenario, ReportPage* page) {
  std::string& html = page->body;
  const std::string id = AnchorId(folder.id + "s-", scenario.name);
  page->toc.push_back({id, scenario.name, 2});
  html += "<section><h3 id=\"" + id + "\">" + Escape(scenario.name) + "</h3>";
  std::string robot, scenario_file;
  for (const ManifestScenario& m : manifest.scenarios) {
    if (m.name != scenario.name) continue;
    robot = m.model_name;
    scenario_file = fs::path(m.path).filename().string();
  }
  std::string seeds;
  for (const std::uint64_t s : scenario.seeds) {
    seeds += (seeds.empty() ? "" : ", ") + std::to_string(s);
  }
  html += "<p>";
  if (!scenario_file.empty()) html += "File <code>" + Escape(scenario_file) + "</code> · ";
  if (!robot.empty()) html += "robot " + Escape(robot) + " · ";
  html += "controllers " + std::to_string(scenario.controllers.size()) + ", baseline " +
          Escape(scenario.baseline.empty() ? "not marked" : scenario.baseline) + " · seeds " +
          Escape(seeds) + "</p>";
  if (Status plots = AppendPlots(folder, manifest, options, scenario, &html); !plots) {
    return plots;
  }
  AppendSummaryTable(tables.summary, scenario, &html);
  if (tables.compare) {
    Status compared = AppendCompareTable(*tables.compare, tables.compare_path, scenario, &html);
    if (!compared) return compared;
  }
  if (tables.gap) {
    if (Status gap = AppendGapChart(*tables.gap, tables.gap_path, scenario, &html); !gap) {
      return gap;
    }
  }
  html += "</section>";
  return {};
}

}  // namespace

Status AppendRunSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                        const ReportOptions& options, ReportPage* page) {
  RunTables tables;
  const std::string summary_path = (fs::path(folder.path) / "summary.csv").string();
  Result<CsvTable> summary = ReadCsvFile(summary_path);
  if (!summary) return Failure(summary.error());
  tables.summary = std::move(*summary);
  const Result<std::vector<RunRow>> read_rows = ReadRunRows(tables.summary, summary_path);
  if (!read_rows) return Failure(read_rows.error());
  const std::vector<RunRow>& rows = *read_rows;
  const std::vector<ScenarioRuns> scenarios = GroupByScenario(rows);
  if (Status read = ReadOptionalTables(folder.path, &tables); !read) return read;

  const std::string section_id = folder.id + "runs";
  const std::string where = folder.relative == "." ? "this folder" : folder.relative + "/";
  page->toc.push_back({section_id, "Runs: " + where, 1});
  std::string& html = page->body;
  html += "<section><h2 id=\"" + section_id + "\">Runs: " + Escape(where) + "</h2>";
  std::size_t survived = 0;
  for (const RunRow& row : rows) survived += row.status == "ok";
  html += "<p>" + std::to_string(scenarios.size()) + " scenario(s), " +
          std::to_string(rows.size()) + " run(s), " + std::to_string(survived) +
          " survived. Each scenario below: time plots, every run's figures, the comparison "
          "with the baseline" +
          (tables.gap ? std::string(" and the linear twin's gap") : std::string()) + ".</p>";
  if (!manifest.present) {
    html +=
        "<p class=\"muted\">No manifest.json here: the folder may be incomplete, and its "
        "input files are not listed above.</p>";
  }
  if (tables.ranking) AppendRanking(*tables.ranking, &html);
  for (const ScenarioRuns& scenario : scenarios) {
    Status appended = AppendScenario(folder, manifest, options, tables, scenario, page);
    if (!appended) return appended;
  }
  html += "</section>\n";
  return {};
}

}  // namespace upright::runner::internal
