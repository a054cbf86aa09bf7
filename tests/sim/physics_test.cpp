// Physics validation of the engine configuration every run uses (World: fixed step, double
// precision, multibody solver, plane or mesh ground, friction regions) against textbook results.
// Each tolerance is stated beside its check: a margin over the error this configuration showed
// (common practice), or tighter where the engine reproduces the law to round-off; where the error
// comes from the time step, the test also shows it shrinking when the step is halved.
#include <BulletDynamics/Featherstone/btMultiBody.h>
#include <BulletDynamics/Featherstone/btMultiBodyDynamicsWorld.h>
#include <BulletDynamics/Featherstone/btMultiBodyLinkCollider.h>
#include <btBulletDynamicsCommon.h>
#include <gtest/gtest.h>

#include <cmath>
#include <memory>
#include <numbers>

#include "upright/model/conventions.hpp"
#include "world.hpp"

namespace upright::sim::internal {
namespace {

constexpr double kG = model::kStandardGravity_m_s2;
constexpr double kDeg = std::numbers::pi / 180;

// A free ball (a floating multibody with no links) with a sphere collider and the given inertia.
// A huge inertia makes it a sliding point contact; the inertia of a disc makes it a rolling wheel.
btMultiBody* AddBall(World& world, double mass_kg, const btVector3& inertia, double radius_m,
                     double friction, const btVector3& position) {
  auto* body = world.Own(std::make_unique<btMultiBody>(0, mass_kg, inertia, false, false));
  body->finalizeMultiDof();
  body->setLinearDamping(0);
  body->setAngularDamping(0);
  body->setMaxCoordinateVelocity(1e4);
  body->setBasePos(position);
  world.bt().addMultiBody(body);
  auto* collider = world.Own(std::make_unique<btMultiBodyLinkCollider>(body, -1));
  collider->setCollisionShape(world.Own(std::make_unique<btSphereShape>(radius_m)));
  collider->setFriction(friction);
  collider->setRestitution(0);
  collider->setWorldTransform(btTransform(btQuaternion::getIdentity(), position));
  world.bt().addCollisionObject(collider, btBroadphaseProxy::DefaultFilter,
                                btBroadphaseProxy::AllFilter);
  body->setBaseCollider(collider);
  return body;
}

// Uniform disc spinning about y: ½ m r² about the axle, ¼ m r² about a diameter (handbook,
// from memory).
btVector3 DiscInertia(double m, double r) { return btVector3(m * r * r / 4, m * r * r / 2, m * r * r / 4); }
const btVector3 kNoRotation(1e12, 1e12, 1e12);  // a ball that slides but cannot roll

// Runs `seconds` of simulated time; returns the ball's base velocity afterwards.
btVector3 RunFor(World& world, btMultiBody* ball, double seconds) {
  const long steps = std::lround(seconds / world.dt_s());
  for (long i = 0; i < steps; ++i) world.Step();
  return ball->getBaseVel();
}

Terrain Slope(double deg) {
  Terrain t;
  t.kind = TerrainKind::kSlope;
  t.slope_deg = deg;
  return t;
}

// A mesh ground that rises at `deg` from x = 0 for 40 m (the ball starts in the middle of it).
Terrain MeshRamp(double deg) {
  Terrain t;
  t.kind = TerrainKind::kProfile;
  t.start_x_m = -20;
  t.segments.push_back({SegmentKind::kRamp, 40, 40 * std::tan(deg * kDeg)});
  return t;
}

// Speed along the incline after `seconds`, for a ball released at rest on it.
double SpeedDownIncline(const Terrain& ground, double dt, const btVector3& inertia,
                        double friction, double seconds) {
  World world(dt, 10);
  world.AddGround(ground, 0.2);
  const double r = 0.1, slope = std::atan(ground.SlopeAt(0));
  const double z0 = ground.HeightAt(0) + r / std::cos(slope);
  btMultiBody* ball = AddBall(world, 2.0, inertia, r, friction, btVector3(0, 0, z0));
  const btVector3 v = RunFor(world, ball, seconds);
  return v.length();
}

TEST(Physics, FreeFallMatchesTheDiscreteSumAndConvergesToTheContinuousLaw) {
  // Semi-implicit Euler: v_n = −g n dt exactly, z_n = z0 − g dt² n(n+1)/2; against the continuous
  // law z0 − g t²/2 the error is g dt t / 2, halving with the step (kinematics, from memory).
  double continuous_error[2];
  for (int k = 0; k < 2; ++k) {
    const double dt = 0.001 / (1 << k);
    World world(dt, 10);  // no ground
    btMultiBody* ball = AddBall(world, 1.0, btVector3(0.1, 0.1, 0.1), 0.1, 0.5, btVector3(0, 0, 100));
    const btVector3 v = RunFor(world, ball, 1.0);
    const double n = std::round(1.0 / dt);
    const double z = ball->getBasePos().z();
    EXPECT_NEAR(v.z(), -kG * 1.0, 1e-9 * kG);
    EXPECT_NEAR(z, 100 - kG * dt * dt * n * (n + 1) / 2, 1e-9 * 100);
    continuous_error[k] = std::abs(z - (100 - kG / 2));
    EXPECT_NEAR(continuous_error[k], kG * dt / 2, 1e-9);
  }
  EXPECT_NEAR(continuous_error[0] / continuous_error[1], 2.0, 1e-6);
}

TEST(Physics, DiscRollsDownAPlaneAtGSinThetaOverOnePlusIOverMR2) {
  // a = g sinθ / (1 + I/(m r²)) = (2/3) g sinθ for a uniform disc rolling without slip
  // (rigid-body dynamics handbook, from memory). The speed of a disc rolling on a plane comes
  // out exact to round-off at either step (seen: 4e-16), so there is no step error left to
  // shrink and the test holds it to 1e-9.
  const double theta = 15 * kDeg, t = 1.0;
  const double expected = 2.0 / 3.0 * kG * std::sin(theta) * t;
  for (double dt : {0.001, 0.0005}) {
    const double v = SpeedDownIncline(Slope(15), dt, DiscInertia(2.0, 0.1), 1.0, t);
    EXPECT_NEAR(v / expected, 1.0, 1e-9) << "dt = " << dt;
  }
}

TEST(Physics, DiscRollsDownAMeshRampAsOnThePlane) {
  // Same law on the triangle-mesh ground with internal-edge correction; tolerance on a mesh 5e-3
  // (common practice, a margin over the loss seen below).
  const double theta = 15 * kDeg, t = 1.0;
  const double expected = 2.0 / 3.0 * kG * std::sin(theta) * t;
  // The loss comes from triangle-edge crossings, one per few steps, so it shrinks
  // (seen: 3.6e-4 → 9.0e-5) when the step is halved.
  double error[2];
  for (int k = 0; k < 2; ++k) {
    const double dt = 0.001 / (1 << k);
    const double v = SpeedDownIncline(MeshRamp(15), dt, DiscInertia(2.0, 0.1), 1.0, t);
    error[k] = std::abs(v / expected - 1);
    EXPECT_LT(error[k], 5e-3) << "dt = " << dt;
  }
  EXPECT_LT(error[1], 0.5 * error[0]);
}

TEST(Physics, PointContactSticksBelowTheFrictionAngleAndSlidesAbove) {
  // A block (here a ball that cannot turn) on an incline stays put while tanθ ≤ μ and otherwise
  // slides with a = g (sinθ − μ cosθ) (Coulomb friction, mechanics handbook, from memory).
  // μ = 0.5: the friction angle is atan 0.5 = 26.57°. Tolerance 1e-3 (common practice). A sliding
  // contact's speed has no step error (constant acceleration), so there is nothing to shrink.
  const double mu = 0.5;
  EXPECT_LT(SpeedDownIncline(Slope(25), 0.001, kNoRotation, mu, 1.0), 1e-6);
  EXPECT_LT(SpeedDownIncline(Slope(26), 0.001, kNoRotation, mu, 1.0), 1e-6);
  for (double deg : {28.0, 35.0}) {
    const double a = kG * (std::sin(deg * kDeg) - mu * std::cos(deg * kDeg));
    const double v = SpeedDownIncline(Slope(deg), 0.001, kNoRotation, mu, 1.0);
    EXPECT_NEAR(v / a, 1.0, 1e-3) << deg << " deg";
  }
}

TEST(Physics, DiscSlipsOnlyWhenTanThetaExceedsThreeMu) {
  // Rolling without slip needs a friction force m g sinθ / 3 ≤ μ m g cosθ, so a uniform disc
  // rolls while tanθ ≤ 3μ and slides above, its centre then accelerating at g (sinθ − μ cosθ)
  // (rigid-body dynamics handbook, from memory). μ = 0.1: threshold atan 0.3 = 16.70°.
  const double mu = 0.1, r = 0.1, m = 2.0, t = 1.0;
  for (double deg : {15.0, 16.5, 17.0, 20.0}) {
    World world(0.001, 10);
    world.AddGround(Slope(deg), 0.2);
    const double theta = deg * kDeg;
    btMultiBody* disc = AddBall(world, m, DiscInertia(m, r), r, mu,
                                btVector3(0, 0, r / std::cos(theta)));
    const btVector3 v = RunFor(world, disc, t);
    const double rim_speed = std::abs(disc->getBaseOmega().y()) * r;
    const bool rolls = std::tan(theta) <= 3 * mu;
    const double a = rolls ? 2.0 / 3.0 * kG * std::sin(theta)
                           : kG * (std::sin(theta) - mu * std::cos(theta));
    EXPECT_NEAR(v.length() / (a * t), 1.0, 2e-3) << deg << " deg";
    // Sliding, the friction torque spins the disc up at 2 μ g cosθ / r, so the slip speed grows
    // at g (sinθ − 3μ cosθ); rolling, it stays zero.
    const double slip_speed = v.length() - rim_speed;
    const double expected_slip = rolls ? 0.0 : kG * (std::sin(theta) - 3 * mu * std::cos(theta)) * t;
    EXPECT_NEAR(slip_speed, expected_slip, 2e-3 * v.length()) << deg << " deg";
  }
}

// Period of a compound pendulum (a ball on a massless rod) swinging from `theta0` about a fixed
// pivot, measured from the upward zero crossings of its angle over several swings.
double MeasuredPendulumPeriod(double dt, double theta0, double rod_m, double mass_kg,
                              double ball_inertia) {
  World world(dt, 10);  // no ground
  auto* body = world.Own(std::make_unique<btMultiBody>(1, 1.0, btVector3(1, 1, 1), true, false));
  body->setupRevolute(0, mass_kg, btVector3(ball_inertia, ball_inertia, ball_inertia), -1,
                      btQuaternion::getIdentity(), btVector3(0, 1, 0), btVector3(0, 0, 0),
                      btVector3(0, 0, -rod_m), true);
  body->finalizeMultiDof();
  body->setLinearDamping(0);
  body->setAngularDamping(0);
  body->setBasePos(btVector3(0, 0, 10));
  body->setJointPos(0, theta0);
  world.bt().addMultiBody(body);
  double previous = body->getJointPos(0), first_crossing = -1, last_crossing = -1;
  int crossings = 0;
  for (long i = 1; crossings < 6; ++i) {
    world.Step();
    const double angle = body->getJointPos(0);
    if (previous < 0 && angle >= 0) {
      const double t = (static_cast<double>(i) - angle / (angle - previous)) * dt;
      if (crossings == 0) first_crossing = t;
      last_crossing = t;
      ++crossings;
    }
    previous = angle;
  }
  return (last_crossing - first_crossing) / (crossings - 1);
}

TEST(Physics, PendulumPeriodMatchesTheCompoundPendulumLaw) {
  // T = 2π √(I_pivot / (m g l)) (1 + θ0²/16) (compound pendulum with the first amplitude
  // correction; mechanics handbook, from memory). Tolerance 1e-4 (common practice; the series'
  // next term is of order θ0⁴ ≈ 6e-6).
  const double theta0 = 0.05, l = 0.5, m = 1.0, i_ball = 0.004;
  const double expected = 2 * std::numbers::pi * std::sqrt((i_ball + m * l * l) / (m * kG * l)) *
                          (1 + theta0 * theta0 / 16);
  double error[2];
  for (int k = 0; k < 2; ++k) {
    const double dt = 0.001 / (1 << k);
    const double period = MeasuredPendulumPeriod(dt, theta0, l, m, i_ball);
    error[k] = std::abs(period / expected - 1);
    EXPECT_LT(error[k], 1e-4) << "dt = " << dt;
  }
  EXPECT_LT(error[1], error[0]);
}

// Deceleration of a sliding point contact on each side of a friction-region boundary at x = 1 m,
// measured over windows well inside each side.
void ExpectSlidingDecelerationOnBothSides(Terrain ground) {
  // A block sliding on level ground decelerates at μ g (Coulomb friction, mechanics handbook,
  // from memory). Tolerance 1e-3 (common practice); constant deceleration leaves no step error.
  const double dry = 0.6, wet = 0.2;
  ground.friction_regions.push_back({1.0, 100.0, wet});
  World world(0.001, 10);
  world.AddGround(ground, 0.2);
  const double r = 0.05;
  btMultiBody* ball = AddBall(world, 1.0, kNoRotation, r, dry, btVector3(-0.5, 0, r));
  ball->setBaseVel(btVector3(5.0, 0, 0));
  auto deceleration_over = [&](double seconds) {
    const double v0 = ball->getBaseVel().x();
    const double v1 = RunFor(world, ball, seconds).x();
    return (v0 - v1) / seconds;
  };
  RunFor(world, ball, 0.02);  // settle onto the ground
  const double before = deceleration_over(0.2);
  EXPECT_LT(ball->getBasePos().x(), 1.0);
  // Start the second window between mesh vertices: a window that opens on the very step a new
  // triangle is touched catches that contact's first, un-warm-started impulse.
  while (ball->getBasePos().x() < 1.3) world.Step();
  const double after = deceleration_over(0.5);
  EXPECT_GT(ball->getBasePos().x(), 1.0);
  EXPECT_NEAR(before / (dry * kG), 1.0, 1e-3);
  EXPECT_NEAR(after / (wet * kG), 1.0, 1e-3);
}

TEST(Physics, SlidingDecelerationFollowsTheFrictionRegionOnAPlane) {
  ExpectSlidingDecelerationOnBothSides(Terrain{});
}

TEST(Physics, SlidingDecelerationFollowsTheFrictionRegionOnAMesh) {
  Terrain mesh;
  mesh.kind = TerrainKind::kProfile;
  mesh.start_x_m = 10;  // the ball slides on the flat lead-in of the mesh
  mesh.segments.push_back({SegmentKind::kPlateau, 1, 0});
  ExpectSlidingDecelerationOnBothSides(mesh);
}

}  // namespace
}  // namespace upright::sim::internal
