// The section of an `upright sweep` results folder.
#include <algorithm>
#include <filesystem>

#include "bar_charts.hpp"
#include "html_table.hpp"
#include "html_text.hpp"
#include "sections.hpp"
#include "upright/runner/common/sample_statistics.hpp"
#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner::internal {

namespace fs = std::filesystem;

Status AppendSweepSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                          ReportPage* page) {
  const std::string path = (fs::path(folder.path) / "sweep.csv").string();
  const Result<CsvTable> read = ReadCsvFile(path);
  if (!read) return Failure(read.error());
  const CsvTable& table = *read;
  const int controller = table.Column("controller");
  const int survived = table.Column("survived");
  if (controller < 0 || survived < 0) {
    return Failure(path + ":1: no column '" +
                   std::string(controller < 0 ? "controller" : "survived") + "' in the header");
  }
  std::vector<RateBar> bars;
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const auto& row = table.rows[r];
    const Result<bool> ok = CsvBoolAt(table, r, survived, path);
    if (!ok) return Failure(ok.error());
    auto it = std::find_if(bars.begin(), bars.end(),
                           [&](const RateBar& b) { return b.name == row[controller]; });
    if (it == bars.end()) {
      bars.push_back({row[controller], bars.size(), 0, 0, 0, 1});
      it = bars.end() - 1;
    }
    ++it->runs;
    it->survived += *ok;
  }
  for (RateBar& bar : bars) {
    const Interval interval = WilsonInterval(bar.survived, bar.runs);
    bar.lo = interval.lo;
    bar.hi = interval.hi;
  }
  const std::string scenario =
      manifest.scenarios.empty() ? std::string() : manifest.scenarios.front().name;
  const std::string section_id = folder.id + "sweep";
  const std::string where = folder.relative == "." ? "this folder" : folder.relative + "/";
  page->toc.push_back({section_id, "Monte Carlo sweep: " + where, 1});
  std::string& html = page->body;
  html += "<section><h2 id=\"" + section_id + "\">Monte Carlo sweep: " + Escape(where) + "</h2>";
  html += "<p>";
  if (!scenario.empty()) html += "Scenario " + Escape(scenario) + ", ";
  if (!manifest.samples.empty()) html += Escape(manifest.samples) + " samples, ";
  if (!manifest.sweep_seed.empty()) html += "sweep seed " + Escape(manifest.sweep_seed) + ", ";
  html +=
      "every controller on the same samples (sweep.csv). Bars: the share of samples "
      "survived; error bars: the 95 % Wilson score interval (Wilson 1927). The rates hold "
      "for these spreads on this model, never for a real robot.</p>";
  html += RenderSurvivalRates(scenario, bars);
  if (!manifest.dispersions.empty()) {
    HtmlTable spreads({"parameter", "kind", "values"});
    for (const ManifestParameter& d : manifest.dispersions) {
      std::string values;
      for (const auto& [name, value] : d.numbers) {
        values += (values.empty() ? "" : ", ") + name + " " + value;
      }
      spreads.AddRow({{d.path, false, ""}, {d.kind, false, ""}, {values, false, ""}});
    }
    html += spreads.Html("Spreads sampled (manifest.json)");
  }
  html += "</section>\n";
  return {};
}

}  // namespace upright::runner::internal
