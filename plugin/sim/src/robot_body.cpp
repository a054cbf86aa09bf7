#include "robot_body.hpp"

#include <btBulletDynamicsCommon.h>

#include <BulletDynamics/Featherstone/btMultiBody.h>
#include <BulletDynamics/Featherstone/btMultiBodyDynamicsWorld.h>
#include <BulletDynamics/Featherstone/btMultiBodyJointLimitConstraint.h>
#include <BulletDynamics/Featherstone/btMultiBodyLinkCollider.h>

#include <cmath>
#include <memory>

namespace upright::sim::internal {
namespace {

constexpr double kChassisMargin_m = 0.001;  // collision margin of the chassis and payload boxes

btMultiBodyLinkCollider* AddCollider(World& world, btMultiBody* body, int link,
                                     std::unique_ptr<btCollisionShape> shape, double friction) {
  auto* collider = world.Own(std::make_unique<btMultiBodyLinkCollider>(body, link));
  collider->setCollisionShape(world.Own(std::move(shape)));
  collider->setFriction(friction);
  collider->setRestitution(0.0);
  collider->setRollingFriction(0.0);
  collider->setSpinningFriction(0.0);
  collider->setActivationState(DISABLE_DEACTIVATION);
  world.bt().addCollisionObject(collider, btBroadphaseProxy::DefaultFilter,
                                btBroadphaseProxy::AllFilter);
  if (link == kChassisLink) {
    body->setBaseCollider(collider);
  } else {
    body->getLink(link).m_collider = collider;
  }
  return collider;
}

// btCompoundShape does not own its children; this one does.
struct OwningCompound : btCompoundShape {
  ~OwningCompound() override {
    for (int i = 0; i < getNumChildShapes(); ++i) delete getChildShape(i);
  }
};

// A box of the given size centred at `centre` in the body's COM frame.
std::unique_ptr<btCollisionShape> Box(double lx, double ly, double lz, const btVector3& centre) {
  auto box = std::make_unique<btBoxShape>(btVector3(lx / 2, ly / 2, lz / 2));
  box->setMargin(kChassisMargin_m);
  auto compound = std::make_unique<OwningCompound>();
  compound->addChildShape(btTransform(btQuaternion::getIdentity(), centre), box.release());
  return compound;
}

}  // namespace

RobotBody BuildRobot(World& world, const model::RobotModel& model, const PlantOptions& options) {
  const model::ChassisModel& c = model.chassis;
  const model::WheelModel& w = model.wheel;
  const model::PayloadModel& p = model.payload;
  RobotBody robot;
  robot.has_payload = p.present;
  robot.com_to_axle = btVector3(-c.com_forward_m, 0, -c.com_height_m);

  const int links = p.present ? 3 : 2;
  auto* body = world.Own(std::make_unique<btMultiBody>(
      links, c.mass_kg, btVector3(c.roll_inertia_kgm2, c.pitch_inertia_kgm2, c.yaw_inertia_kgm2),
      options.fixed_chassis, /*canSleep=*/false));
  robot.body = body;

  // Wheels: revolute about body y at the axle ends; inertia (diameter, spin, diameter).
  const btVector3 wheel_inertia(w.diameter_inertia_kgm2, w.spin_inertia_kgm2,
                                w.diameter_inertia_kgm2);
  for (int link : {kLeftWheelLink, kRightWheelLink}) {
    const double y = (link == kLeftWheelLink ? 0.5 : -0.5) * w.track_m;
    body->setupRevolute(link, w.mass_kg, wheel_inertia, kChassisLink, btQuaternion::getIdentity(),
                        btVector3(0, 1, 0), robot.com_to_axle + btVector3(0, y, 0),
                        btVector3(0, 0, 0), /*disableParentCollision=*/true);
  }
  if (p.present) {
    // Prismatic along body x; the joint coordinate is the payload centre's body x.
    const btVector3 inertia(p.mass_kg * (p.width_m * p.width_m + p.height_m * p.height_m) / 12,
                            p.mass_kg * (p.length_m * p.length_m + p.height_m * p.height_m) / 12,
                            p.mass_kg * (p.length_m * p.length_m + p.width_m * p.width_m) / 12);
    body->setupPrismatic(kPayloadLink, p.mass_kg, inertia, kChassisLink,
                         btQuaternion::getIdentity(), btVector3(1, 0, 0),
                         robot.com_to_axle + btVector3(0, 0, p.z_m), btVector3(0, 0, 0),
                         /*disableParentCollision=*/true);
  }
  body->finalizeMultiDof();
  body->setLinearDamping(0);
  body->setAngularDamping(0);
  body->setHasSelfCollision(false);
  body->setCanSleep(false);
  body->setMaxCoordinateVelocity(1e4);  // Bullet's default of 100 rad/s would clip fast wheels

  // Pose: axle midpoint on the ground below (or held above it), chassis pitched about the axle.
  const InitialState& init = options.initial;
  const double ground_z = options.terrain.HeightAt(init.x_m);
  const double slope = std::atan(options.terrain.SlopeAt(init.x_m));
  const double axle_z = options.fixed_chassis ? ground_z + options.fixed_height_m
                                              : ground_z + w.radius_m / std::cos(slope);
  const btQuaternion pitch(btVector3(0, 1, 0), init.pitch_rad);
  const btVector3 axle(init.x_m, 0, axle_z);
  const btVector3 com = axle - quatRotate(pitch, robot.com_to_axle);
  body->setBaseWorldTransform(btTransform(pitch, com));
  if (!options.fixed_chassis) {
    body->setBaseVel(init.speed_m_s * btVector3(std::cos(slope), 0, std::sin(slope)));
  }
  for (int link : {kLeftWheelLink, kRightWheelLink}) {
    body->setJointPos(link, 0);
    body->setJointVel(link, options.fixed_chassis ? 0 : init.speed_m_s / w.radius_m);
  }
  if (p.present) body->setJointPos(kPayloadLink, p.x_m);

  world.bt().addMultiBody(body);
  const btVector3 box_centre((c.outline_front_m + c.outline_rear_m) / 2, 0,
                             (c.outline_top_m + c.outline_bottom_m) / 2);
  AddCollider(world, body, kChassisLink,
              Box(c.outline_front_m - c.outline_rear_m, c.outline_width_m,
                  c.outline_top_m - c.outline_bottom_m, box_centre + robot.com_to_axle),
              options.chassis_friction);
  for (int link : {kLeftWheelLink, kRightWheelLink}) {
    robot.wheel_colliders[link] =
        AddCollider(world, body, link, std::make_unique<btSphereShape>(w.radius_m), w.friction);
  }
  if (p.present) {
    AddCollider(world, body, kPayloadLink,
                Box(p.length_m, p.width_m, p.height_m, btVector3(0, 0, 0)),
                options.chassis_friction);
    auto* stops = world.Own(
        std::make_unique<btMultiBodyJointLimitConstraint>(body, kPayloadLink, p.min_x_m, p.max_x_m));
    world.bt().addMultiBodyConstraint(stops);
  }
  btAlignedObjectArray<btQuaternion> scratch_q;
  btAlignedObjectArray<btVector3> scratch_m;
  body->forwardKinematics(scratch_q, scratch_m);
  body->updateCollisionObjectWorldTransforms(scratch_q, scratch_m);
  return robot;
}

}  // namespace upright::sim::internal
