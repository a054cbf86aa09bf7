// RobotBody (internal): the robot as one Featherstone multibody in a World — chassis base, two
// revolute wheels with sphere colliders carrying the true wheel inertia, and an optional payload
// on a prismatic carriage with end stops.
#pragma once

#include <array>

#include <LinearMath/btVector3.h>

#include "upright/model/robot_model.hpp"
#include "upright/sim/plant.hpp"
#include "world.hpp"

class btMultiBody;
class btMultiBodyLinkCollider;

namespace upright::sim::internal {

inline constexpr int kChassisLink = -1;  // Bullet's index of the base
inline constexpr int kLeftWheelLink = 0;
inline constexpr int kRightWheelLink = 1;
inline constexpr int kPayloadLink = 2;

struct RobotBody {
  btMultiBody* body = nullptr;
  std::array<const btMultiBodyLinkCollider*, 2> wheel_colliders{};  // [left, right]
  bool has_payload = false;
  btVector3 com_to_axle;  // body frame: chassis COM → axle midpoint
};

// Builds the robot standing on the ground of `world` as options.initial says (or held in the
// air when options.fixed_chassis), and adds it to the world.
RobotBody BuildRobot(World& world, const model::RobotModel& model, const PlantOptions& options);

}  // namespace upright::sim::internal
