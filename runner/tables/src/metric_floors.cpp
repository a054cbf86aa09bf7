#include "upright/runner/metric_floors.hpp"

#include <array>

namespace upright::runner {
namespace {

struct FloorRule {
  std::string_view ending;  // the whole name, or its unit suffix
  MetricFloor floor;
};

// Values a practitioner accepts as "no difference" for robots from 1 kg to 50 kg (common
// practice): below the resolution of a MEMS tilt estimate, a wheel encoder's centimetre, a few
// control periods, a small hobby motor's current ripple. Checked in this order; the first rule
// whose ending the name has applies, so longer suffixes come before their tails (_deg_s before
// _s).
constexpr std::array<FloorRule, 12> kRules = {{
    {"slip_time_s", {0.01, "s"}},  // a wheel spinning for one 100 Hz control period
    {"_deg_s", {0.1, "deg·s"}},    // 0.1 deg held for a second
    {"_Nm2s", {1e-4, "N²m²s"}},    // 0.01 N·m held for a second
    {"_deg", {0.1, "deg"}},
    {"_m", {0.01, "m"}},
    {"_s", {0.05, "s"}},  // settling: five 100 Hz control periods
    {"_A", {0.1, "A"}},
    {"_Nm", {0.01, "N·m"}},
    {"_J", {0.1, "J"}},
    {"_pct", {0.1, "%"}},
    {"_frac", {0.001, ""}},  // 0.1 % of the steps
    {"_ratio", {0.01, ""}},
}};

bool EndsWith(std::string_view text, std::string_view ending) {
  return text.size() >= ending.size() && text.substr(text.size() - ending.size()) == ending;
}

}  // namespace

MetricFloor FloorOf(std::string_view metric) {
  for (const FloorRule& rule : kRules) {
    if (EndsWith(metric, rule.ending)) return rule.floor;
  }
  return {};
}

}  // namespace upright::runner
