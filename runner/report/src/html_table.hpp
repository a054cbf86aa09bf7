// HTML tables of the report: header texts and cells in, a <table> that scrolls sideways when wide
// out. Cells are escaped here; numeric ones align right.
#pragma once

#include <string>
#include <vector>

namespace upright::runner::internal {

struct HtmlCell {
  std::string text;       // plain text, escaped on output
  bool numeric = false;   // right-aligned
  std::string css_class;  // extra class ("better", "worse", ...), or ""
};

class HtmlTable {
 public:
  explicit HtmlTable(std::vector<std::string> header, std::vector<bool> numeric = {});
  void AddRow(std::vector<HtmlCell> cells);
  bool empty() const { return rows_.empty(); }
  // <div class="scroll"><table>...</table></div>, with `caption` when not empty.
  std::string Html(const std::string& caption = "") const;

 private:
  std::vector<std::string> header_;
  std::vector<bool> numeric_;
  std::vector<std::vector<HtmlCell>> rows_;
};

// A CSV cell for display: a number with 4 significant digits, "–" for an empty cell (a figure
// that does not apply), other text as it is.
HtmlCell NumberCell(const std::string& csv_cell);

}  // namespace upright::runner::internal
