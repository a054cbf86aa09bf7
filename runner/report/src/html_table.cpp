#include "html_table.hpp"

#include <cmath>

#include "html_text.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner::internal {

HtmlTable::HtmlTable(std::vector<std::string> header, std::vector<bool> numeric)
    : header_(std::move(header)), numeric_(std::move(numeric)) {
  numeric_.resize(header_.size(), false);
}

void HtmlTable::AddRow(std::vector<HtmlCell> cells) { rows_.push_back(std::move(cells)); }

std::string HtmlTable::Html(const std::string& caption) const {
  std::string html = "<div class=\"scroll\"><table>";
  if (!caption.empty()) html += "<caption>" + Escape(caption) + "</caption>";
  html += "<thead><tr>";
  for (std::size_t c = 0; c < header_.size(); ++c) {
    html += numeric_[c] ? "<th class=\"num\">" : "<th>";
    html += Escape(header_[c]) + "</th>";
  }
  html += "</tr></thead><tbody>";
  for (const auto& row : rows_) {
    html += "<tr>";
    for (const HtmlCell& cell : row) {
      std::string classes = cell.numeric ? "num" : "";
      if (!cell.css_class.empty()) classes += (classes.empty() ? "" : " ") + cell.css_class;
      html += classes.empty() ? "<td>" : "<td class=\"" + classes + "\">";
      html += Escape(cell.text) + "</td>";
    }
    html += "</tr>";
  }
  html += "</tbody></table></div>";
  return html;
}

HtmlCell NumberCell(const std::string& csv_cell) {
  if (csv_cell.empty()) return {"–", true, "na"};
  const double value = CsvNumber(csv_cell);
  if (std::isnan(value)) return {csv_cell, false, ""};
  return {SignificantText(value, 4, NanAs::kEmpty), true, ""};
}

}  // namespace upright::runner::internal
