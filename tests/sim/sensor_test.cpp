// Sensors of the plant against the conventions (conventions.hpp) and against the true state:
// signs, noise statistics, bias, quantisation, latency, encoders, seeding.
#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <cstdint>
#include <memory>
#include <numbers>
#include <string>
#include <vector>

#include "succeeded.hpp"
#include "test_robot.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/plant.hpp"

namespace upright::sim {
namespace {

using testing::MakePlant;
using testing::MakeTestRobot;
using testing::Unpowered;
using testing::TraceHash;

constexpr double kG = model::kStandardGravity_m_s2;

PlantOptions OnTheStand(bool noise) {
  PlantOptions options;
  options.fixed_chassis = true;
  options.sensor_noise = noise;
  return options;
}

double Mean(const std::vector<double>& v) {
  double sum = 0;
  for (double x : v) sum += x;
  return sum / static_cast<double>(v.size());
}

double StdDev(const std::vector<double>& v) {
  const double mean = Mean(v);
  double sum = 0;
  for (double x : v) sum += (x - mean) * (x - mean);
  return std::sqrt(sum / static_cast<double>(v.size() - 1));
}

// Encoder quantisation: the last whole count at or below the angle, one count = 2π / counts.
double FloorToCount(double angle_rad, double counts_per_rev) {
  const double count = 2 * std::numbers::pi / counts_per_rev;
  return count * std::floor(angle_rad / count);
}

TEST(Sensor, AccelerometerReadsPlusGStandingStillOnFlatGround) {
  const model::RobotModel model = MakeTestRobot();  // COM exactly above the axle: an equilibrium
  auto plant = MakePlant(model, Unpowered());
  ASSERT_NE(plant, nullptr);
  std::vector<double> ax, ay, az;
  for (int k = 0; k < 200; ++k) {  // 0.2 s, long before the unstable upright drifts
    plant->Step();
    const SensorSample s = plant->Sense();
    ax.push_back(s.accel_m_s2[0]);
    ay.push_back(s.accel_m_s2[1]);
    az.push_back(s.accel_m_s2[2]);
  }
  EXPECT_LT(std::abs(plant->truth().pitch_rad), 1e-6);
  // At rest the specific force is −g_vec = +g on body z (conventions.hpp); tolerance 0.2 % of g
  // (common practice).
  EXPECT_NEAR(Mean(az), kG, 0.002 * kG);
  EXPECT_NEAR(Mean(ax), 0, 0.002 * kG);
  EXPECT_NEAR(Mean(ay), 0, 0.002 * kG);
}

TEST(Sensor, AccelerometerReadsMinusGSineThetaOnXHeldTiltedForward) {
  // Held still, tilted forward by θ on the stand: the specific force is +g up in the world, which
  // in the body frame is (−g sin θ, 0, g cos θ) (rotation about +y; conventions.hpp), so a tilt
  // estimate is atan2(−f_x, f_z). Exact sensors, so to round-off.
  PlantOptions options = OnTheStand(false);
  const double theta = 0.2;
  options.initial.pitch_rad = theta;
  auto plant = MakePlant(MakeTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  for (int k = 0; k < 10; ++k) plant->Step();
  const SensorSample s = plant->Sense();
  EXPECT_NEAR(s.accel_m_s2[0], -kG * std::sin(theta), 1e-9);
  EXPECT_NEAR(s.accel_m_s2[2], kG * std::cos(theta), 1e-9);
  EXPECT_NEAR(std::atan2(-s.accel_m_s2[0], s.accel_m_s2[2]), theta, 1e-12);
}

TEST(Sensor, GyroReadsPositiveYWhileFallingForward) {
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = 0.05;
  auto plant = MakePlant(MakeTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  for (int k = 1; k <= 300; ++k) {
    plant->Step();
    const SensorSample s = plant->Sense();
    ASSERT_GT(s.gyro_rad_s[1], 0) << "step " << k;
    // Planar motion: the body y rate is the pitch rate (exact sensors, no latency).
    ASSERT_NEAR(s.gyro_rad_s[1], plant->truth().pitch_rate_rad_s, 1e-9) << "step " << k;
    // No roll or yaw to speak of: the first contact settles with a left-right asymmetry of
    // about 6e-6 rad/s, against pitch rates of 2e-3 to 1.4 rad/s.
    ASSERT_NEAR(s.gyro_rad_s[0], 0, 1e-4);
    ASSERT_NEAR(s.gyro_rad_s[2], 0, 1e-4);
  }
  EXPECT_GT(plant->truth().pitch_rad, 0.06);
}

TEST(Sensor, GyroReadsNegativeYWhileFallingBackward) {
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = -0.05;
  auto plant = MakePlant(MakeTestRobot(), options);
  ASSERT_NE(plant, nullptr);
  for (int k = 1; k <= 300; ++k) {
    plant->Step();
    ASSERT_LT(plant->Sense().gyro_rad_s[1], 0) << "step " << k;
  }
  EXPECT_LT(plant->truth().pitch_rad, -0.06);
}

TEST(Sensor, EncodersCountUpRollingForwardAndDownRollingBackward) {
  const model::RobotModel model = MakeTestRobot();
  const double r = model.wheel.radius_m;
  const double count = 2 * std::numbers::pi / model.sensors.encoder_counts_per_rev;
  for (double speed : {0.5, -0.5}) {
    PlantOptions options = Unpowered();
    options.initial.speed_m_s = speed;
    auto plant = MakePlant(model, options);
    ASSERT_NE(plant, nullptr);
    const double x0 = plant->truth().x_m;
    std::vector<double> relative_rate;  // v / r − θ', the wheels' rate relative to the chassis
    for (int k = 0; k < 200; ++k) {
      plant->Step();
      relative_rate.push_back(plant->truth().forward_speed_m_s / r -
                              plant->truth().pitch_rate_rad_s);
    }
    const TrueState& truth = plant->truth();
    const SensorSample s = plant->Sense();
    // A wheel rolling without slip is at x = r (φ_rel + θ) (conventions.hpp): φ_rel =
    // Δx / r − θ, here about ±1 rad. Tolerance: one count plus 0.5 % for the contact's creep.
    const double expected = (truth.x_m - x0) / r - truth.pitch_rad;
    // Over the last control period (10 steps) the mean relative rate.
    double mean_rate = 0;
    for (size_t k = relative_rate.size() - 10; k < relative_rate.size(); ++k) {
      mean_rate += relative_rate[k] / 10;
    }
    for (int side : {model::kLeft, model::kRight}) {
      EXPECT_GT(s.encoder_angle_rad[side] * (speed > 0 ? 1 : -1), 0.9) << "speed " << speed;
      EXPECT_NEAR(s.encoder_angle_rad[side], expected, count + 0.005 * std::abs(expected))
          << "speed " << speed;
      // Encoder rate: one count of resolution over the 0.01 s period, plus 0.5 % creep.
      EXPECT_NEAR(s.encoder_rate_rad_s[side], mean_rate, count / 0.01 + 0.005 * std::abs(mean_rate))
          << "speed " << speed;
      EXPECT_GT(s.encoder_rate_rad_s[side] * (speed > 0 ? 1 : -1), 0) << "speed " << speed;
    }
  }
}

TEST(Sensor, AccelerometerReadsForwardAccelerationWhenPushedForward) {
  model::RobotModel model = MakeTestRobot();
  // IMU off the chassis COM (0, 0.2), so rotation adds lever-arm terms to what it feels.
  const double xi = 0.05, zi = 0.4;
  model.sensors.imu_x_m = xi;
  model.sensors.imu_z_m = zi;
  auto plant = MakePlant(model, Unpowered());
  ASSERT_NE(plant, nullptr);
  Push push;
  push.start_s = 0.01;
  push.duration_s = 0.1;
  push.peak_N = 50;
  push.height_m = model.chassis.com_height_m;  // through the chassis COM
  ASSERT_TRUE(Succeeded(plant->AddPush(push)));
  const double dt = plant->options().dt_s;
  // IMU point velocity in the world (x, z) from the true state: the body point (xi, zi) pitched
  // by θ sits at (xi cosθ + zi sinθ, −xi sinθ + zi cosθ) from the axle, so it moves at the axle
  // velocity plus θ' (−xi sinθ + zi cosθ, −xi cosθ − zi sinθ) (rigid-body kinematics).
  auto imu_velocity = [&](const TrueState& s) {
    const double c = std::cos(s.pitch_rad), sn = std::sin(s.pitch_rad);
    const double w = s.pitch_rate_rad_s;
    return std::array<double, 2>{s.forward_speed_m_s + w * (-xi * sn + zi * c),
                                 s.vertical_speed_m_s + w * (-xi * c - zi * sn)};
  };
  auto previous = imu_velocity(plant->truth());
  std::vector<double> during_push;
  for (int k = 1; k <= 150; ++k) {
    plant->Step();
    const TrueState& s = plant->truth();
    const auto v = imu_velocity(s);
    // Specific force f = Rᵀ(a − g_vec) (conventions.hpp); body x is (cosθ, 0, −sinθ) in world.
    const double ax = (v[0] - previous[0]) / dt, az = (v[1] - previous[1]) / dt;
    const double fx = ax * std::cos(s.pitch_rad) - (az + kG) * std::sin(s.pitch_rad);
    previous = v;
    const double measured = plant->Sense().accel_m_s2[0];
    ASSERT_NEAR(measured, fx, 1e-6 * (1 + std::abs(fx))) << "step " << k;
    if (s.time_s > push.start_s + 0.005 && s.time_s < push.end_s()) during_push.push_back(measured);
  }
  ASSERT_FALSE(during_push.empty());
  for (double a : during_push) EXPECT_GT(a, 0);
  // Order of magnitude: 50 N over the chassis, wheels and wheel spin inertia
  // (10 + 2·2 + 2·0.01/0.1² = 16 kg equivalent) is 3.1 m/s² (Newton's second law).
  EXPECT_GT(Mean(during_push), 0.5 * 50 / 16.0);
  EXPECT_LT(Mean(during_push), 2.0 * 50 / 16.0);
}

TEST(Sensor, AccelerometerYAndGyroXReadTheRobotTippingToItsLeft) {
  const model::RobotModel model = MakeTestRobot();
  auto plant = MakePlant(model, Unpowered());
  ASSERT_NE(plant, nullptr);
  // 200 N toward +y (the robot's left) at 0.5 m, above the COM: it accelerates left and, its
  // tipping moment 200 × 0.6 = 120 N·m about the left contact exceeding the righting moment
  // 14 × 9.81 × 0.2 = 27 N·m, rolls onto its left wheel (statics).
  Push push;
  push.start_s = 0;
  push.duration_s = 0.04;
  push.peak_N = 200;
  push.direction_deg = 90;
  push.height_m = 0.5;
  ASSERT_TRUE(Succeeded(plant->AddPush(push)));
  for (int k = 1; k <= 30; ++k) {
    plant->Step();
    const SensorSample s = plant->Sense();
    // Left side down is a negative roll: rotation about +x lifts +y (conventions.hpp).
    ASSERT_LT(s.gyro_rad_s[0], 0) << "step " << k;
    ASSERT_NEAR(s.gyro_rad_s[0], plant->truth().roll_rate_rad_s, 1e-3) << "step " << k;
    ASSERT_GT(s.accel_m_s2[1], 0) << "step " << k;
  }
  EXPECT_LT(plant->truth().roll_rad, 0);
  EXPECT_GT(plant->truth().y_m, 0);
  EXPECT_GT(plant->contact().wheels[model::kLeft].normal_N,
            plant->contact().wheels[model::kRight].normal_N);
}

TEST(Sensor, GyroZReadsPositiveWhileTurningLeft) {
  auto plant = MakePlant(MakeTestRobot(), Unpowered());
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(-0.3, 0.3);  // right wheel forward, left backward: a left turn
  for (int k = 1; k <= 200; ++k) {
    plant->Step();
    ASSERT_GT(plant->Sense().gyro_rad_s[2], 0) << "step " << k;
    ASSERT_NEAR(plant->Sense().gyro_rad_s[2], plant->truth().yaw_rate_rad_s,
                1e-3 * plant->truth().yaw_rate_rad_s + 1e-9);
  }
  EXPECT_GT(plant->truth().yaw_rad, 0.02);  // ψ > 0 turns left (conventions.hpp)
}

TEST(Sensor, NoiseHasTheDensityTimesRootSampleRateStandardDeviation) {
  model::RobotModel model = MakeTestRobot();
  model::SensorModel& sm = model.sensors;
  sm.imu_rate_hz = 500;  // every second physics step
  sm.gyro_noise_rad_s_rthz = 0.01;
  sm.accel_noise_m_s2_rthz = 0.02;
  sm.gyro_bias_x_rad_s = 0.1;
  sm.gyro_bias_y_rad_s = -0.2;
  sm.gyro_bias_z_rad_s = 0.3;
  sm.accel_bias_x_m_s2 = 1;
  sm.accel_bias_y_m_s2 = -2;
  sm.accel_bias_z_m_s2 = 3;
  auto plant = MakePlant(model, OnTheStand(true));
  ASSERT_NE(plant, nullptr);
  std::vector<double> gyro[3], accel[3];
  SensorSample last = plant->Sense();
  for (long k = 1; k <= 20000; ++k) {
    plant->Step();
    const SensorSample s = plant->Sense();
    if (k % 2 == 1) {
      // Between IMU samples the last one is held.
      ASSERT_EQ(s.gyro_rad_s, last.gyro_rad_s) << "step " << k;
      ASSERT_EQ(s.accel_m_s2, last.accel_m_s2) << "step " << k;
      continue;
    }
    for (int i = 0; i < 3; ++i) {
      gyro[i].push_back(s.gyro_rad_s[i]);
      accel[i].push_back(s.accel_m_s2[i]);
    }
    last = s;
  }
  const double n = static_cast<double>(gyro[0].size());
  ASSERT_EQ(n, 10000);
  // White noise of density N sampled at f has σ = N √f (sensor noise models, from memory):
  // 0.01 √500 = 0.224 rad/s and 0.02 √500 = 0.447 m/s². A sample σ from n draws has a relative
  // standard error of 1/√(2n) = 0.7 %: 5 % is 7 standard errors.
  const double gyro_sigma = 0.01 * std::sqrt(500.0), accel_sigma = 0.02 * std::sqrt(500.0);
  const double gyro_bias[3] = {0.1, -0.2, 0.3};
  const double accel_truth[3] = {1, -2, kG + 3};  // at rest on the stand: +g on z, plus bias
  for (int i = 0; i < 3; ++i) {
    EXPECT_NEAR(StdDev(gyro[i]), gyro_sigma, 0.05 * gyro_sigma) << "gyro axis " << i;
    EXPECT_NEAR(StdDev(accel[i]), accel_sigma, 0.05 * accel_sigma) << "accel axis " << i;
    // Means: the bias, within 5 standard errors σ / √n.
    EXPECT_NEAR(Mean(gyro[i]), gyro_bias[i], 5 * gyro_sigma / std::sqrt(n)) << "gyro axis " << i;
    EXPECT_NEAR(Mean(accel[i]), accel_truth[i], 5 * accel_sigma / std::sqrt(n))
        << "accel axis " << i;
  }
}

TEST(Sensor, NoiseFollowsTheImuRateWhenTheImuIsFasterThanThePhysics) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.imu_rate_hz = 4000;  // 4 samples per 1 ms physics step; the plant accepts it
  model.sensors.gyro_noise_rad_s_rthz = 0.01;
  auto plant = MakePlant(model, OnTheStand(true));
  ASSERT_NE(plant, nullptr);
  std::vector<double> gyro;
  for (int k = 0; k < 10000; ++k) {
    plant->Step();
    gyro.push_back(plant->Sense().gyro_rad_s[1]);
  }
  // Each sample the controller sees is one IMU sample, whose white noise of density N at the
  // IMU's own rate f has σ = N √f (sensor noise models, from memory): 0.01 √4000 = 0.632 rad/s,
  // not the 0.316 of a 1 kHz sensor. Relative standard error 1/√(2n) = 0.7 %; tolerance 5 %.
  const double sigma = 0.01 * std::sqrt(4000.0);
  EXPECT_NEAR(StdDev(gyro), sigma, 0.05 * sigma);
}

TEST(Sensor, ExactSensorsGiveTheBiasedTruth) {
  model::RobotModel model = MakeTestRobot();
  model::SensorModel& sm = model.sensors;
  sm.gyro_noise_rad_s_rthz = 0.01;  // ignored: sensor_noise is off
  sm.accel_noise_m_s2_rthz = 0.02;
  sm.gyro_bias_x_rad_s = 0.1;
  sm.gyro_bias_y_rad_s = -0.2;
  sm.gyro_bias_z_rad_s = 0.3;
  sm.accel_bias_x_m_s2 = 1;
  sm.accel_bias_y_m_s2 = -2;
  sm.accel_bias_z_m_s2 = 3;
  auto plant = MakePlant(model, OnTheStand(false));
  ASSERT_NE(plant, nullptr);
  for (int k = 0; k < 100; ++k) {
    plant->Step();
    const SensorSample s = plant->Sense();
    ASSERT_DOUBLE_EQ(s.gyro_rad_s[0], 0.1);
    ASSERT_DOUBLE_EQ(s.gyro_rad_s[1], -0.2);
    ASSERT_DOUBLE_EQ(s.gyro_rad_s[2], 0.3);
    ASSERT_DOUBLE_EQ(s.accel_m_s2[0], 1);
    ASSERT_DOUBLE_EQ(s.accel_m_s2[1], -2);
    ASSERT_DOUBLE_EQ(s.accel_m_s2[2], kG + 3);
    ASSERT_EQ(s.encoder_angle_rad[0], 0);
    ASSERT_EQ(s.encoder_rate_rad_s[1], 0);
  }
}

TEST(Sensor, QuantisationStepsReadingsToWholeResolutions) {
  model::RobotModel model = MakeTestRobot();
  model::SensorModel& sm = model.sensors;
  sm.gyro_noise_rad_s_rthz = 0.01;
  sm.accel_noise_m_s2_rthz = 0.02;
  sm.gyro_resolution_rad_s = 0.05;
  sm.accel_resolution_m_s2 = 0.1;
  auto plant = MakePlant(model, OnTheStand(true));
  ASSERT_NE(plant, nullptr);
  int distinct_gyro_steps = 0;
  double previous = plant->Sense().gyro_rad_s[1];
  for (int k = 0; k < 1000; ++k) {
    plant->Step();
    const SensorSample s = plant->Sense();
    for (int i = 0; i < 3; ++i) {
      const double g = s.gyro_rad_s[i] / 0.05, a = s.accel_m_s2[i] / 0.1;
      ASSERT_NEAR(g, std::round(g), 1e-9) << "gyro " << s.gyro_rad_s[i];
      ASSERT_NEAR(a, std::round(a), 1e-9) << "accel " << s.accel_m_s2[i];
    }
    distinct_gyro_steps += s.gyro_rad_s[1] != previous ? 1 : 0;
    previous = s.gyro_rad_s[1];
  }
  // σ = 0.01 √1000 = 0.32 rad/s spans several steps of 0.05: the readings do move.
  EXPECT_GT(distinct_gyro_steps, 500);
}

TEST(Sensor, QuantisationRoundsExactReadingsToTheNearestStep) {
  model::RobotModel model = MakeTestRobot();
  model::SensorModel& sm = model.sensors;
  sm.gyro_bias_y_rad_s = 0.0123;
  sm.gyro_bias_z_rad_s = -0.0178;
  sm.gyro_resolution_rad_s = 0.01;
  sm.accel_resolution_m_s2 = 0.1;
  auto plant = MakePlant(model, OnTheStand(false));
  ASSERT_NE(plant, nullptr);
  plant->Step();
  const SensorSample s = plant->Sense();
  EXPECT_NEAR(s.gyro_rad_s[1], 0.01, 1e-12);   // 0.0123 → 0.01
  EXPECT_NEAR(s.gyro_rad_s[2], -0.02, 1e-12);  // −0.0178 → −0.02
  EXPECT_NEAR(s.accel_m_s2[2], 9.8, 1e-12);    // 9.80665 → 9.8
}

// Runs a plant and keeps the true state after every step (index = step count).
struct Recorded {
  std::vector<TrueState> truth;
  std::vector<SensorSample> samples;
};

Recorded Record(Plant& plant, int steps) {
  Recorded r;
  r.truth.push_back(plant.truth());
  r.samples.push_back(plant.Sense());
  for (int k = 0; k < steps; ++k) {
    plant.Step();
    r.truth.push_back(plant.truth());
    r.samples.push_back(plant.Sense());
  }
  return r;
}

TEST(Sensor, GyroShowsTheStateLatencyEarlier) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.latency_s = 0.005;  // 5 physics steps
  PlantOptions options = Unpowered();
  options.initial.pitch_rad = 0.05;
  auto plant = MakePlant(model, options);
  ASSERT_NE(plant, nullptr);
  const Recorded r = Record(*plant, 400);
  for (size_t k = 5; k < r.samples.size(); ++k) {
    ASSERT_NEAR(r.samples[k].gyro_rad_s[1], r.truth[k - 5].pitch_rate_rad_s, 1e-9) << "step " << k;
  }
  // By the end the robot falls fast enough for 5 ms to matter.
  const double late = r.samples.back().gyro_rad_s[1], now = r.truth.back().pitch_rate_rad_s;
  EXPECT_GT(now - late, 0.01);
  EXPECT_DOUBLE_EQ(r.samples.back().time_s, 0.4);  // the time the controller reads it
}

TEST(Sensor, EncodersShowTheWheelAnglesLatencyEarlierFlooredToWholeCounts) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.latency_s = 0.005;  // 5 physics steps
  const double count = 2 * std::numbers::pi / model.sensors.encoder_counts_per_rev;
  auto plant = MakePlant(model, OnTheStand(false));
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(6.0, -6.0);  // left forward, right backward
  const Recorded r = Record(*plant, 300);
  for (size_t k = 5; k < r.samples.size(); ++k) {
    for (int side : {model::kLeft, model::kRight}) {
      const double seen = r.samples[k].encoder_angle_rad[side];
      const double then = r.truth[k - 5].wheel_angle_rad[side];
      // Floor quantisation: at or below the angle, less than one count below it, whole counts.
      ASSERT_LE(seen, then) << "step " << k << " side " << side;
      ASSERT_GT(seen, then - count) << "step " << k << " side " << side;
      ASSERT_NEAR(seen / count, std::round(seen / count), 1e-6) << "step " << k;
    }
  }
  // The latency is visible: the wheels turn ~8 rad/s, 5 ms is ~26 counts.
  EXPECT_LT(r.samples.back().encoder_angle_rad[model::kLeft],
            r.truth.back().wheel_angle_rad[model::kLeft] - 10 * count);
  EXPECT_GT(r.samples.back().encoder_angle_rad[model::kRight],
            r.truth.back().wheel_angle_rad[model::kRight] + 10 * count);
}

TEST(Sensor, EncoderRateIsTheCountDifferenceOverOneControlPeriod) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.latency_s = 0.002;
  const double counts = model.sensors.encoder_counts_per_rev;
  const long latency = 2, period = 10;  // steps: 2 ms latency, 100 Hz control at 1 kHz physics
  auto plant = MakePlant(model, OnTheStand(false));
  ASSERT_NE(plant, nullptr);
  plant->SetCommand(6.0, -3.0);
  const Recorded r = Record(*plant, 300);
  for (size_t k = static_cast<size_t>(latency + period); k < r.samples.size(); ++k) {
    for (int side : {model::kLeft, model::kRight}) {
      const double now = FloorToCount(r.truth[k - latency].wheel_angle_rad[side], counts);
      const double before =
          FloorToCount(r.truth[k - latency - period].wheel_angle_rad[side], counts);
      ASSERT_NEAR(r.samples[k].encoder_rate_rad_s[side], (now - before) / 0.01, 1e-6)
          << "step " << k << " side " << side;
    }
  }
  // Near the true rate: within one count per period plus the change of rate over the period.
  const double true_rate = r.truth[r.truth.size() - 1 - latency].wheel_rate_rad_s[model::kLeft];
  EXPECT_NEAR(r.samples.back().encoder_rate_rad_s[model::kLeft], true_rate,
              2 * std::numbers::pi / counts / 0.01 + 0.05 * std::abs(true_rate));
}

// Hash of the first `steps` sensor samples of a noisy robot on the stand.
std::uint64_t SampleHash(std::uint64_t seed, int steps) {
  model::RobotModel model = MakeTestRobot();
  model.sensors.gyro_noise_rad_s_rthz = 0.01;
  model.sensors.accel_noise_m_s2_rthz = 0.02;
  PlantOptions options = OnTheStand(true);
  options.seed = seed;
  auto plant = MakePlant(model, options);
  if (!plant) return 0;
  plant->SetCommand(3.0, 3.0);
  TraceHash hash;
  for (int k = 0; k < steps; ++k) {
    plant->Step();
    const SensorSample s = plant->Sense();
    for (double v : s.gyro_rad_s) hash.Add(v);
    for (double v : s.accel_m_s2) hash.Add(v);
    for (double v : s.encoder_angle_rad) hash.Add(v);
    for (double v : s.encoder_rate_rad_s) hash.Add(v);
  }
  return hash.value();
}

TEST(Sensor, SameSeedGivesIdenticalSamples) {
  EXPECT_EQ(SampleHash(17, 1000), SampleHash(17, 1000));
}

TEST(Sensor, DifferentSeedsGiveDifferentSamples) {
  EXPECT_NE(SampleHash(17, 1000), SampleHash(18, 1000));
}

}  // namespace
}  // namespace upright::sim
