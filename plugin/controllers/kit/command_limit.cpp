#include "kit/command_limit.hpp"

#include <algorithm>

namespace upright::controllers {
namespace {

// −1 when `value` was raised to `limited`, +1 when lowered, 0 when kept.
int CutDirection(double wanted, double limited) {
  return wanted > limited ? 1 : wanted < limited ? -1 : 0;
}

}  // namespace

DriveLimits::DriveLimits(const model::MotorModel& motor, design::InputKind input)
    : motor_(motor), input_(input) {}

CommandRange DriveLimits::At(double wheel_speed_rad_s) const {
  const model::MotorModel& m = motor_;
  const double back_emf_V = m.back_emf_V_s_per_rad * m.gear_ratio * wheel_speed_rad_s;
  const double limit_A = m.current_limit_A, supply_V = m.supply_V, R = m.resistance_ohm;
  if (input_ == design::InputKind::kVoltage) {
    return {std::clamp(back_emf_V - R * limit_A, -supply_V, supply_V),
            std::clamp(back_emf_V + R * limit_A, -supply_V, supply_V)};
  }
  const double torque_per_A = m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A;
  return {torque_per_A * std::clamp((-supply_V - back_emf_V) / R, -limit_A, limit_A),
          torque_per_A * std::clamp((supply_V - back_emf_V) / R, -limit_A, limit_A)};
}

LimitedCommand LimitWithPitchPriority(const Eigen::Vector2d& wanted, const CommandRange& left,
                                      const CommandRange& right) {
  LimitedCommand out;
  if (left.lo <= wanted(0) && wanted(0) <= left.hi && right.lo <= wanted(1) &&
      wanted(1) <= right.hi) {
    out.command = wanted;  // as wanted, bit for bit
    return out;
  }
  const double c_wanted = (wanted(0) + wanted(1)) / 2, d_wanted = (wanted(1) - wanted(0)) / 2;
  const double c = std::clamp(c_wanted, (left.lo + right.lo) / 2, (left.hi + right.hi) / 2);
  const double d_lo = std::max(c - left.hi, right.lo - c);
  const double d_hi = std::min(c - left.lo, right.hi - c);
  const double d = std::clamp(d_wanted, d_lo, std::max(d_lo, d_hi));
  // Within each wheel's range already, up to rounding.
  out.command << std::clamp(c - d, left.lo, left.hi), std::clamp(c + d, right.lo, right.hi);
  out.common_cut = CutDirection(c_wanted, c);
  out.differential_cut = CutDirection(d_wanted, d);
  return out;
}

}  // namespace upright::controllers
