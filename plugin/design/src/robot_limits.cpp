#include "upright/design/robot_limits.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <sstream>

#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

constexpr double kLyingFlat_rad = std::numbers::pi / 2;

// The first pitch past `from` (going up when `direction` is +1, down when −1) at which the
// corner (x, z) of a body whose axle is r above the ground touches it, as the distance from
// `from`; kLyingFlat_rad when it never does within it. The height r + z cos θ − x sin θ =
// r + ρ cos(θ + β), with ρ = hypot(x, z), β = atan2(x, z), is zero at θ = −β ± acos(−r/ρ) + 2πk
// (trigonometry, derived by hand).
double FirstTouch(double x, double z, double r, double from, int direction) {
  const double rho = std::hypot(x, z);
  if (!(rho > r)) return kLyingFlat_rad;
  const double beta = std::atan2(x, z);
  const double half_width = std::acos(-r / rho);
  double nearest = kLyingFlat_rad;
  for (const double root : {-beta + half_width, -beta - half_width}) {
    // The root's images θ + 2πk, the first of them strictly past `from` in `direction`.
    const double ahead = direction * (root - from);
    const double distance =
        ahead - 2 * std::numbers::pi * std::floor(ahead / (2 * std::numbers::pi));
    if (distance > 0) nearest = std::min(nearest, distance);
  }
  return nearest;
}

}  // namespace

GroundContactTilt GroundContact(const model::RobotModel& model, double equilibrium) {
  const model::ChassisModel& c = model.chassis;
  const double r = model.wheel.radius_m;
  GroundContactTilt tilt{kLyingFlat_rad, kLyingFlat_rad};
  for (const double x : {c.outline_front_m, c.outline_rear_m}) {
    for (const double z : {c.outline_bottom_m, c.outline_top_m}) {
      const double height = r + z * std::cos(equilibrium) - x * std::sin(equilibrium);
      if (!(height > 0)) return GroundContactTilt{0, 0};
      tilt.forward_rad = std::min(tilt.forward_rad, FirstTouch(x, z, r, equilibrium, +1));
      tilt.backward_rad = std::min(tilt.backward_rad, FirstTouch(x, z, r, equilibrium, -1));
    }
  }
  return tilt;
}

Result<DesignWeights> WeightsForRobot(const DesignWeights& weights, const model::RobotModel& model,
                                      double equilibrium_pitch_rad) {
  DesignWeights out = weights;
  if (out.max_tilt_deg == 0) {
    const double contact_rad = GroundContact(model, equilibrium_pitch_rad).smallest_rad();
    if (!(contact_rad > 0)) {
      return Failure(
          "the chassis outline touches the ground at the equilibrium pitch, so there is no "
          "ground-contact tilt to take the acceptable tilt from: set max_tilt_deg");
    }
    out.max_tilt_deg = kTiltShareOfGroundContact * contact_rad * 180 / std::numbers::pi;
  }
  return out;
}

CurrentMap MotorCurrent(const model::RobotModel& model, InputKind input) {
  const model::MotorModel& m = model.motor;
  CurrentMap map;
  if (input == InputKind::kTorque) {
    map.per_input = 1 / (m.gear_ratio * m.gear_efficiency * m.torque_constant_Nm_per_A);
    return map;
  }
  const double r = model.wheel.radius_m, d = model.wheel.track_m / 2;
  const double per_rad_s = -m.gear_ratio * m.back_emf_V_s_per_rad / m.resistance_ohm;
  map.per_input = 1 / m.resistance_ohm;
  map.per_state.row(model::kLeft) << 0, per_rad_s / r, 0, -per_rad_s, 0, -per_rad_s * d / r;
  map.per_state.row(model::kRight) << 0, per_rad_s / r, 0, -per_rad_s, 0, per_rad_s * d / r;
  return map;
}

}  // namespace upright::design
