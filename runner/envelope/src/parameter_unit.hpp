// The unit of a scenario parameter, read from its attribute's suffix the way the files write units
// into names: a path in ("timeline/push[1].peak_N"), a unit for tables out ("N").
#pragma once

#include <string>

namespace upright::runner::internal {

// "N" for ".peak_N", "m/s" for ".speed_m_s", "deg" for ".slope_deg", "kg·m²" for ".pitch_kgm2";
// "" for a pure number (".friction", ".torque_scale", ".gear_ratio").
std::string ParameterUnit(const std::string& path);

}  // namespace upright::runner::internal
