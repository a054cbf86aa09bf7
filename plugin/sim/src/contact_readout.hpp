// Contact readout (internal): after a step, the ground's contact manifolds → per-wheel normal
// load, traction, slip ratio and friction use, and whether the chassis or payload touches.
#pragma once

#include "robot_body.hpp"
#include "upright/sim/plant.hpp"
#include "world.hpp"

namespace upright::sim::internal {

// Fills *out from the manifolds of the last step of `world`. Needs the wheel speeds: each wheel's
// absolute spin about the axle (rad/s) and its hub velocity (world, m/s), [left, right].
void ReadContacts(World& world, const RobotBody& robot, double wheel_radius_m,
                  const std::array<double, 2>& wheel_spin_rad_s,
                  const std::array<btVector3, 2>& hub_velocity, ContactState* out);

}  // namespace upright::sim::internal
