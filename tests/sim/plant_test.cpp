#include "upright/sim/plant.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <memory>
#include <numbers>
#include <string>
#include <vector>

#include "succeeded.hpp"
#include "test_robot.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::sim {
namespace {

using testing::MakePlant;
using testing::MakeTestRobot;
using testing::Unpowered;
using testing::RollingMass;
using testing::TraceHash;

constexpr double kG = model::kStandardGravity_m_s2;

// Linear momentum along world x of chassis and wheels (no payload), from the true state: the
// wheel centres move with the axle, the chassis COM is l above it, so
// p = (M + 2 m_w) v + M l cosθ θ' (rigid-body kinematics).
double MomentumX(const model::RobotModel& m, const TrueState& s) {
  return RollingMass(m) * s.forward_speed_m_s +
         m.chassis.mass_kg * m.chassis.com_height_m * std::cos(s.pitch_rad) * s.pitch_rate_rad_s;
}

std::string CreateError(const model::RobotModel& model, const PlantOptions& options) {
  const auto plant = Plant::Create(model, options);
  EXPECT_FALSE(plant.has_value()) << "accepted; expected an error";
  return plant ? std::string() : plant.error();
}

// --- Create ---

TEST(Plant, CreatesFromTheTestRobotAndTheDemoModel) {
  EXPECT_TRUE(Succeeded(Plant::Create(MakeTestRobot(), PlantOptions())));
  const auto demo = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  ASSERT_TRUE(Succeeded(demo));
  auto plant = Plant::Create(*demo, PlantOptions());
  ASSERT_TRUE(Succeeded(plant));
  for (int k = 0; k < 100; ++k) (*plant)->Step();
  EXPECT_FALSE((*plant)->diverged());
}

struct BadOptions {
  const char* what;
  PlantOptions options;
  const char* expected_text;  // the field and its value as the message must show them
};

TEST(Plant, CreateRejectsInvalidOptionsNamingFieldAndValue) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  std::vector<BadOptions> cases;
  PlantOptions o;
  o.dt_s = 0;
  cases.push_back({"zero step", o, "PlantOptions::dt_s = 0"});
  o.dt_s = -0.001;
  cases.push_back({"negative step", o, "PlantOptions::dt_s = -0.001"});
  o.dt_s = nan;
  cases.push_back({"nan step", o, "PlantOptions::dt_s = nan"});
  o = PlantOptions();
  o.solver_iterations = 0;
  cases.push_back({"no iterations", o, "PlantOptions::solver_iterations = 0"});
  o = PlantOptions();
  o.initial.pitch_rad = 2.0;
  cases.push_back({"lying flat", o, "PlantOptions::initial.pitch_rad = 2"});
  o = PlantOptions();
  o.fixed_chassis = true;
  o.fixed_height_m = -1;
  cases.push_back({"stand below ground", o, "PlantOptions::fixed_height_m = -1"});
  o = PlantOptions();
  o.chassis_friction = -0.5;
  cases.push_back({"chassis friction", o, "PlantOptions::chassis_friction = -0.5"});
  o = PlantOptions();
  o.terrain.kind = TerrainKind::kSlope;
  o.terrain.slope_deg = 50;
  cases.push_back({"terrain", o, "Terrain::slope_deg = 50"});
  o = PlantOptions();
  o.terrain.friction_regions = {{2, 1, 0.3}};
  cases.push_back({"friction region", o, "Terrain::friction_regions[0].end_x_m = 1"});
  for (const BadOptions& c : cases) {
    EXPECT_FALSE(c.options.Validate().has_value()) << c.what;
    const std::string error = CreateError(MakeTestRobot(), c.options);
    EXPECT_NE(error.find(c.expected_text), std::string::npos)
        << c.what << ": message '" << error << "' lacks '" << c.expected_text << "'";
  }
}

TEST(Plant, CreateRejectsAControlPeriodThatIsNotWholeSteps) {
  PlantOptions options;
  options.dt_s = 0.003;  // 100 Hz control: 3.33 steps per period
  const std::string error = CreateError(MakeTestRobot(), options);
  EXPECT_NE(error.find("control rate_hz = 100"), std::string::npos) << error;
  EXPECT_NE(error.find("dt_s = 0.003"), std::string::npos) << error;
}

TEST(Plant, CreateRejectsAnImuPeriodThatIsNotWholeSteps) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.imu_rate_hz = 300;  // 3.33 steps of 1 ms
  const std::string error = CreateError(model, PlantOptions());
  EXPECT_NE(error.find("imu rate_hz = 300"), std::string::npos) << error;
  EXPECT_NE(error.find("dt_s = 0.001"), std::string::npos) << error;
}

TEST(Plant, CreateAcceptsAnImuFasterThanThePhysics) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.imu_rate_hz = 3000;
  EXPECT_TRUE(Succeeded(Plant::Create(model, PlantOptions())));
}

TEST(Plant, CreateRejectsAnInvalidModelNamingFieldAndValue) {
  model::RobotModel model = MakeTestRobot();
  model.chassis.mass_kg = -1;
  const std::string error = CreateError(model, PlantOptions());
  EXPECT_NE(error.find("mass_kg"), std::string::npos) << error;
  EXPECT_NE(error.find("-1"), std::string::npos) << error;
}

TEST(Plant, CreateRejectsMotorDampingTooStiffForTheStep) {
  model::RobotModel model = MakeTestRobot();
  model.motor.gear_ratio = 100;
  // Damping b + n² η K_t K_e / R = 0.02 + 8 = 8.02 N·m·s/rad on 0.01 kg·m²: an explicit step
  // of 2 ms moves 1.6 times the speed it damps (k dt / I), so it would overshoot; 1 ms is 0.8.
  PlantOptions options;
  options.dt_s = 0.002;
  const std::string error = CreateError(model, options);
  EXPECT_NE(error.find("dt_s = 0.002"), std::string::npos) << error;
  options.dt_s = 0.001;
  EXPECT_TRUE(Succeeded(Plant::Create(model, options)));
}

TEST(Plant, AddPushRejectsAnInvalidPush) {
  auto plant = MakePlant(MakeTestRobot(), PlantOptions());
  ASSERT_NE(plant, nullptr);
  Push push;
  push.duration_s = -1;
  const Status added = plant->AddPush(push);
  ASSERT_FALSE(added.has_value());
  EXPECT_NE(added.error().find("Push::duration_s = -1"), std::string::npos) << added.error();
}

// --- Stepping ---

TEST(Plant, StartsWhereToldAndCountsStepsAndTime) {
  PlantOptions options = Unpowered();
  options.initial.x_m = 2.0;
  options.initial.pitch_rad = 0.1;
  options.dt_s = 0.0005;
  auto plant = MakePlant(MakeTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  EXPECT_NEAR(plant->truth().x_m, 2.0, 1e-12);
  EXPECT_NEAR(plant->truth().z_m, 0.1, 1e-12);  // axle one wheel radius above the ground
  EXPECT_NEAR(plant->truth().pitch_rad, 0.1, 1e-12);
  EXPECT_EQ(plant->step_count(), 0);
  for (int k = 0; k < 10; ++k) plant->Step();
  EXPECT_EQ(plant->step_count(), 10);
  EXPECT_NEAR(plant->time_s(), 0.005, 1e-15);
  EXPECT_NEAR(plant->truth().time_s, 0.005, 1e-15);
}

TEST(Plant, StartsOnASlopeWithTheAxleOneRadiusAboveTheGround) {
  PlantOptions options = Unpowered();
  options.terrain.kind = TerrainKind::kSlope;
  options.terrain.slope_deg = 10;
  options.initial.x_m = 1.0;
  auto plant = MakePlant(MakeTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  // The wheel touches the plane z = x tanθ, so its centre is r / cosθ above the plane at the
  // same x (plane geometry).
  const double slope = 10 * std::numbers::pi / 180;
  EXPECT_NEAR(plant->truth().z_m, std::tan(slope) + 0.1 / std::cos(slope), 1e-9);
  plant->Step();
  EXPECT_TRUE(plant->contact().wheels[model::kLeft].touching);
  EXPECT_TRUE(plant->contact().wheels[model::kRight].touching);
}

// Hashes of everything a run reports: the true state, the sensor samples, motors, contacts.
struct RunHashes {
  std::uint64_t truth = 0, sensors = 0;
  bool fell = false;
};

RunHashes RunKnockedOver(std::uint64_t seed) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.gyro_noise_rad_s_rthz = 0.01;
  model.sensors.accel_noise_m_s2_rthz = 0.02;
  PlantOptions options;
  options.seed = seed;
  options.initial.pitch_rad = 0.01;
  auto plant = MakePlant(model, options);
  RunHashes out;
  if (!plant) return out;
  Push push;
  push.shape = PushShape::kHalfSine;
  push.start_s = 0.3;
  push.duration_s = 0.1;
  push.peak_N = 300;
  push.direction_deg = 20;
  EXPECT_TRUE(Succeeded(plant->AddPush(push)));
  TraceHash truth, sensors;
  for (int k = 0; k < 2000; ++k) {
    // Commands computed from the sensors, so that they depend on the noise and its seed.
    const SensorSample s = plant->Sense();
    const double volts = 40 * (s.accel_m_s2[0] / kG) + 2 * s.gyro_rad_s[1];
    plant->SetCommand(volts, 0.9 * volts);
    plant->Step();
    testing::AddPhysics(*plant, &truth);
    out.fell = out.fell || plant->contact().chassis_on_ground;
    testing::AddSensors(*plant, &sensors);
  }
  EXPECT_FALSE(plant->diverged());
  out.truth = truth.value();
  out.sensors = sensors.value();
  return out;
}

TEST(Plant, SameInputsAndSeedGiveABitIdenticalRunThroughAFall) {
  const RunHashes a = RunKnockedOver(7), b = RunKnockedOver(7);
  EXPECT_TRUE(a.fell) << "the push must knock the robot over, impact included";
  EXPECT_EQ(a.truth, b.truth);
  EXPECT_EQ(a.sensors, b.sensors);
}

TEST(Plant, DifferentSeedGivesDifferentSensorTrace) {
  const RunHashes a = RunKnockedOver(7), b = RunKnockedOver(8);
  EXPECT_NE(a.sensors, b.sensors);
}

TEST(Plant, ChassisTouchesTheGroundOnlyAtTheGeometricTippingAngle) {
  const model::RobotModel model = MakeTestRobot();
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = 0.05;
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  // The front-bottom corner of the outline (x_f, z_b) = (0.15, −0.05) relative to the axle,
  // which rides r = 0.1 above flat ground, reaches the ground when
  // r − x_f sinθ + z_b cosθ = 0, i.e. θ = asin(r / ρ) − atan2(−z_b, x_f), ρ = hypot(x_f, z_b)
  // (plane geometry): 0.363 rad, 20.8°.
  const double xf = model.chassis.outline_front_m, zb = model.chassis.outline_bottom_m;
  const double r = model.wheel.radius_m;
  const double tipping = std::asin(r / std::hypot(xf, zb)) - std::atan2(-zb, xf);
  ASSERT_NEAR(tipping, 0.363, 0.001);
  double pitch_at_touch = -1;
  for (int k = 0; k < 3000 && pitch_at_touch < 0; ++k) {
    plant->Step();
    if (plant->contact().chassis_on_ground) pitch_at_touch = plant->truth().pitch_rad;
  }
  ASSERT_GT(pitch_at_touch, 0) << "the unpowered robot never fell";
  // Tolerance: a step of falling (≈ 1 rad/s × 1 ms) early, or late by that plus the rounding of
  // the corner by the outline's 1 mm collision margin (≤ 1 mm / 0.158 m = 0.006 rad).
  EXPECT_GT(pitch_at_touch, tipping - 0.003);
  EXPECT_LT(pitch_at_touch, tipping + 0.008);
}

model::RobotModel WithPayload() {
  model::RobotModel model = MakeTestRobot();
  model::PayloadModel& p = model.payload;
  p.present = true;
  p.mass_kg = 2;
  p.length_m = p.width_m = p.height_m = 0.1;
  p.x_m = 0;
  p.z_m = 0.55;  // resting on the outline's top at 0.5
  p.min_x_m = -0.05;
  p.max_x_m = 0.05;
  return model;
}

TEST(Plant, PayloadCarriageMovesToItsTargetAndTheTargetIsClampedToTheTravel) {
  PlantOptions options;
  options.fixed_chassis = true;
  auto plant = MakePlant(WithPayload(), options);
  ASSERT_NE(plant, nullptr);
  EXPECT_NEAR(plant->truth().payload_x_m, 0.0, 1e-12);  // starts at home
  plant->SetPayloadTarget(0.03);
  for (int k = 0; k < 1000; ++k) plant->Step();
  EXPECT_NEAR(plant->truth().payload_x_m, 0.03, 1e-4);
  plant->SetPayloadTarget(-0.5);  // beyond the rear limit −0.05
  double lowest = 1;
  for (int k = 0; k < 1000; ++k) {
    plant->Step();
    lowest = std::min(lowest, plant->truth().payload_x_m);
  }
  EXPECT_NEAR(plant->truth().payload_x_m, -0.05, 1e-4);
  EXPECT_GT(lowest, -0.05 - 1e-3);
}

TEST(Plant, PayloadEndStopHoldsTheBoxAgainstGravity) {
  PlantOptions options;
  options.fixed_chassis = true;
  options.initial.pitch_rad = 0.5;  // the deck tilts forward: gravity pulls the box to +x
  auto plant = MakePlant(WithPayload(), options);
  ASSERT_NE(plant, nullptr);
  plant->SetPayloadTarget(0.05);  // the front limit; gravity pushes it further
  for (int k = 0; k < 1000; ++k) plant->Step();
  // The stop holds it at the limit (within the joint-limit constraint's softness).
  EXPECT_NEAR(plant->truth().payload_x_m, 0.05, 1e-3);
}

TEST(Plant, WheelsEachCarryHalfTheWeightStandingStill) {
  const model::RobotModel model =
      MakeTestRobot();  // COM above the axle, zero pitch: an equilibrium
  auto plant = MakePlant(model, Unpowered());
  ASSERT_NE(plant, nullptr);
  // (M + 2 m_w) g / 2 per wheel (statics, derived by hand; tolerance 0.1 %, common practice).
  const double expected = RollingMass(model) * kG / 2;
  for (int k = 1; k <= 200; ++k) {
    plant->Step();
    if (k < 20) continue;  // let the first contact settle
    for (int side : {model::kLeft, model::kRight}) {
      const WheelContact& c = plant->contact().wheels[side];
      ASSERT_TRUE(c.touching);
      ASSERT_NEAR(c.normal_N, expected, 0.001 * expected) << "step " << k << " side " << side;
      ASSERT_NEAR(c.traction_N, 0, 0.001 * expected);
      ASSERT_NEAR(c.friction, model.wheel.friction, 1e-12);
    }
    ASSERT_FALSE(plant->contact().chassis_on_ground);
  }
}

TEST(Plant, WheelsCarryHalfTheWeightFromTheFirstStepOnProfileTerrain) {
  const model::RobotModel model = MakeTestRobot();
  PlantOptions options = Unpowered();
  // A profile terrain is a triangle mesh; the robot starts on its level lead-in, 2 m before a
  // ramp, so the ground under it is flat as in the test above.
  options.terrain.kind = TerrainKind::kProfile;
  options.terrain.start_x_m = 2;
  options.terrain.segments = {{SegmentKind::kRamp, 2, 0.2}};
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  // Placed at rest with the wheels on the ground, the robot must be carried from the first step:
  // (M + 2 m_w) g / 2 per wheel (statics; 0.1 %) and +g on the accelerometer (0.2 %).
  const double expected = RollingMass(model) * kG / 2;
  plant->Step();
  EXPECT_TRUE(plant->contact().wheels[model::kLeft].touching)
      << "no wheel contact in the first step";
  double worst_load = 0, worst_accel = 0;  // the largest relative errors over the first 50 ms
  for (int k = 1; k <= 50; ++k) {
    if (k > 1) plant->Step();
    for (int side : {model::kLeft, model::kRight}) {
      const double load = plant->contact().wheels[side].normal_N;
      worst_load = std::max(worst_load, std::abs(load - expected) / expected);
    }
    worst_accel = std::max(worst_accel, std::abs(plant->Sense().accel_m_s2[2] - kG) / kG);
  }
  EXPECT_LT(worst_load, 0.001);
  EXPECT_LT(worst_accel, 0.002);
}

TEST(Plant, WheelsCarryTheRobotOnTheLargestGroundThePhysicsEngineHolds) {
  // A 1 m wide level profile whose mesh at 0.2 m cells has 2097150 triangles, the most below
  // Bullet's 2^21 − 1 (btQuantizedBvh.h; the count is checked in terrain_test.cpp), with wheels
  // small enough for the finest cell, standing near the far end where the triangle indices are
  // largest: carried as on flat ground, (M + 2 m_w) g / 2 per wheel (statics; 0.1 %).
  model::RobotModel model = MakeTestRobot();
  model.wheel.radius_m = 0.05;
  model.chassis.outline_bottom_m = -0.04;  // clear of the ground on the smaller wheels
  ASSERT_EQ(MeshCellFor(model.wheel.radius_m), kFinestMeshCell_m);
  PlantOptions options = Unpowered();
  options.terrain.kind = TerrainKind::kProfile;
  options.terrain.start_x_m = 1;
  options.terrain.width_m = 1;
  options.terrain.segments = {{SegmentKind::kPlateau, 41691.99, 0}};
  ASSERT_EQ(ProfileMeshTriangles(options.terrain, kFinestMeshCell_m), 2097150);
  options.initial.x_m = 41600;
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  const double expected = RollingMass(model) * kG / 2;
  double worst_load = 0;
  for (int k = 1; k <= 50; ++k) {
    plant->Step();
    for (int side : {model::kLeft, model::kRight}) {
      ASSERT_TRUE(plant->contact().wheels[side].touching) << "step " << k;
      const double load = plant->contact().wheels[side].normal_N;
      worst_load = std::max(worst_load, std::abs(load - expected) / expected);
    }
  }
  EXPECT_LT(worst_load, 0.001);
  EXPECT_NEAR(plant->truth().z_m, 0.05, 1e-3);  // the axle one radius above the ground
}

TEST(Plant, ForwardWheelTorqueGivesPositiveTractionAndPitchesTheChassisBack) {
  const model::RobotModel model = MakeTestRobot();
  auto plant = MakePlant(model, Unpowered());
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(1.0, 1.0);  // N·m at each wheel, forward (conventions.hpp)
  const double dt = plant->options().dt_s;
  const double p0 = MomentumX(model, plant->truth());
  double traction_impulse = 0;
  for (int k = 1; k <= 100; ++k) {
    plant->Step();
    for (int side : {model::kLeft, model::kRight}) {
      ASSERT_GT(plant->contact().wheels[side].traction_N, 0) << "step " << k;
      traction_impulse += plant->contact().wheels[side].traction_N * dt;
    }
  }
  EXPECT_GT(plant->truth().forward_speed_m_s, 0);
  EXPECT_LT(plant->truth().pitch_rad, 0);  // the reaction on the chassis pitches it back
  // The only horizontal external forces are the tyres' traction: Σ F dt = Δp (Newton's second
  // law); 1 %.
  const double dp = MomentumX(model, plant->truth()) - p0;
  EXPECT_GT(dp, 0);
  EXPECT_NEAR(traction_impulse, dp, 0.01 * dp);
}

TEST(Plant, PushChangesMomentumByItsImpulseOnFrictionlessGround) {
  const model::RobotModel model = MakeTestRobot();
  PlantOptions options = Unpowered();
  options.terrain.friction_regions = {{-5, 5, 0.0}};  // ice: no horizontal ground force
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  Push push;
  push.shape = PushShape::kHalfSine;
  push.start_s = 0.0503;  // not aligned with the 1 ms steps
  push.duration_s = 0.1;
  push.peak_N = 40;
  push.height_m = 0.3;  // above the COM: it also tips the robot
  ASSERT_TRUE(Succeeded(plant->AddPush(push)));
  for (int k = 0; k < 40; ++k) plant->Step();
  const double p0 = MomentumX(model, plant->truth());
  for (int k = 0; k < 140; ++k) plant->Step();  // to t = 0.18 s, after the push ends
  // J = 2 F T / π for a half-sine (calculus, from memory) = 2.546 N·s; Δp = J (conservation of
  // momentum: only the push acts horizontally); 1 %.
  const double impulse = 2 * 40 * 0.1 / std::numbers::pi;
  EXPECT_NEAR(MomentumX(model, plant->truth()) - p0, impulse, 0.01 * impulse);
  EXPECT_EQ(plant->contact().wheels[model::kLeft].friction, 0);
  EXPECT_NEAR(plant->truth().y_m, 0, 1e-6);
}

TEST(Plant, PushAtNinetyDegreesMovesTheRobotLeft) {
  PlantOptions options = Unpowered();
  options.terrain.friction_regions = {{-5, 5, 0.0}};
  auto plant = MakePlant(MakeTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  Push push;
  push.start_s = 0;
  push.duration_s = 0.05;
  push.peak_N = 50;
  push.direction_deg = 90;  // toward +y, the robot's left (conventions.hpp)
  push.height_m = 0.2;
  ASSERT_TRUE(Succeeded(plant->AddPush(push)));
  for (int k = 0; k < 100; ++k) plant->Step();
  // Δv = J / m = 2.5 N·s / 14 kg = 0.18 m/s: about 1 cm in 0.1 s.
  EXPECT_GT(plant->truth().y_m, 0.005);
  EXPECT_NEAR(plant->truth().x_m, 0, 1e-3);
}

TEST(Plant, RollingResistanceSlowsACoastingRobotAsTheRigidBodyEquationsSay) {
  // Frictionless motors, so the wheels turn freely relative to the chassis.
  model::RobotModel model = testing::MakeFrictionlessTestRobot();
  for (double c_rr : {0.0, 0.05}) {
    model.wheel.rolling_resistance = c_rr;
    PlantOptions options = Unpowered();
    options.initial.speed_m_s = 0.5;
    auto plant = MakePlant(model, options);
    ASSERT_NE(plant, nullptr);
    std::vector<double> speed;
    for (int k = 0; k <= 25; ++k) {
      speed.push_back(plant->truth().forward_speed_m_s);
      plant->Step();
    }
    // Upright at the start, rolling resistance is a torque C_rr N r against each wheel's spin
    // (N = (M + 2 m_w) g / 2). Newton–Euler for the wheels (mass m_w, inertia I_w, rolling) and
    // the chassis hinged on the axle (mass M, inertia I_c about its COM, l above the axle) give
    // a = −2 C_rr N / (2 m_w + 2 I_w / r² + M I_c / (I_c + M l²))
    //   = −C_rr · 14 g / (4 + 2 + 5) (rigid-body dynamics). 1 %.
    const double m_chassis_eff = 10 * 0.4 / (0.4 + 10 * 0.2 * 0.2);  // 5 kg
    const double expected =
        -c_rr * RollingMass(model) * kG / (2 * 2 + 2 * 0.01 / (0.1 * 0.1) + m_chassis_eff);
    const double measured = (speed[25] - speed[5]) / (20 * plant->options().dt_s);
    EXPECT_NEAR(measured, expected, 0.01 * std::abs(expected) + 1e-9) << "C_rr " << c_rr;
  }
}

TEST(Plant, WheelSpinningOnIceHasSlipRatioNearOneAndNoTraction) {
  PlantOptions options = Unpowered();
  options.terrain.friction_regions = {{-5, 5, 0.0}};
  auto plant = MakePlant(testing::MakeFrictionlessTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(0.5, 0.5);
  for (int k = 1; k <= 100; ++k) {
    plant->Step();
    for (int side : {model::kLeft, model::kRight}) {
      const WheelContact& c = plant->contact().wheels[side];
      // s = (ω r − v) / max(|ω r|, |v|): the rim runs, the hub barely moves (momentum stays
      // zero with no ground force); the chassis's counter-rotation moves the hub slightly.
      ASSERT_GT(c.slip_ratio, 0.9) << "step " << k;
      ASSERT_LE(c.slip_ratio, 1.0) << "step " << k;
      ASSERT_EQ(c.traction_N, 0);
      ASSERT_EQ(c.friction_use, 0);
      ASSERT_TRUE(c.touching);
    }
  }
}

TEST(Plant, SpinningWheelPullsWithTheCoulombLimit) {
  PlantOptions options = Unpowered();
  options.terrain.friction_regions = {{-5, 5, 0.1}};  // a wet floor, μ = 0.1
  auto plant = MakePlant(testing::MakeFrictionlessTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  // 1.5 N·m at each wheel would need 15 N of traction at r = 0.1 m; the floor gives at most
  // μ N = 0.1 × 68.6 = 6.9 N, so the wheels spin and pull with μ N (Coulomb friction law).
  plant->SetCommand(1.5, 1.5);
  for (int k = 1; k <= 100; ++k) {
    plant->Step();
    if (k < 5) continue;
    for (int side : {model::kLeft, model::kRight}) {
      const WheelContact& c = plant->contact().wheels[side];
      ASSERT_NEAR(c.friction, 0.1, 1e-12);
      ASSERT_NEAR(c.traction_N, 0.1 * c.normal_N, 0.001 * c.normal_N) << "step " << k;
      ASSERT_NEAR(c.friction_use, 1.0, 0.01) << "step " << k;
      ASSERT_GT(c.slip_ratio, 0.1) << "step " << k;
    }
  }
}

TEST(Plant, WheelContactReportsTheFrictionOfTheRegionItRollsInto) {
  const model::RobotModel model = MakeTestRobot();
  PlantOptions options = Unpowered();
  options.initial.speed_m_s = 0.5;
  options.terrain.friction_regions = {{0.05, 5, 0.3}};
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  for (int k = 1; k <= 200; ++k) {
    plant->Step();
    const double x = plant->truth().x_m;
    if (std::abs(x - 0.05) < 0.002) continue;  // the contact point is within a step of the edge
    const double expected = x < 0.05 ? model.wheel.friction : 0.3;
    ASSERT_NEAR(plant->contact().wheels[model::kLeft].friction, expected, 1e-12) << "x " << x;
    ASSERT_NEAR(plant->contact().wheels[model::kRight].friction, expected, 1e-12) << "x " << x;
  }
  EXPECT_GT(plant->truth().x_m, 0.09);
}

}  // namespace
}  // namespace upright::sim
