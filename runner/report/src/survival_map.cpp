#include "survival_map.hpp"

#include <algorithm>

#include "html_text.hpp"
#include "svg_axis.hpp"
#include "upright/base/number_text.hpp"

namespace upright::runner::internal {
namespace {

constexpr double kCellWidth = 40;
constexpr double kCellHeight = 26;
constexpr double kLeft = 56;  // the row values end here
constexpr double kTop = 40;

// Appends the symbol of `outcome` centred on (x, y).
void AppendSymbol(std::string* svg, MapOutcome outcome, double x, double y) {
  constexpr double r = 7;
  switch (outcome) {
    case MapOutcome::kAll:
      *svg += "<circle class=\"all\" cx=\"" + PixelText(x) + "\" cy=\"" + PixelText(y) + "\" r=\"" +
              PixelText(r) + "\"/>";
      break;
    case MapOutcome::kSome:
      *svg += "<circle class=\"some\" cx=\"" + PixelText(x) + "\" cy=\"" + PixelText(y) +
              "\" r=\"" + PixelText(r) + "\"/><path class=\"all\" d=\"M" + PixelText(x) + " " +
              PixelText(y - r) + "a" + PixelText(r) + " " + PixelText(r) + " 0 0 0 0 " +
              PixelText(2 * r) + "z\"/>";
      break;
    case MapOutcome::kNone:
      *svg += "<path class=\"cross\" d=\"M" + PixelText(x - 5) + " " + PixelText(y - 5) +
              "l10 10m0 -10l-10 10\"/>";
      break;
    case MapOutcome::kNotRun:
      AppendSvgText(svg, x, y + 5, "!", "class=\"notrun\" text-anchor=\"middle\"");
      break;
    case MapOutcome::kMissing:
      AppendSvgText(svg, x, y + 4, "–", "text-anchor=\"middle\"");
      break;
  }
}

const char* CellClass(MapOutcome outcome) {
  switch (outcome) {
    case MapOutcome::kAll:
      return "cell-all";
    case MapOutcome::kSome:
      return "cell-some";
    default:
      return "cell-none";
  }
}

}  // namespace

std::string RenderSurvivalMap(const SurvivalMap& map) {
  const double columns = static_cast<double>(map.xs.size());
  const double rows = static_cast<double>(map.ys.size());
  const double grid_right = kLeft + kCellWidth * columns;
  const double grid_bottom = kTop + kCellHeight * rows;
  const double width = std::max(grid_right + 12, 400.0);
  const double height = grid_bottom + 76;
  std::string svg = "<svg class=\"chart\" data-chart=\"map\" data-scenario=\"" +
                    Escape(map.scenario) + "\" viewBox=\"0 0 " + PixelText(width) + " " +
                    PixelText(height) + "\" width=\"" + PixelText(width) + "\" height=\"" +
                    PixelText(height) + "\" role=\"img\" aria-label=\"" +
                    Escape("Survival map of " + map.controller + ": rows " + map.y_label +
                           ", columns " + map.x_label) +
                    "\">";
  AppendSvgText(&svg, 8, 15, map.controller, "class=\"title\"");
  AppendSvgText(&svg, 8, 32, "rows: " + map.y_label, "class=\"note\"");
  for (std::size_t r = 0; r < map.ys.size(); ++r) {
    // Row r of the data is drawn from the bottom up.
    const double y = grid_bottom - kCellHeight * static_cast<double>(r + 1);
    AppendSvgText(&svg, kLeft - 4, y + kCellHeight / 2 + 4,
                  SignificantText(map.ys[r], 4, NanAs::kEmpty), "text-anchor=\"end\"");
    for (std::size_t c = 0; c < map.xs.size(); ++c) {
      const std::size_t at = r * map.xs.size() + c;
      const MapOutcome outcome = at < map.cells.size() ? map.cells[at] : MapOutcome::kMissing;
      const double x = kLeft + kCellWidth * static_cast<double>(c);
      svg += "<rect class=\"" + std::string(CellClass(outcome)) + "\" x=\"" + PixelText(x) +
             "\" y=\"" + PixelText(y) + "\" width=\"" + PixelText(kCellWidth) + "\" height=\"" +
             PixelText(kCellHeight) + "\"/>";
      AppendSymbol(&svg, outcome, x + kCellWidth / 2, y + kCellHeight / 2);
    }
  }
  for (std::size_t c = 0; c < map.xs.size(); ++c) {
    AppendSvgText(&svg, kLeft + kCellWidth * (static_cast<double>(c) + 0.5), grid_bottom + 14,
                  SignificantText(map.xs[c], 4, NanAs::kEmpty), "text-anchor=\"middle\"");
  }
  AppendSvgText(&svg, kLeft, grid_bottom + 30, "columns: " + map.x_label, "class=\"note\"");
  // The key.
  const double key_y = grid_bottom + 54;
  const struct {
    MapOutcome outcome;
    const char* text;
  } kKey[] = {{MapOutcome::kAll, "all seeds survived"},
              {MapOutcome::kSome, "some"},
              {MapOutcome::kNone, "none"},
              {MapOutcome::kNotRun, "could not run"}};
  double x = 16;
  for (const auto& k : kKey) {
    AppendSymbol(&svg, k.outcome, x, key_y);
    AppendSvgText(&svg, x + 11, key_y + 4, k.text, "class=\"note\"");
    x += 34 + 5.8 * static_cast<double>(std::string_view(k.text).size());
  }
  svg += "</svg>";
  return svg;
}

}  // namespace upright::runner::internal
