// Dispersion: how one scenario parameter spreads from sample to sample in a Monte Carlo sweep — a
// parameter path (scenario_parameter.hpp) and a normal or uniform spread in the file's units of
// that parameter. Read from a scenario file's <dispersions>; `upright run` ignores them.
#pragma once

#include <string>
#include <string_view>

namespace upright::runner {

enum class SpreadKind {
  kNormal,   // mean + sd · N(0, 1)
  kUniform,  // uniform over [lo, hi)
};

// "normal", "uniform".
inline const char* ToString(SpreadKind kind) {
  return kind == SpreadKind::kNormal ? "normal" : "uniform";
}
// False when `text` names no kind.
inline bool FromString(std::string_view text, SpreadKind* kind) {
  if (text == "normal") {
    *kind = SpreadKind::kNormal;
  } else if (text == "uniform") {
    *kind = SpreadKind::kUniform;
  } else {
    return false;
  }
  return true;
}

struct Dispersion {
  std::string param;                      // the path as written, e.g. "robot/chassis.mass_kg"
  SpreadKind kind = SpreadKind::kNormal;  // how it spreads
  double nominal = 0;                     // the scenario's own value (file units, as all below)
  double mean = 0;                        // kNormal: centre; the nominal unless the file says
  double sd = 0;                          // kNormal: standard deviation, > 0
  double lo = 0;                          // kUniform: lower end, < hi
  double hi = 0;                          // kUniform: upper end
  int line = 0;                           // line of the <spread> element in the scenario file
};

}  // namespace upright::runner
