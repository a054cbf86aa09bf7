// The section of an `upright tune` results folder: how each controller's best objective fell
// over the search, default against tuned (on the search's seeds and the held-out ones), and the
// ranking at their best beside the ranking as designed.
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>

#include "html_table.hpp"
#include "html_text.hpp"
#include "line_plot.hpp"
#include "sections.hpp"
#include "tune_convergence.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner::internal {
namespace {

namespace fs = std::filesystem;

// One controller's rows of tune.csv.
struct ControllerRows {
  std::string name;
  std::vector<std::size_t> search;    // the search's rows, in evaluation order
  std::vector<std::size_t> held_out;  // the default's, then the tuned setting's
};

// The columns the section reads, by name.
struct TuneColumns {
  int controller = -1, evaluation = -1, stage = -1, settings = -1, objective = -1, feasible = -1,
      survived = -1, runs = -1;
};

std::string ObjectiveText(double objective) {
  if (std::isnan(objective)) return "–";
  return objective >= kTuneFallScore ? "falls" : SignificantText(objective, 4);
}

// A ranking.csv of the folder's held-out replays, by controller: rank and survived/runs.
std::map<std::string, std::pair<std::string, std::string>> ReadStandings(const fs::path& csv) {
  std::map<std::string, std::pair<std::string, std::string>> standings;
  std::error_code ec;
  if (!fs::is_regular_file(csv, ec)) return standings;
  const Result<CsvTable> read = ReadCsvFile(csv.string());
  if (!read) return standings;
  const int rank = read->Column("rank"), name = read->Column("controller"),
            survived = read->Column("survived"), runs = read->Column("runs");
  if (rank < 0 || name < 0 || survived < 0 || runs < 0) return standings;
  for (const auto& row : read->rows) {
    standings[row[name]] = {row[rank], row[survived] + "/" + row[runs]};
  }
  return standings;
}

// pareto.csv, when the tune searched fronts: each controller's front as a line through its
// settings (sorted by the first metric, as the file is), each setting marked.
Result<std::string> ParetoPlot(const std::string& folder, const ReportOptions& options) {
  const fs::path path = fs::path(folder) / "pareto.csv";
  std::error_code ec;
  if (!fs::is_regular_file(path, ec)) return std::string();
  const Result<CsvTable> read = ReadCsvFile(path.string());
  if (!read) return Failure(read.error());
  const CsvTable& table = *read;
  if (table.header.size() < 3 || table.header[0] != "controller" ||
      table.header[1].rfind("mean_", 0) != 0 || table.header[2].rfind("mean_", 0) != 0) {
    return Failure(path.string() +
                   ":1: expected the columns controller, mean_<metric>, mean_<metric>");
  }
  LinePlot plot;
  plot.kind = "tune-pareto";
  plot.title = "Pareto fronts: the settings no other setting beats on both (tune.md, pareto.csv)";
  plot.x_label = table.header[1].substr(5) + " (mean over the runs)";
  plot.y_label = table.header[2].substr(5);
  constexpr double kInf = std::numeric_limits<double>::infinity();
  double x_lo = kInf, x_hi = -kInf, y_lo = kInf, y_hi = -kInf;
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const auto& row = table.rows[r];
    if (plot.series.empty() || plot.series.back().name != row[0]) {
      plot.series.push_back({row[0], plot.series.size(), false, {}, {}});
    }
    const double x = CsvNumber(row[1]), y = CsvNumber(row[2]);
    if (!std::isfinite(x) || !std::isfinite(y)) {
      return Failure(path.string() + ":" + std::to_string(table.lines[r]) +
                     ": a front's figures must be numbers");
    }
    plot.series.back().time_s.push_back(x);
    plot.series.back().value.push_back(y);
    plot.marks.push_back({x, y, plot.series.back().style, ""});
    x_lo = std::min(x_lo, x);
    x_hi = std::max(x_hi, x);
    y_lo = std::min(y_lo, y);
    y_hi = std::max(y_hi, y);
  }
  if (plot.series.empty()) return std::string();
  // A margin of a tenth of the span (or of the value, for a front of one point) on each side.
  const auto pad = [](double lo, double hi) {
    const double span = hi > lo ? hi - lo : std::max(std::abs(hi), 1.0);
    return 0.1 * span;
  };
  const double px = pad(x_lo, x_hi), py = pad(y_lo, y_hi);
  plot.x_lo = x_lo - px;
  plot.x_hi = x_hi + px;
  plot.y_lo = y_lo - py;
  plot.y_hi = y_hi + py;
  return RenderLinePlot(plot, options.max_points);
}

}  // namespace

Status AppendTuneSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                         const ReportOptions& options, ReportPage* page) {
  const std::string path = (fs::path(folder.path) / "tune.csv").string();
  const Result<CsvTable> read = ReadCsvFile(path);
  if (!read) return Failure(read.error());
  const CsvTable& table = *read;
  TuneColumns col;
  for (const auto& [name, index] :
       {std::pair{"controller", &col.controller}, std::pair{"evaluation", &col.evaluation},
        std::pair{"stage", &col.stage}, std::pair{"settings", &col.settings},
        std::pair{"objective", &col.objective}, std::pair{"feasible", &col.feasible},
        std::pair{"survived", &col.survived}, std::pair{"runs", &col.runs}}) {
    *index = table.Column(name);
    if (*index < 0) return Failure(path + ":1: no column '" + name + "' in the header");
  }
  std::vector<ControllerRows> controllers;
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const std::string& name = table.rows[r][col.controller];
    if (controllers.empty() || controllers.back().name != name)
      controllers.push_back({name, {}, {}});
    (table.rows[r][col.stage] == "held_out" ? controllers.back().held_out
                                            : controllers.back().search)
        .push_back(r);
  }
  // The best objective so far among the settings that survived and met the bounds.
  LinePlot convergence;
  convergence.kind = "tune-convergence";
  convergence.title =
      "Best objective so far (settings where every run survived and the bounds hold)";
  convergence.y_label = "objective (lower is better)";
  convergence.x_label = "evaluation";
  for (std::size_t c = 0; c < controllers.size(); ++c) {
    PlotSeries line{controllers[c].name, c, false, {}, {}};
    std::vector<double> objective, evaluation;
    std::vector<bool> feasible;
    for (const std::size_t r : controllers[c].search) {
      const Result<bool> met = CsvBoolAt(table, r, col.feasible, path);
      if (!met) return Failure(met.error());
      feasible.push_back(*met);
      objective.push_back(CsvNumber(table.rows[r][col.objective]));
      evaluation.push_back(CsvNumber(table.rows[r][col.evaluation]));
    }
    const std::vector<double> best = BestSoFar(objective, feasible);
    for (std::size_t i = 0; i < best.size(); ++i) {
      // A step: the best before this evaluation up to it, then the best after.
      line.time_s.push_back(evaluation[i]);
      line.value.push_back(i == 0 ? best[i] : best[i - 1]);
      line.time_s.push_back(evaluation[i]);
      line.value.push_back(best[i]);
      convergence.x_max_s = std::max(convergence.x_max_s, evaluation[i]);
    }
    convergence.series.push_back(std::move(line));
  }

  const std::string section_id = folder.id + "tune";
  const std::string where = folder.relative == "." ? "this folder" : folder.relative + "/";
  page->toc.push_back({section_id, "Tune: " + where, 1});
  std::string& html = page->body;
  html += "<section><h2 id=\"" + section_id + "\">Tune: " + Escape(where) + "</h2><p>";
  if (!manifest.scenarios.empty()) {
    html += "Scenarios";
    for (std::size_t s = 0; s < manifest.scenarios.size(); ++s) {
      html += (s == 0 ? " " : ", ") + Escape(manifest.scenarios[s].name);
    }
    html += ". ";
  }
  const ManifestTune& tune = manifest.tune;
  if (!tune.objective.empty()) {
    html += "Objective, lower is better: " + Escape(tune.objective) +
            ", each metric the mean over the runs; a setting where a run did not survive scores "
            "10⁶ or more. ";
  }
  for (std::size_t b = 0; b < tune.bounds.size(); ++b) {
    html += (b == 0 ? "Subject to (the worst run): " : "; ") + Escape(tune.bounds[b]) +
            (b + 1 == tune.bounds.size() ? ". " : "");
  }
  if (!tune.evaluations.empty()) {
    html += "Budget: " + Escape(tune.evaluations) + " evaluations of " +
            Escape(tune.runs_per_evaluation) + " run(s) per controller, search seed " +
            Escape(tune.search_seed) + ". ";
  }
  html +=
      "Every figure holds on this model and these scenarios only; tune.csv has every "
      "evaluation.</p>";
  html += RenderLinePlot(convergence, options.max_points);
  const Result<std::string> fronts = ParetoPlot(folder.path, options);
  if (!fronts) return Failure(fronts.error());
  html += *fronts;

  HtmlTable results({"controller", "default", "tuned", "held-out: default", "held-out: tuned",
                     "tuned evaluation", "tuned setting"},
                    {false, true, true, true, true, true, false});
  for (const ControllerRows& c : controllers) {
    if (c.search.empty()) continue;
    // The tuned setting: the manifest's word, else the held-out replay's, else the default.
    long best = -1;
    for (const auto& [name, evaluation] : tune.best_evaluation) {
      if (name == c.name) best = evaluation;
    }
    if (best < 0 && c.held_out.size() == 2) {
      best = static_cast<long>(CsvNumber(table.rows[c.held_out[1]][col.evaluation]));
    }
    std::size_t best_row = c.search.front();
    for (const std::size_t r : c.search) {
      if (CsvNumber(table.rows[r][col.evaluation]) == static_cast<double>(best)) best_row = r;
    }
    const auto objective = [&](std::size_t r) {
      return HtmlCell{ObjectiveText(CsvNumber(table.rows[r][col.objective])), true, ""};
    };
    const auto& row = table.rows[best_row];
    results.AddRow({{c.name, false, ""},
                    objective(c.search.front()),
                    objective(best_row),
                    c.held_out.size() == 2 ? objective(c.held_out[0]) : HtmlCell{"–", true, ""},
                    c.held_out.size() == 2 ? objective(c.held_out[1]) : HtmlCell{"–", true, ""},
                    {row[col.evaluation] + " (" + row[col.stage] + ")", true, ""},
                    {row[col.settings], false, ""}});
  }
  html += results.Html("Default against tuned objective (tune.md)");

  const auto tuned = ReadStandings(fs::path(folder.path) / "tuned" / "ranking.csv");
  const auto defaults = ReadStandings(fs::path(folder.path) / "defaults" / "ranking.csv");
  if (!tuned.empty()) {
    std::vector<std::pair<std::string, std::string>> order;  // rank, controller
    for (const auto& [name, standing] : tuned) order.emplace_back(standing.first, name);
    std::sort(order.begin(), order.end(),
              [](const auto& a, const auto& b) { return CsvNumber(a.first) < CsvNumber(b.first); });
    HtmlTable ranking({"rank at their best", "controller", "survived", "rank as designed",
                       "survived as designed"},
                      {true, false, true, true, true});
    for (const auto& [rank, name] : order) {
      const auto before = defaults.find(name);
      ranking.AddRow({{rank, true, ""},
                      {name, false, ""},
                      {tuned.at(name).second, true, ""},
                      {before != defaults.end() ? before->second.first : "–", true, ""},
                      {before != defaults.end() ? before->second.second : "–", true, ""}});
    }
    html += ranking.Html(
        "Ranking at their best: the tuned and the default settings played on held-out seeds the "
        "search never saw, each ranked as ranking.md ranks (tuned/ and defaults/ below)");
  }
  html += "</section>\n";
  return {};
}

}  // namespace upright::runner::internal
