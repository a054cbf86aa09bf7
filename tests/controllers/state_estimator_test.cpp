// The built-in modules' state estimator: the complementary filter's pitch (its time constant, the
// accelerometer's sign against the plant, accelerations not read as tilt), travel and heading
// from the encoders, and the true-state reader.
#include "kit/state_estimator.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <random>
#include <string>

#include "succeeded.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/sim/plant.hpp"

namespace upright::controllers {
namespace {

constexpr double kG = model::kStandardGravity_m_s2;
constexpr double kPeriod = 0.005;  // 200 Hz

EstimatorSettings Settings() {
  EstimatorSettings s;
  s.period_s = kPeriod;
  s.wheel_radius_m = 0.1;
  s.track_m = 0.4;
  s.imu_height_m = 0.2;
  s.tilt_filter_s = 0.5;
  return s;
}

// A sample of a robot pitched by `pitch` (rate `pitch_rate`), its IMU (`imu_height` above the
// axle) accelerating forward at `accel`, wheels at the given angles relative to the chassis.
upright_sensor_sample Sample(double pitch, double pitch_rate, double accel, double left_rad,
                             double right_rad, double left_rate = 0, double right_rate = 0,
                             double yaw_rate = 0) {
  upright_sensor_sample s{};
  s.struct_size = sizeof s;
  s.gyro_rad_s[1] = pitch_rate;
  s.gyro_rad_s[2] = yaw_rate;
  // Specific force in the body frame: f = Rᵀ(a − g), body x = (cos θ, 0, −sin θ) in the world.
  s.accel_m_s2[0] = accel * std::cos(pitch) - kG * std::sin(pitch);
  s.accel_m_s2[2] = accel * std::sin(pitch) + kG * std::cos(pitch);
  s.encoder_angle_rad[model::kLeft] = left_rad;
  s.encoder_angle_rad[model::kRight] = right_rad;
  s.encoder_rate_rad_s[model::kLeft] = left_rate;
  s.encoder_rate_rad_s[model::kRight] = right_rate;
  return s;
}

TEST(ComplementaryEstimator, AStationaryRobotGivesTheZeroState) {
  ComplementaryEstimator estimator(Settings());
  for (int k = 0; k < 400; ++k) {
    const design::StateVector& x = estimator.Update(Sample(0, 0, 0, 0.3, 0.3));
    ASSERT_EQ(x, design::StateVector::Zero()) << "tick " << k;
  }
}

TEST(ComplementaryEstimator, AStationaryRobotWithNoisySensorsStaysNearZero) {
  // Gyro σ 0.003 rad/s, accelerometer σ 0.05 m/s² per sample (a little worse than the demo
  // robots' IMUs). The filtered pitch then wanders by about σ_a / g √((1 − α) / 2) = 4e-4 rad
  // (first-order low-pass of white noise); 2e-3 rad is five of those.
  std::mt19937_64 random(7);
  std::normal_distribution<double> gyro(0, 0.003), accel(0, 0.05);
  ComplementaryEstimator estimator(Settings());
  double largest_pitch = 0, largest_x = 0;
  for (int k = 0; k < 2000; ++k) {
    upright_sensor_sample s = Sample(0, 0, 0, 0.3, 0.3);
    s.gyro_rad_s[1] += gyro(random);
    s.accel_m_s2[0] += accel(random);
    s.accel_m_s2[2] += accel(random);
    const design::StateVector& x = estimator.Update(s);
    if (k >= 400) {  // after four time constants
      largest_pitch = std::max(largest_pitch, std::abs(x(design::kPitch)));
      largest_x = std::max(largest_x, std::abs(x(design::kX)));
    }
  }
  EXPECT_LT(largest_pitch, 2e-3);
  // x = r (φ + θ) less its value at the first sample: r times the pitch's wander and the first
  // sample's tilt error (3 σ_a / g).
  EXPECT_LT(largest_x, 0.1 * (2e-3 + 3 * 0.05 / kG));
}

TEST(ComplementaryEstimator, FollowsAConstantTiltFromTheAccelerometerWithItsTimeConstant) {
  // Starts level, then the accelerometer alone reports 0.1 rad: the estimate rises as
  // 0.1 (1 − exp(−t / τ)), a first-order response with τ = tilt_filter_s.
  const EstimatorSettings settings = Settings();
  ComplementaryEstimator estimator(settings);
  estimator.Update(Sample(0, 0, 0, 0, 0));
  const double tilt = 0.1, tau = settings.tilt_filter_s;
  double crossed_s = -1;
  for (int k = 1; k <= 600; ++k) {
    const double t = k * kPeriod;
    const double pitch = estimator.Update(Sample(tilt, 0, 0, -tilt, -tilt))(design::kPitch);
    ASSERT_NEAR(pitch, tilt * (1 - std::exp(-t / tau)), 0.01 * tilt) << "t = " << t;
    if (crossed_s < 0 && pitch >= tilt * (1 - std::exp(-1.0))) crossed_s = t;
  }
  // The 63 % point at τ, within a tick (1 % of τ) and a little.
  EXPECT_NEAR(crossed_s, tau, 0.02 * tau);
}

TEST(ComplementaryEstimator, ConsistentGyroAndAccelerometerGiveTheExactPitch) {
  // Tipping forward at 0.2 rad/s with nothing else moving: the gyro's step and the
  // accelerometer's tilt agree, and the filter keeps the truth exactly.
  ComplementaryEstimator estimator(Settings());
  const double rate = 0.2;
  for (int k = 0; k <= 100; ++k) {
    const double pitch = rate * k * kPeriod;
    const double estimate =
        estimator.Update(Sample(pitch, rate, 0, -pitch, -pitch))(design::kPitch);
    ASSERT_NEAR(estimate, pitch, 1e-12) << "tick " << k;
  }
}

TEST(ComplementaryEstimator, ForwardAccelerationIsNotReadAsTilt) {
  // Upright, starting from rest at 1 m/s² (wheels rolling, no pitch): the accelerometer reads
  // f_x = a. Read as tilt it would pull the estimate to −a / g = −0.1 rad within a few τ.
  const EstimatorSettings settings = Settings();
  ComplementaryEstimator estimator(settings);
  const double a = 1, r = settings.wheel_radius_m;
  estimator.Update(Sample(0, 0, 0, 0, 0));
  double largest = 0;
  for (int k = 1; k <= 600; ++k) {
    const double t = k * kPeriod;
    const double angle = a * t * t / 2 / r, rate = a * t / r;
    const design::StateVector& x = estimator.Update(Sample(0, 0, a, angle, angle, rate, rate));
    largest = std::max(largest, std::abs(x(design::kPitch)));
    ASSERT_NEAR(x(design::kXDot), a * t, 1e-9) << "t = " << t;
  }
  EXPECT_LT(largest, 1e-9);
}

TEST(ComplementaryEstimator, EncodersGiveTravelAlongTheHeadingAndTheHeading) {
  // Rolling forward at 0.4 m/s while turning left at 0.5 rad/s, leaning a steady 0.05 rad: the
  // encoders read each wheel's travel (v ∓ d ψ̇) t / r less the chassis pitch.
  const EstimatorSettings settings = Settings();
  ComplementaryEstimator estimator(settings);
  const double v = 0.4, yaw_rate = 0.5, lean = 0.05;
  const double r = settings.wheel_radius_m, d = settings.track_m / 2;
  for (int k = 0; k <= 200; ++k) {
    const double t = k * kPeriod;
    const double left_rate = (v - d * yaw_rate) / r, right_rate = (v + d * yaw_rate) / r;
    const design::StateVector& x = estimator.Update(Sample(
        lean, 0, 0, left_rate * t - lean, right_rate * t - lean, left_rate, right_rate, yaw_rate));
    ASSERT_NEAR(x(design::kX), v * t, 1e-12) << "t = " << t;
    ASSERT_NEAR(x(design::kXDot), v, 1e-12);
    ASSERT_NEAR(x(design::kPitch), lean, 1e-12);
    ASSERT_NEAR(x(design::kYaw), yaw_rate * t, 1e-12);
    ASSERT_NEAR(x(design::kYawRate), yaw_rate, 1e-12);
  }
}

TEST(ComplementaryEstimator, MeasuresPitchFromTheEquilibrium) {
  EstimatorSettings settings = Settings();
  settings.equilibrium_pitch_rad = -0.02;
  ComplementaryEstimator estimator(settings);
  const design::StateVector& x = estimator.Update(Sample(-0.02, 0, 0, 0, 0));
  EXPECT_NEAR(x(design::kPitch), 0, 1e-12);
  EXPECT_NEAR(estimator.pitch_rad(), -0.02, 1e-12);
}

TEST(ComplementaryEstimator, ResetStartsAfreshFromTheNextSample) {
  ComplementaryEstimator estimator(Settings());
  for (int k = 0; k < 50; ++k) estimator.Update(Sample(0, 0, 0, 0.1 * k, 0.1 * k));
  estimator.Reset();
  const design::StateVector& x = estimator.Update(Sample(0.03, 0, 0, 5, 5));
  EXPECT_NEAR(x(design::kX), 0, 1e-12);
  EXPECT_NEAR(x(design::kPitch), 0.03, 1e-12);
}

TEST(AccelerometerPitch, ReadsTheForwardLeanOfTheCourierOnTheStand) {
  // The plant's own accelerometer, chassis held at 5° forward: the sign convention end to end.
  auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml");
  ASSERT_TRUE(Succeeded(loaded));
  model::RobotModel model = *loaded;
  model.sensors.accel_bias_x_m_s2 = model.sensors.accel_bias_y_m_s2 = 0;
  model.sensors.accel_bias_z_m_s2 = 0;
  sim::PlantOptions options;
  options.fixed_chassis = true;
  options.sensor_noise = false;
  options.initial.pitch_rad = 5 * std::numbers::pi / 180;
  auto built = sim::Plant::Create(model, options);
  ASSERT_TRUE(Succeeded(built));
  const std::unique_ptr<sim::Plant> plant = std::move(*built);
  for (int k = 0; k < 20; ++k) plant->Step();
  const sim::SensorSample s = plant->Sense();
  // Quantised to 2.39e-3 m/s² a step (courier.xml): about 2.4e-4 rad at most.
  EXPECT_NEAR(AccelerometerPitch(s.accel_m_s2.data()), options.initial.pitch_rad, 5e-4);
}

upright_true_state Truth(double x, double y, double yaw) {
  upright_true_state t{};
  t.struct_size = sizeof t;
  t.x_m = x;
  t.y_m = y;
  t.yaw_rad = yaw;
  return t;
}

TEST(TrueStateReader, CountsTravelAlongTheHeadingFromTheFirstTick) {
  TrueStateReader reader(0);
  const double heading = 0.3;
  reader.Update(Truth(2, 1, heading));  // the origin
  for (int k = 1; k <= 10; ++k) {
    const double s = 0.1 * k;
    const design::StateVector& x =
        reader.Update(Truth(2 + s * std::cos(heading), 1 + s * std::sin(heading), heading));
    ASSERT_NEAR(x(design::kX), s, 1e-12);
  }
}

TEST(TrueStateReader, KeepsTheYawContinuousAcrossPlusMinusPi) {
  TrueStateReader reader(0);
  reader.Update(Truth(0, 0, 3.1));
  const design::StateVector& x = reader.Update(Truth(0, 0, -3.1));  // 3.1832 unwrapped
  EXPECT_NEAR(x(design::kYaw), 2 * std::numbers::pi - 6.2, 1e-12);
}

}  // namespace
}  // namespace upright::controllers
