// The 2-D survival map of one controller as an inline SVG grid: the outcome at each pair of
// parameter values in, one cell per pair with a symbol out (a filled disc: every seed survived, a
// half disc: some did, a cross: none did, "!": the run could not start), so colour is not needed
// to read it.
#pragma once

#include <string>
#include <vector>

namespace upright::runner::internal {

enum class MapOutcome { kAll, kSome, kNone, kNotRun, kMissing };

struct SurvivalMap {
  std::string scenario;           // the data-scenario attribute
  std::string controller;         // the title
  std::string x_label;            // the first parameter, with its unit (columns)
  std::string y_label;            // the second parameter, with its unit (rows)
  std::vector<double> xs;         // column values, ascending
  std::vector<double> ys;         // row values, ascending (drawn with the largest on top)
  std::vector<MapOutcome> cells;  // ys.size() × xs.size(), row by row from ys[0]
};

// <svg data-chart="map">: the grid with its values on both axes and a key to the symbols.
std::string RenderSurvivalMap(const SurvivalMap& map);

}  // namespace upright::runner::internal
