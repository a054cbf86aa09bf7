#include "contact_readout.hpp"

#include <btBulletDynamicsCommon.h>

#include <BulletDynamics/Featherstone/btMultiBody.h>
#include <BulletDynamics/Featherstone/btMultiBodyDynamicsWorld.h>
#include <BulletDynamics/Featherstone/btMultiBodyLinkCollider.h>

#include <algorithm>
#include <cmath>

namespace upright::sim::internal {
namespace {

constexpr double kSlipSpeedFloor_m_s = 1e-3;  // keeps the slip ratio finite at standstill

struct WheelSums {
  btVector3 force{0, 0, 0};       // on the wheel, N
  btVector3 normal{0, 0, 1};      // contact normal of the strongest point, out of the ground
  double normal_N = 0;
  double strongest = -1;
  double friction = 0;
  bool touching = false;
};

}  // namespace

void ReadContacts(World& world, const RobotBody& robot, double wheel_radius_m,
                  const std::array<double, 2>& wheel_spin_rad_s,
                  const std::array<btVector3, 2>& hub_velocity, ContactState* out) {
  std::array<WheelSums, 2> sums;
  bool chassis_on_ground = false;
  const double inv_dt = 1.0 / world.dt_s();
  btDispatcher* dispatcher = world.bt().getDispatcher();
  for (int m = 0; m < dispatcher->getNumManifolds(); ++m) {
    const btPersistentManifold* manifold = dispatcher->getManifoldByIndexInternal(m);
    const btCollisionObject* a = manifold->getBody0();
    const btCollisionObject* b = manifold->getBody1();
    const bool ground_is_a = a == world.ground();
    if (!ground_is_a && b != world.ground()) continue;
    const auto* link = btMultiBodyLinkCollider::upcast(ground_is_a ? b : a);
    if (link == nullptr || link->m_multiBody != robot.body) continue;
    // Impulses act on body A along +direction; the robot part's sign follows from its side.
    const double sign = ground_is_a ? -1.0 : 1.0;
    for (int p = 0; p < manifold->getNumContacts(); ++p) {
      const btManifoldPoint& pt = manifold->getContactPoint(p);
      if (link->m_link != kLeftWheelLink && link->m_link != kRightWheelLink) {
        chassis_on_ground = chassis_on_ground || pt.getDistance() <= 0;
        continue;
      }
      WheelSums& w = sums[static_cast<size_t>(link->m_link)];
      const btVector3 impulse = pt.m_appliedImpulse * pt.m_normalWorldOnB +
                                pt.m_appliedImpulseLateral1 * pt.m_lateralFrictionDir1 +
                                pt.m_appliedImpulseLateral2 * pt.m_lateralFrictionDir2;
      w.force += sign * inv_dt * impulse;
      w.normal_N += pt.m_appliedImpulse * inv_dt;
      if (pt.getDistance() <= 0 || pt.m_appliedImpulse > 0) w.touching = true;
      if (pt.m_appliedImpulse > w.strongest) {
        w.strongest = pt.m_appliedImpulse;
        w.normal = sign * pt.m_normalWorldOnB;  // out of the ground, toward the wheel
        w.friction = pt.m_combinedFriction;
      }
    }
  }
  const btVector3 axle = robot.body->getBaseWorldTransform().getBasis().getColumn(1);
  for (size_t i = 0; i < 2; ++i) {
    const WheelSums& w = sums[i];
    WheelContact& c = out->wheels[i];
    // Rolling direction: across the axle, along the ground.
    btVector3 forward = axle.cross(w.normal);
    forward = forward.length2() > 0 ? forward.normalized() : btVector3(1, 0, 0);
    const btVector3 friction_force = w.force - w.force.dot(w.normal) * w.normal;
    c.touching = w.touching;
    c.normal_N = w.normal_N;
    c.traction_N = friction_force.dot(forward);
    c.lateral_N = friction_force.dot(axle);
    c.friction = w.friction;
    c.friction_use =
        (w.friction > 0 && w.normal_N > 0) ? friction_force.length() / (w.friction * w.normal_N)
                                           : 0.0;
    const double rim_m_s = wheel_spin_rad_s[i] * wheel_radius_m;
    const double hub_m_s = hub_velocity[i].dot(forward);
    c.slip_ratio = (rim_m_s - hub_m_s) /
                   std::max({std::abs(rim_m_s), std::abs(hub_m_s), kSlipSpeedFloor_m_s});
  }
  out->chassis_on_ground = chassis_on_ground;
}

}  // namespace upright::sim::internal
