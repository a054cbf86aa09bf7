#include "parameter_unit.hpp"

#include <utility>

namespace upright::runner::internal {

std::string ParameterUnit(const std::string& path) {
  const auto dot = path.rfind('.');
  const std::string attribute = dot == std::string::npos ? path : path.substr(dot + 1);
  // Longer suffixes first, so "_m_s2" is not read as "_s2" or "_m_s".
  static const std::pair<const char*, const char*> kSuffixes[] = {
      {"_Nm_s_per_rad", "N·m·s/rad"},
      {"_V_s_per_rad", "V·s/rad"},
      {"_Nm_per_A", "N·m/A"},
      {"_m_s2_rthz", "m/s²/√Hz"},
      {"_rad_s_rthz", "rad/s/√Hz"},
      {"_m_s2", "m/s²"},
      {"_rad_s", "rad/s"},
      {"_deg_s", "deg/s"},
      {"_m_s", "m/s"},
      {"_kgm2", "kg·m²"},
      {"_Nm", "N·m"},
      {"_kg", "kg"},
      {"_deg", "deg"},
      {"_rad", "rad"},
      {"_ohm", "ohm"},
      {"_hz", "Hz"},
      {"_Hz", "Hz"},
      {"_N", "N"},
      {"_V", "V"},
      {"_A", "A"},
      {"_s", "s"},
      {"_m", "m"},
  };
  for (const auto& [suffix, unit] : kSuffixes) {
    const std::string s = suffix;
    if (attribute.size() > s.size() &&
        attribute.compare(attribute.size() - s.size(), s.size(), s) == 0) {
      return unit;
    }
  }
  return "";
}

}  // namespace upright::runner::internal
