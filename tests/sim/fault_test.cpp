// Motor and sensor faults: validation, names, the step a fault starts on, a dead or derated motor
// against the motor equations, and each sensor fault against an identical plant without it.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <numbers>
#include <string>
#include <utility>
#include <vector>

#include "succeeded.hpp"
#include "test_robot.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/faults.hpp"
#include "upright/sim/motor.hpp"
#include "upright/sim/plant.hpp"

namespace upright::sim {
namespace {

using testing::MakePlant;
using testing::MakeTestRobot;
using testing::Unpowered;

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kNan = std::numeric_limits<double>::quiet_NaN();
constexpr double kG = model::kStandardGravity_m_s2;

// The test motor (test_robot.hpp): n η K_t = 10 × 0.8 × 0.05 = 0.4 N·m/A, R = 2.5 Ω, K_e n =
// 0.5 V·s/rad, current limit 4 A, b = 0.02 N·m·s/rad, c = 0.01 N·m; wheel spin inertia 0.01 kg·m².
// Motor equations (motor.hpp; DC motor with armature inductance neglected, any electric-machines
// handbook, from memory): i = (V − K_e n ω) / R, τ = s n η K_t i − b ω − c sat(ω / band).
constexpr double kTorquePerAmp = 0.4;

MotorFault MakeMotorFault(double start_s, MotorSide side, double scale) {
  MotorFault f;
  f.start_s = start_s;
  f.side = side;
  f.torque_scale = scale;
  return f;
}

SensorFault MakeSensorFault(double start_s, double duration_s, SensorChannel channel,
                            SensorFaultKind kind, double value = 0) {
  SensorFault f;
  f.start_s = start_s;
  f.duration_s = duration_s;
  f.channel = channel;
  f.kind = kind;
  f.value = value;
  return f;
}

PlantOptions OnTheStand() {
  PlantOptions options;
  options.fixed_chassis = true;
  options.sensor_noise = false;
  return options;
}

// Friction of the test motor at wheel speed ω, as motor.hpp writes it: b ω + c sat(ω / band).
double Friction(const model::MotorModel& m, double rel_speed_rad_s, double band_rad_s) {
  return m.viscous_friction_Nm_s_per_rad * rel_speed_rad_s +
         m.coulomb_friction_Nm * std::clamp(rel_speed_rad_s / band_rad_s, -1.0, 1.0);
}

// --- Validation and names ---

TEST(Fault, DefaultAndTypicalFaultsAreValid) {
  EXPECT_TRUE(Succeeded(MotorFault().Validate()));
  EXPECT_TRUE(Succeeded(MakeMotorFault(2.5, MotorSide::kBoth, 1.0).Validate()));
  EXPECT_TRUE(Succeeded(SensorFault().Validate()));
  EXPECT_TRUE(Succeeded(
      MakeSensorFault(1, 0.2, SensorChannel::kAccelZ, SensorFaultKind::kBias, -3).Validate()));
  // Only a bias uses its value: the other kinds ignore even a NaN there.
  EXPECT_TRUE(Succeeded(
      MakeSensorFault(0, kInf, SensorChannel::kEncoderLeft, SensorFaultKind::kDropout, kNan)
          .Validate()));
  EXPECT_TRUE(Succeeded(
      MakeSensorFault(0, 1, SensorChannel::kGyroZ, SensorFaultKind::kStuck, kInf).Validate()));
}

TEST(Fault, MotorFaultValidateNamesTheBrokenFieldAndItsValue) {
  struct Bad {
    MotorFault fault;
    const char* expected_text;
  };
  const std::vector<Bad> cases = {
      {MakeMotorFault(-1, MotorSide::kLeft, 0), "MotorFault::start_s = -1, must be finite"},
      {MakeMotorFault(kNan, MotorSide::kLeft, 0), "MotorFault::start_s = nan"},
      {MakeMotorFault(kInf, MotorSide::kLeft, 0), "MotorFault::start_s = inf"},
      {MakeMotorFault(0, MotorSide::kLeft, 1.5),
       "MotorFault::torque_scale = 1.5, must be in [0, 1]"},
      {MakeMotorFault(0, MotorSide::kRight, -0.25), "MotorFault::torque_scale = -0.25"},
      {MakeMotorFault(0, MotorSide::kRight, kNan), "MotorFault::torque_scale = nan"},
      {MakeMotorFault(0, static_cast<MotorSide>(7), 0), "MotorFault::side = 7"},
  };
  for (const Bad& c : cases) {
    const Status valid = c.fault.Validate();
    ASSERT_FALSE(valid.has_value()) << c.expected_text;
    const std::string& error = valid.error();
    EXPECT_NE(error.find(c.expected_text), std::string::npos)
        << "message '" << error << "' lacks '" << c.expected_text << "'";
  }
}

TEST(Fault, SensorFaultValidateNamesTheBrokenFieldAndItsValue) {
  struct Bad {
    SensorFault fault;
    const char* expected_text;
  };
  const auto gyro = SensorChannel::kGyroY;
  const auto bias = SensorFaultKind::kBias;
  const std::vector<Bad> cases = {
      {MakeSensorFault(-0.5, 1, gyro, bias), "SensorFault::start_s = -0.5, must be finite"},
      {MakeSensorFault(kInf, 1, gyro, bias), "SensorFault::start_s = inf"},
      {MakeSensorFault(0, 0, gyro, bias), "SensorFault::duration_s = 0, must be > 0"},
      {MakeSensorFault(0, -1, gyro, SensorFaultKind::kStuck), "SensorFault::duration_s = -1"},
      {MakeSensorFault(0, kNan, gyro, bias), "SensorFault::duration_s = nan"},
      {MakeSensorFault(0, 1, gyro, bias, kInf), "SensorFault::value = inf, must be finite"},
      {MakeSensorFault(0, 1, gyro, bias, kNan), "SensorFault::value = nan"},
      {MakeSensorFault(0, 1, static_cast<SensorChannel>(12), bias), "SensorFault::channel = 12"},
      {MakeSensorFault(0, 1, gyro, static_cast<SensorFaultKind>(5)), "SensorFault::kind = 5"},
  };
  for (const Bad& c : cases) {
    const Status valid = c.fault.Validate();
    ASSERT_FALSE(valid.has_value()) << c.expected_text;
    const std::string& error = valid.error();
    EXPECT_NE(error.find(c.expected_text), std::string::npos)
        << "message '" << error << "' lacks '" << c.expected_text << "'";
  }
}

TEST(Fault, PlantRefusesAnInvalidFaultWithItsMessageAndIgnoresIt) {
  auto plant = MakePlant(MakeTestRobot(), OnTheStand());
  ASSERT_NE(plant, nullptr);
  const Status motor = plant->AddMotorFault(MakeMotorFault(0, MotorSide::kBoth, 2));
  ASSERT_FALSE(motor.has_value());
  EXPECT_NE(motor.error().find("MotorFault::torque_scale = 2"), std::string::npos) << motor.error();
  const Status sensor = plant->AddSensorFault(
      MakeSensorFault(0, -2, SensorChannel::kGyroX, SensorFaultKind::kDropout));
  ASSERT_FALSE(sensor.has_value());
  EXPECT_NE(sensor.error().find("SensorFault::duration_s = -2"), std::string::npos)
      << sensor.error();
  // Neither was stored: the motor delivers its healthy stall current V / R = 2.4 A.
  plant->SetCommand(6, 6);
  plant->Step();
  EXPECT_NEAR(plant->motors()[model::kLeft].current_A, 2.4, 1e-12);
}

TEST(Fault, NamesRoundTripAndUnknownNamesAreRefused) {
  const std::vector<std::pair<MotorSide, const char*>> sides = {
      {MotorSide::kLeft, "left"}, {MotorSide::kRight, "right"}, {MotorSide::kBoth, "both"}};
  for (const auto& [side, name] : sides) {
    EXPECT_STREQ(ToString(side), name);
    MotorSide parsed = side == MotorSide::kBoth ? MotorSide::kLeft : MotorSide::kBoth;
    ASSERT_TRUE(FromString(name, &parsed)) << name;
    EXPECT_EQ(parsed, side);
  }
  const std::vector<std::pair<SensorChannel, const char*>> channels = {
      {SensorChannel::kGyroX, "gyro_x"},
      {SensorChannel::kGyroY, "gyro_y"},
      {SensorChannel::kGyroZ, "gyro_z"},
      {SensorChannel::kAccelX, "accel_x"},
      {SensorChannel::kAccelY, "accel_y"},
      {SensorChannel::kAccelZ, "accel_z"},
      {SensorChannel::kEncoderLeft, "encoder_left"},
      {SensorChannel::kEncoderRight, "encoder_right"}};
  for (const auto& [channel, name] : channels) {
    EXPECT_STREQ(ToString(channel), name);
    SensorChannel parsed =
        channel == SensorChannel::kGyroX ? SensorChannel::kGyroY : SensorChannel::kGyroX;
    ASSERT_TRUE(FromString(name, &parsed)) << name;
    EXPECT_EQ(parsed, channel);
  }
  const std::vector<std::pair<SensorFaultKind, const char*>> kinds = {
      {SensorFaultKind::kBias, "bias"},
      {SensorFaultKind::kDropout, "dropout"},
      {SensorFaultKind::kStuck, "stuck"}};
  for (const auto& [kind, name] : kinds) {
    EXPECT_STREQ(ToString(kind), name);
    SensorFaultKind parsed =
        kind == SensorFaultKind::kBias ? SensorFaultKind::kStuck : SensorFaultKind::kBias;
    ASSERT_TRUE(FromString(name, &parsed)) << name;
    EXPECT_EQ(parsed, kind);
  }
  MotorSide side = MotorSide::kRight;
  EXPECT_FALSE(FromString("Left", &side));
  EXPECT_FALSE(FromString("", &side));
  EXPECT_EQ(side, MotorSide::kRight);
  SensorChannel channel = SensorChannel::kAccelY;
  EXPECT_FALSE(FromString("gyro", &channel));
  EXPECT_FALSE(FromString("encoder_left ", &channel));
  EXPECT_EQ(channel, SensorChannel::kAccelY);
  SensorFaultKind kind = SensorFaultKind::kDropout;
  EXPECT_FALSE(FromString("stuck-at", &kind));
  EXPECT_EQ(kind, SensorFaultKind::kDropout);
  EXPECT_STREQ(ToString(static_cast<SensorChannel>(9)), "?");
}

// --- When a fault starts ---

TEST(Fault, FirstStepIsTheFirstWhoseStartIsAtOrAfterTheFaultAllowingRoundOff) {
  EXPECT_EQ(FirstStepAtOrAfter(0, 0.001), 0);
  EXPECT_EQ(FirstStepAtOrAfter(0.01, 0.001), 10);    // on a boundary: that step
  EXPECT_EQ(FirstStepAtOrAfter(0.0105, 0.001), 11);  // between steps: the next one
  EXPECT_EQ(FirstStepAtOrAfter(0.010001, 0.001), 11);
  EXPECT_EQ(FirstStepAtOrAfter(0.0105, 0.0005), 21);
  // Round-off either side of a boundary: 0.7 / 0.001 = 699.9999999999999 and the plant's own
  // time after 1001 steps, 1001 × 0.001 = 1.0010000000000001, divides to 1001.0000000000001.
  EXPECT_EQ(FirstStepAtOrAfter(0.7, 0.001), 700);
  EXPECT_EQ(FirstStepAtOrAfter(1001 * 0.001, 0.001), 1001);
  EXPECT_EQ(FirstStepAtOrAfter(kInf, 0.001), std::numeric_limits<long>::max());
  EXPECT_EQ(FirstStepAtOrAfter(1e300, 0.001), std::numeric_limits<long>::max());
}

// Step indices (0-based, the k-th call of Step()) at which the left motor delivered no current,
// running 30 steps on the stand at 6 V with a dead-left fault starting at start_s.
std::vector<long> DeadSteps(double start_s, double dt_s) {
  PlantOptions options = OnTheStand();
  options.dt_s = dt_s;
  auto plant = MakePlant(MakeTestRobot(), options);
  std::vector<long> dead;
  if (!plant) return dead;
  EXPECT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(start_s, MotorSide::kLeft, 0))));
  plant->SetCommand(6, 6);
  for (long k = 0; k < 30; ++k) {
    EXPECT_EQ(plant->step_count(), k);
    plant->Step();
    // Healthy at 6 V the current is (6 − 0.5 ω) / 2.5 > 1 A for ω < 7 rad/s, well within 30 ms.
    if (plant->motors()[model::kLeft].current_A == 0) dead.push_back(k);
    EXPECT_GT(plant->motors()[model::kRight].current_A, 1.0);
  }
  return dead;
}

std::vector<long> Range(long first, long end) {
  std::vector<long> r;
  for (long k = first; k < end; ++k) r.push_back(k);
  return r;
}

TEST(Fault, MotorFaultActsFromTheStepThatBeginsAtOrAfterItsStart) {
  EXPECT_EQ(DeadSteps(0.01, 0.001), Range(10, 30));    // step 10 begins at exactly 0.01 s
  EXPECT_EQ(DeadSteps(0.0105, 0.001), Range(11, 30));  // between steps 10 and 11: from 11
  EXPECT_EQ(DeadSteps(0.0105, 0.0005), Range(21, 30));
  EXPECT_EQ(DeadSteps(0, 0.001), Range(0, 30));
}

// --- A dead motor ---

TEST(Fault, DeadMotorDrawsNoCurrentAndDeliversOnlyFriction) {
  const model::MotorModel m = MakeTestRobot().motor;
  const double band = 1e-3;
  for (double speed : {5.0, -3.0, 0.0005, 0.0}) {
    for (DriveMode mode : {DriveMode::kVoltage, DriveMode::kTorque}) {
      for (double command : {0.0, 6.0, -20.0}) {
        const MotorOutput out = EvaluateMotor(m, mode, command, speed, band, 0.0);
        EXPECT_EQ(out.current_A, 0);
        EXPECT_EQ(out.voltage_V, 0);
        EXPECT_EQ(out.power_W(), 0);
        EXPECT_FALSE(out.voltage_saturated);
        EXPECT_FALSE(out.current_saturated);
        EXPECT_NEAR(out.wheel_torque_Nm, -Friction(m, speed, band), 1e-15) << "ω = " << speed;
      }
    }
  }
  // At 5 rad/s: −b ω − c = −0.11 N·m. A healthy motor at 0 V brakes harder through its
  // back-EMF: i = −0.5 × 5 / 2.5 = −1 A, τ = −0.4 − 0.11 N·m.
  EXPECT_NEAR(EvaluateMotor(m, DriveMode::kVoltage, 0, 5, band, 0.0).wheel_torque_Nm, -0.11, 1e-15);
  const MotorOutput braking = EvaluateMotor(m, DriveMode::kVoltage, 0, 5, band);
  EXPECT_NEAR(braking.current_A, -1.0, 1e-12);
  EXPECT_NEAR(braking.wheel_torque_Nm, -0.51, 1e-12);
  // Dead is the same torque as a healthy torque drive commanded to zero.
  EXPECT_EQ(EvaluateMotor(m, DriveMode::kVoltage, 6, 5, band, 0.0).wheel_torque_Nm,
            EvaluateMotor(m, DriveMode::kTorque, 0, 5, band).wheel_torque_Nm);
}

TEST(Fault, DeadMotorOnTheStandCoastsDownUnderFrictionAlone) {
  const model::RobotModel model = MakeTestRobot();
  const model::MotorModel& m = model.motor;
  const double inertia = model.wheel.spin_inertia_kgm2, dt = 0.001;
  const double band = MotorCoulombBand(m, inertia, dt);
  auto plant = MakePlant(model, OnTheStand());
  ASSERT_NE(plant, nullptr);
  ASSERT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(0.5, MotorSide::kLeft, 0))));
  plant->SetCommand(6, 6);
  for (int k = 0; k < 500; ++k) plant->Step();
  const double omega0 = plant->truth().wheel_rate_rad_s[model::kLeft];
  EXPECT_GT(omega0, 9);  // spun up: 9.5 (1 − e^−5) = 9.44 rad/s (motor_test.cpp)
  for (int k = 0; k < 500; ++k) {
    const double before = plant->truth().wheel_rate_rad_s[model::kLeft];
    plant->Step();
    const MotorOutput& left = plant->motors()[model::kLeft];
    ASSERT_EQ(left.current_A, 0) << "step " << k;
    ASSERT_EQ(left.power_W(), 0) << "step " << k;
    // The readout is the torque applied over the step, at the speed it began with.
    ASSERT_NEAR(left.wheel_torque_Nm, -Friction(m, before, band), 1e-12) << "step " << k;
    ASSERT_GT(plant->motors()[model::kRight].current_A, 0) << "step " << k;
  }
  // I ω' = −b ω − c: ω(t) = (ω0 + c/b) e^(−b t / I) − c/b (first-order ODE); 0.5 s is one time
  // constant I / b. The explicit step's error is about dt / 2τ = 0.1 %; allow 1 %.
  const double cb = m.coulomb_friction_Nm / m.viscous_friction_Nm_s_per_rad;
  const double expected =
      (omega0 + cb) * std::exp(-m.viscous_friction_Nm_s_per_rad * 0.5 / inertia) - cb;
  EXPECT_NEAR(plant->truth().wheel_rate_rad_s[model::kLeft], expected, 0.01 * expected);
  // The healthy right wheel kept its speed.
  EXPECT_NEAR(plant->truth().wheel_rate_rad_s[model::kRight], 9.5, 0.005 * 9.5);
}

// --- A derated motor ---

TEST(Fault, HalfDeratedMotorGivesHalfTheStallTorqueAtTheHealthyCurrent) {
  const model::RobotModel model = MakeTestRobot();
  const double inertia = model.wheel.spin_inertia_kgm2, dt = 0.001;
  for (double volts : {6.0, 12.0}) {
    auto plant = MakePlant(model, OnTheStand());
    ASSERT_NE(plant, nullptr);
    ASSERT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(0, MotorSide::kLeft, 0.5))));
    plant->SetCommand(volts, volts);
    plant->Step();
    // At stall i = V / R: 2.4 A at 6 V; 4.8 A at 12 V, cut to the 4 A limit (the drive lowering
    // its voltage to R i = 10 V). The derated left motor draws the same current as the right.
    const double current = std::min(volts / 2.5, 4.0);
    const MotorOutput& left = plant->motors()[model::kLeft];
    const MotorOutput& right = plant->motors()[model::kRight];
    EXPECT_NEAR(left.current_A, current, 1e-12) << volts << " V";
    EXPECT_NEAR(right.current_A, current, 1e-12) << volts << " V";
    EXPECT_NEAR(left.voltage_V, std::min(volts, 10.0), 1e-12) << volts << " V";
    EXPECT_NEAR(left.power_W(), right.power_W(), 1e-12) << volts << " V";
    EXPECT_EQ(left.current_saturated, volts > 10);
    // τ = s n η K_t i: 0.48 and 0.8 N·m against the healthy 0.96 and 1.6 N·m.
    EXPECT_NEAR(left.wheel_torque_Nm, 0.5 * kTorquePerAmp * current, 1e-12) << volts << " V";
    EXPECT_NEAR(right.wheel_torque_Nm, kTorquePerAmp * current, 1e-12) << volts << " V";
    // And the wheels accelerate at τ / I (Newton's second law for rotation), 1 % as in
    // motor_test.cpp.
    const double left_accel = plant->truth().wheel_rate_rad_s[model::kLeft] / dt;
    const double right_accel = plant->truth().wheel_rate_rad_s[model::kRight] / dt;
    EXPECT_NEAR(left_accel, 0.5 * kTorquePerAmp * current / inertia, 0.01 * left_accel);
    EXPECT_NEAR(right_accel, kTorquePerAmp * current / inertia, 0.01 * right_accel);
  }
}

TEST(Fault, HalfDeratedTorqueDriveDeliversHalfItsCommand) {
  const model::MotorModel m = MakeTestRobot().motor;
  // 0.5 N·m asked at stall: the drive sets i = 0.5 / 0.4 = 1.25 A as for a healthy motor.
  const MotorOutput out = EvaluateMotor(m, DriveMode::kTorque, 0.5, 0, 1e-3, 0.5);
  EXPECT_NEAR(out.current_A, 1.25, 1e-12);
  EXPECT_NEAR(out.voltage_V, 1.25 * 2.5, 1e-12);
  EXPECT_NEAR(out.wheel_torque_Nm, 0.25, 1e-12);
}

TEST(Fault, HalfDeratedWheelOnTheStandSettlesAtTheDeratedSteadyStateSpeed) {
  const model::RobotModel model = MakeTestRobot();
  auto plant = MakePlant(model, OnTheStand());
  ASSERT_NE(plant, nullptr);
  ASSERT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(0, MotorSide::kRight, 0.5))));
  plant->SetCommand(6, 6);
  for (int k = 0; k < 1500; ++k) plant->Step();
  // I ω' = s n η K_t (V − K_e n ω) / R − b ω − c = 0 (motor equations above) gives
  // ω = (s 0.16 V − c) / (s 0.08 + b) = (0.48 − 0.01) / 0.06 = 7.833 rad/s, reached with time
  // constant I / 0.06 = 0.167 s, 9 of them in 1.5 s; the healthy left wheel: 9.5 rad/s.
  EXPECT_NEAR(plant->truth().wheel_rate_rad_s[model::kRight], 0.47 / 0.06, 0.005 * 0.47 / 0.06);
  EXPECT_NEAR(plant->truth().wheel_rate_rad_s[model::kLeft], 9.5, 0.005 * 9.5);
}

TEST(Fault, LatestStartedMotorFaultActsAndBothMeansBothMotors) {
  const model::RobotModel model = MakeTestRobot();
  const double band = MotorCoulombBand(model.motor, model.wheel.spin_inertia_kgm2, 0.001);
  auto plant = MakePlant(model, OnTheStand());
  ASSERT_NE(plant, nullptr);
  // Added out of order: repaired at 0.02 s, both dead at 0.01 s, left half-derated at 0.015 s.
  ASSERT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(0.02, MotorSide::kLeft, 1.0))));
  ASSERT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(0.01, MotorSide::kBoth, 0.0))));
  ASSERT_TRUE(Succeeded(plant->AddMotorFault(MakeMotorFault(0.015, MotorSide::kLeft, 0.5))));
  plant->SetCommand(6, 6);
  for (long k = 0; k < 30; ++k) {
    const TrueState before = plant->truth();
    plant->Step();
    const double left_scale = k < 10 ? 1.0 : k < 15 ? 0.0 : k < 20 ? 0.5 : 1.0;
    const double right_scale = k < 10 ? 1.0 : 0.0;
    const double scales[2] = {left_scale, right_scale};
    for (int side : {model::kLeft, model::kRight}) {
      const MotorOutput expected = EvaluateMotor(model.motor, DriveMode::kVoltage, 6,
                                                 before.wheel_rate_rad_s[side], band, scales[side]);
      ASSERT_EQ(plant->motors()[side].current_A, expected.current_A) << "step " << k;
      ASSERT_EQ(plant->motors()[side].wheel_torque_Nm, expected.wheel_torque_Nm) << "step " << k;
    }
  }
}

// --- Sensor faults, each against a twin plant without it ---

// Two plants from the same model, options and seed, one of them given `faults`; a sensor fault
// must not change the physics, so they stay in lockstep. Keeps every sample of both.
struct Twin {
  std::vector<SensorSample> healthy, faulted;
  std::vector<TrueState> truth;
};

Twin RunTwin(const model::RobotModel& model, const PlantOptions& options,
             const std::vector<SensorFault>& faults, int steps, double left_V = 0,
             double right_V = 0) {
  Twin twin;
  auto healthy = MakePlant(model, options);
  auto faulted = MakePlant(model, options);
  if (!healthy || !faulted) return twin;
  for (const SensorFault& f : faults) {
    EXPECT_TRUE(Succeeded(faulted->AddSensorFault(f)));
  }
  healthy->SetCommand(left_V, right_V);
  faulted->SetCommand(left_V, right_V);
  for (int k = 0; k <= steps; ++k) {
    if (k > 0) {
      healthy->Step();
      faulted->Step();
    }
    twin.healthy.push_back(healthy->Sense());
    twin.faulted.push_back(faulted->Sense());
    twin.truth.push_back(faulted->truth());
    EXPECT_EQ(healthy->truth().pitch_rad, faulted->truth().pitch_rad) << "step " << k;
    EXPECT_EQ(healthy->truth().wheel_angle_rad, faulted->truth().wheel_angle_rad) << "step " << k;
  }
  return twin;
}

TEST(Fault, GyroBiasStepJumpsByTheBiasAtTheFirstSampleOfAStateAfterItsStart) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.imu_rate_hz = 500;  // a sample every 2 steps
  model.sensors.latency_s = 0.003;  // seen 3 steps later
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = 0.05;  // falling forward: the gyro moves
  // From 0.0504 s: samples of the states after m >= 51 steps. The IMU samples at even steps k
  // the state k − 3, so the first biased reading is at k = 54 (state 51); k = 53 still shows
  // the sample of k = 52 (state 49).
  const auto fault =
      MakeSensorFault(0.0504, kInf, SensorChannel::kGyroY, SensorFaultKind::kBias, 0.25);
  const Twin twin = RunTwin(model, options, {fault}, 300);
  ASSERT_EQ(twin.faulted.size(), 301u);
  for (size_t k = 0; k < twin.faulted.size(); ++k) {
    const double jump = twin.faulted[k].gyro_rad_s[1] - twin.healthy[k].gyro_rad_s[1];
    ASSERT_NEAR(jump, k < 54 ? 0.0 : 0.25, 1e-12) << "step " << k;
    ASSERT_EQ(twin.faulted[k].gyro_rad_s[0], twin.healthy[k].gyro_rad_s[0]) << "step " << k;
    ASSERT_EQ(twin.faulted[k].accel_m_s2, twin.healthy[k].accel_m_s2) << "step " << k;
  }
  EXPECT_GT(twin.healthy.back().gyro_rad_s[1], 0.1);  // it did fall, the reading moved
}

TEST(Fault, QuantisedGyroBiasIsWithinOneResolutionStepOfTheBias) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.gyro_resolution_rad_s = 0.01;
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = 0.05;
  const auto fault =
      MakeSensorFault(0.1, kInf, SensorChannel::kGyroY, SensorFaultKind::kBias, 0.2345);
  const Twin twin = RunTwin(model, options, {fault}, 300);
  for (size_t k = 100; k < twin.faulted.size(); ++k) {
    const double jump = twin.faulted[k].gyro_rad_s[1] - twin.healthy[k].gyro_rad_s[1];
    // Bias added before rounding to 0.01 rad/s: the jump is a whole number of steps within one
    // step (0.01 rad/s) of the bias.
    ASSERT_NEAR(jump, 0.2345, 0.01) << "step " << k;
    ASSERT_NEAR(jump / 0.01, std::round(jump / 0.01), 1e-6) << "step " << k;
  }
  EXPECT_EQ(twin.faulted[99].gyro_rad_s[1], twin.healthy[99].gyro_rad_s[1]);
}

TEST(Fault, BiasFromTimeZeroShowsInTheInitialSample) {
  auto plant = MakePlant(MakeTestRobot(), OnTheStand());
  ASSERT_NE(plant, nullptr);
  // Held on the stand the chassis does not turn: the gyro reads 0 (to round-off), then the bias.
  EXPECT_NEAR(plant->Sense().gyro_rad_s[2], 0, 1e-12);
  ASSERT_TRUE(Succeeded(plant->AddSensorFault(
      MakeSensorFault(0, kInf, SensorChannel::kGyroZ, SensorFaultKind::kBias, 0.1))));
  EXPECT_NEAR(plant->Sense().gyro_rad_s[2], 0.1, 1e-12);
  plant->Step();
  EXPECT_NEAR(plant->Sense().gyro_rad_s[2], 0.1, 1e-12);
}

TEST(Fault, AccelDropoutReadsZeroForItsDurationThenRecovers) {
  PlantOptions options = OnTheStand();
  options.initial.pitch_rad = 0.2;  // held tilted: f_x = −g sin θ = −1.95 m/s² (conventions.hpp)
  // From 0.02 s for 0.03 s: the samples of the states after 20 … 49 steps.
  const auto fault = MakeSensorFault(0.02, 0.03, SensorChannel::kAccelX, SensorFaultKind::kDropout);
  const Twin twin = RunTwin(MakeTestRobot(), options, {fault}, 100);
  for (size_t k = 1; k < twin.faulted.size(); ++k) {
    ASSERT_NEAR(twin.healthy[k].accel_m_s2[0], -kG * std::sin(0.2), 1e-9) << "step " << k;
    if (k >= 20 && k < 50) {
      ASSERT_EQ(twin.faulted[k].accel_m_s2[0], 0) << "step " << k;
    } else {
      ASSERT_EQ(twin.faulted[k].accel_m_s2[0], twin.healthy[k].accel_m_s2[0]) << "step " << k;
    }
    ASSERT_EQ(twin.faulted[k].accel_m_s2[2], twin.healthy[k].accel_m_s2[2]) << "step " << k;
  }
}

TEST(Fault, DropoutLeavesTheNoiseOfEveryOtherSampleUntouched) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.gyro_noise_rad_s_rthz = 0.01;
  model.sensors.accel_noise_m_s2_rthz = 0.02;
  PlantOptions options = OnTheStand();
  options.sensor_noise = true;
  const auto fault = MakeSensorFault(0.05, 0.05, SensorChannel::kGyroX, SensorFaultKind::kDropout);
  const Twin twin = RunTwin(model, options, {fault}, 200);
  int differing = 0;
  for (size_t k = 0; k < twin.faulted.size(); ++k) {
    ASSERT_EQ(twin.faulted[k].gyro_rad_s[1], twin.healthy[k].gyro_rad_s[1]) << "step " << k;
    ASSERT_EQ(twin.faulted[k].accel_m_s2, twin.healthy[k].accel_m_s2) << "step " << k;
    const bool dropped = k >= 50 && k < 100;
    const double expected = dropped ? 0.0 : twin.healthy[k].gyro_rad_s[0];
    ASSERT_EQ(twin.faulted[k].gyro_rad_s[0], expected) << "step " << k;
    differing += twin.faulted[k].gyro_rad_s[0] != twin.healthy[k].gyro_rad_s[0] ? 1 : 0;
  }
  EXPECT_EQ(differing, 50);  // noise σ = 0.32 rad/s: no healthy sample is exactly 0
}

TEST(Fault, StuckGyroHoldsItsLastSampleBeforeTheFaultThenRecovers) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.imu_rate_hz = 250;  // a sample every 4 steps: k = 0, 4, …, 100, 104, …
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = 0.05;
  // From 0.1005 s (states after >= 101 steps) for 0.05 s (to states before 151): the sample at
  // k = 100 is the last before it, k = 104 … 148 are stuck at it, k = 152 is healthy again.
  const auto fault = MakeSensorFault(0.1005, 0.05, SensorChannel::kGyroY, SensorFaultKind::kStuck);
  const Twin twin = RunTwin(model, options, {fault}, 300);
  const double stuck = twin.healthy[100].gyro_rad_s[1];
  for (size_t k = 0; k < twin.faulted.size(); ++k) {
    const double expected = (k >= 100 && k < 152) ? stuck : twin.healthy[k].gyro_rad_s[1];
    ASSERT_EQ(twin.faulted[k].gyro_rad_s[1], expected) << "step " << k;
  }
  // The reading would have moved meanwhile: the robot is falling.
  EXPECT_GT(twin.healthy[148].gyro_rad_s[1] - stuck, 0.01);
}

TEST(Fault, StuckEncoderHoldsItsAngleAndReadsZeroRate) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.latency_s = 0.002;  // 2 steps; control period 10 steps
  // From 0.1 s: states after >= 100 steps; the last reading before is the state after 99 steps,
  // which the controller sees at k = 101.
  const auto fault =
      MakeSensorFault(0.1, kInf, SensorChannel::kEncoderLeft, SensorFaultKind::kStuck);
  const Twin twin = RunTwin(model, OnTheStand(), {fault}, 300, 6, -6);
  const double held = twin.healthy[101].encoder_angle_rad[model::kLeft];
  EXPECT_GT(held, 0.3);  // the wheel had turned
  for (size_t k = 0; k < twin.faulted.size(); ++k) {
    const SensorSample& f = twin.faulted[k];
    const SensorSample& h = twin.healthy[k];
    ASSERT_EQ(f.encoder_angle_rad[model::kRight], h.encoder_angle_rad[model::kRight])
        << "step " << k;
    ASSERT_EQ(f.encoder_rate_rad_s[model::kRight], h.encoder_rate_rad_s[model::kRight])
        << "step " << k;
    if (k <= 101) {
      ASSERT_EQ(f.encoder_angle_rad[model::kLeft], h.encoder_angle_rad[model::kLeft])
          << "step " << k;
      ASSERT_EQ(f.encoder_rate_rad_s[model::kLeft], h.encoder_rate_rad_s[model::kLeft])
          << "step " << k;
      continue;
    }
    ASSERT_EQ(f.encoder_angle_rad[model::kLeft], held) << "step " << k;
    if (k >= 112) {
      // A whole control period inside the fault: no change of angle, rate 0.
      ASSERT_EQ(f.encoder_rate_rad_s[model::kLeft], 0) << "step " << k;
    } else {
      // The rate follows the faulted angle: from the healthy one 10 steps back to the held one.
      const double before = twin.healthy[k - 10].encoder_angle_rad[model::kLeft];
      ASSERT_NEAR(f.encoder_rate_rad_s[model::kLeft], (held - before) / 0.01, 1e-9) << "step " << k;
    }
  }
  EXPECT_GT(twin.healthy.back().encoder_rate_rad_s[model::kLeft],
            5);  // the healthy one keeps turning
}

TEST(Fault, EncoderBiasShiftsTheAngleByTheBiasWithinOneCount) {
  model::RobotModel model = MakeTestRobot();
  const double count = 2 * std::numbers::pi / model.sensors.encoder_counts_per_rev;
  const auto fault =
      MakeSensorFault(0.05, kInf, SensorChannel::kEncoderRight, SensorFaultKind::kBias, 0.5);
  const Twin twin = RunTwin(model, OnTheStand(), {fault}, 200, 6, 6);
  for (size_t k = 0; k < twin.faulted.size(); ++k) {
    const SensorSample& f = twin.faulted[k];
    const SensorSample& h = twin.healthy[k];
    const double shift = f.encoder_angle_rad[model::kRight] - h.encoder_angle_rad[model::kRight];
    if (k < 50) {
      ASSERT_EQ(shift, 0) << "step " << k;
      continue;
    }
    // Added before flooring to whole counts: a whole number of counts within one count of it.
    ASSERT_NEAR(shift, 0.5, count) << "step " << k;
    ASSERT_NEAR(f.encoder_angle_rad[model::kRight] / count,
                std::round(f.encoder_angle_rad[model::kRight] / count), 1e-6);
    // Once both ends of the rate's period are biased the bias cancels, within one count.
    if (k >= 60) {
      ASSERT_NEAR(f.encoder_rate_rad_s[model::kRight], h.encoder_rate_rad_s[model::kRight],
                  count / 0.01 + 1e-9);
    }
    ASSERT_EQ(f.encoder_angle_rad[model::kLeft], h.encoder_angle_rad[model::kLeft]);
  }
}

TEST(Fault, EncoderDropoutReadsZeroAndItsRateFollows) {
  model::RobotModel model = MakeTestRobot();
  const auto fault =
      MakeSensorFault(0.05, 0.03, SensorChannel::kEncoderLeft, SensorFaultKind::kDropout);
  const Twin twin = RunTwin(model, OnTheStand(), {fault}, 200, 6, 6);
  for (size_t k = 40; k < twin.faulted.size(); ++k) {
    const SensorSample& f = twin.faulted[k];
    const bool now_out = k >= 50 && k < 80, before_out = k - 10 >= 50 && k - 10 < 80;
    const double angle_now = now_out ? 0.0 : twin.healthy[k].encoder_angle_rad[model::kLeft];
    const double angle_before =
        before_out ? 0.0 : twin.healthy[k - 10].encoder_angle_rad[model::kLeft];
    ASSERT_EQ(f.encoder_angle_rad[model::kLeft], angle_now) << "step " << k;
    ASSERT_NEAR(f.encoder_rate_rad_s[model::kLeft], (angle_now - angle_before) / 0.01, 1e-9)
        << "step " << k;
  }
  EXPECT_EQ(twin.faulted[90].encoder_rate_rad_s[model::kLeft],
            twin.healthy[90].encoder_rate_rad_s[model::kLeft]);
}

TEST(Fault, LatestStartedSensorFaultActsOnAChannel) {
  PlantOptions options = OnTheStand();
  // A lasting bias of 0.3 from 0.01 s, a dropout from 0.02 s for 0.01 s, then a second bias
  // of −0.1 from 0.04 s: 0, 0.3, 0 (dropout), 0.3 again, −0.1 (the gyro reads 0 on the stand).
  const std::vector<SensorFault> faults = {
      MakeSensorFault(0.01, kInf, SensorChannel::kGyroY, SensorFaultKind::kBias, 0.3),
      MakeSensorFault(0.04, kInf, SensorChannel::kGyroY, SensorFaultKind::kBias, -0.1),
      MakeSensorFault(0.02, 0.01, SensorChannel::kGyroY, SensorFaultKind::kDropout)};
  const Twin twin = RunTwin(MakeTestRobot(), options, faults, 60);
  for (size_t k = 0; k < twin.faulted.size(); ++k) {
    const double expected = k < 10 ? 0.0 : k < 20 ? 0.3 : k < 30 ? 0.0 : k < 40 ? 0.3 : -0.1;
    ASSERT_NEAR(twin.faulted[k].gyro_rad_s[1], expected, 1e-12) << "step " << k;
  }
}

}  // namespace
}  // namespace upright::sim
