#include "upright/design/weights.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <sstream>

#include "upright/model/check.hpp"
#include "upright/model/conventions.hpp"

namespace upright::design {

Status DesignWeights::Validate() const {
  const std::pair<const char*, double> positive[] = {{"max_drift_m", max_drift_m},
                                                     {"max_speed_m_s", max_speed_m_s},
                                                     {"max_tilt_rate_deg_s", max_tilt_rate_deg_s},
                                                     {"max_yaw_deg", max_yaw_deg},
                                                     {"max_yaw_rate_deg_s", max_yaw_rate_deg_s}};
  std::ostringstream why;
  if (!(max_tilt_deg >= 0) || !std::isfinite(max_tilt_deg)) {
    why << "DesignWeights::max_tilt_deg = " << max_tilt_deg
        << ", must be > 0 (or 0 for a fifth of the ground-contact tilt)";
  }
  for (const auto& [name, value] : positive) {
    if (why.tellp() == 0 && (!(value > 0) || !std::isfinite(value))) {
      why << "DesignWeights::" << name << " = " << value << ", must be > 0";
      break;
    }
  }
  if (why.tellp() == 0 && !(max_input_fraction > 0 && max_input_fraction <= 1)) {
    why << "DesignWeights::max_input_fraction = " << max_input_fraction << ", must be in (0, 1]";
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

double InputLimit(const model::RobotModel& model, InputKind input) {
  const model::MotorModel& m = model.motor;
  if (input == InputKind::kVoltage) return m.supply_V;
  return m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A *
         std::min(m.supply_V / m.resistance_ohm, m.current_limit_A);
}

StateMatrix StateWeight(const DesignWeights& w) {
  UPRIGHT_CHECK(w.max_tilt_deg > 0, "StateWeight: max_tilt_deg = %g, not resolved for the robot",
                w.max_tilt_deg);
  const double deg = std::numbers::pi / 180;
  StateVector max;
  max << w.max_drift_m, w.max_speed_m_s, w.max_tilt_deg * deg, w.max_tilt_rate_deg_s * deg,
      w.max_yaw_deg * deg, w.max_yaw_rate_deg_s * deg;
  return max.cwiseProduct(max).cwiseInverse().asDiagonal();
}

Eigen::Matrix2d InputWeight(const DesignWeights& w, const model::RobotModel& model,
                            InputKind input) {
  const double max = w.max_input_fraction * InputLimit(model, input);
  return Eigen::Matrix2d::Identity() / (max * max);
}

}  // namespace upright::design
