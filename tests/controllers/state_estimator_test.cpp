// The built-in modules' state estimator: its pitch (the tilt filter's response, the IMU's lever
// arm and the axle's acceleration not read as tilt, a gyro bias learnt and an accelerometer bias
// that cannot be, the accelerometer's sign against the plant), its speed, travel and heading from
// the encoders, and the true-state reader.
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
  s.imu_m = Eigen::Vector3d(0.05, 0, 0.2);
  s.tilt_filter_s = 0.5;
  s.bias_filter_s = 2;
  s.speed_gains = SpeedGains::ForTrackingIndex(0.3);
  return s;
}

// A sample of a robot pitched by `pitch` (rate `pitch_rate`, angular acceleration `pitch_accel`),
// its axle accelerating forward at `accel`, wheels at the given angles and rates relative to the
// chassis, turning at `yaw_rate`. The accelerometer reads at the IMU's position r: the axle's
// specific force Rᵀ(a ê_x + g ê_z) plus α × r + ω × (ω × r) (the rigid-body relation
// imu_kinematics_test.cpp checks against a motion written out in the world frame).
upright_sensor_sample Sample(double pitch, double pitch_rate, double accel, double left_rad,
                             double right_rad, double left_rate = 0, double right_rate = 0,
                             double yaw_rate = 0, double pitch_accel = 0) {
  const Eigen::Vector3d r = Settings().imu_m;
  const Eigen::Vector3d w(0, pitch_rate, yaw_rate), alpha(0, pitch_accel, 0);
  const Eigen::Vector3d axle(accel * std::cos(pitch) - kG * std::sin(pitch), 0,
                             accel * std::sin(pitch) + kG * std::cos(pitch));
  const Eigen::Vector3d f = axle + alpha.cross(r) + w.cross(w.cross(r));
  upright_sensor_sample s{};
  s.struct_size = sizeof s;
  s.gyro_rad_s[1] = pitch_rate;
  s.gyro_rad_s[2] = yaw_rate;
  s.accel_m_s2[0] = f(0);
  s.accel_m_s2[1] = f(1);
  s.accel_m_s2[2] = f(2);
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
  // robots' IMUs). The accelerometer's noise reaches the pitch through the tilt filter's gain
  // l₁ = 0.0124: a first-order low-pass of white noise leaves σ_a / g √(l₁ / 2) = 4e-4 rad
  // (derived by hand), the bias loop and the gyro's own noise a little more; 2e-3 rad is five
  // of those (common practice).
  std::mt19937_64 random(7);
  std::normal_distribution<double> gyro(0, 0.003), accel(0, 0.05);
  ComplementaryEstimator estimator(Settings());
  double largest_pitch = 0, largest_x = 0, largest_speed = 0;
  for (int k = 0; k < 4000; ++k) {
    upright_sensor_sample s = Sample(0, 0, 0, 0.3, 0.3);
    s.gyro_rad_s[1] += gyro(random);
    s.accel_m_s2[0] += accel(random);
    s.accel_m_s2[2] += accel(random);
    const design::StateVector& x = estimator.Update(s);
    if (k >= 800) {  // after four time constants of the tilt filter
      largest_pitch = std::max(largest_pitch, std::abs(x(design::kPitch)));
      largest_x = std::max(largest_x, std::abs(x(design::kX)));
      largest_speed = std::max(largest_speed, std::abs(x(design::kXDot)));
    }
  }
  EXPECT_LT(largest_pitch, 2e-3);
  // x = r (φ + θ) less its value at the first sample: r times the pitch's wander and the first
  // sample's tilt error (3 σ_a / g).
  EXPECT_LT(largest_x, 0.1 * (2e-3 + 3 * 0.05 / kG));
  // The speed: the accelerometer's noise integrated, T σ_a = 2.5e-4 m/s a tick, and the gyro's
  // through r θ̇ = 3e-4 m/s and the lever arm; the encoders hold it to a few millimetres per
  // second (common practice).
  EXPECT_LT(largest_speed, 5e-3);
}

TEST(ComplementaryEstimator, ApproachesAConstantTiltTheAccelerometerAloneSeesAsTheTiltFilter) {
  // Starts level, then the accelerometer alone reports 0.1 rad (the gyro and the encoders see no
  // motion). The accelerometer's pitch is read with the acceleration the speed filter saw, which
  // the encoders hold to zero within a few ticks: the estimate follows the tilt filter's own
  // closed form (tilt_filter.hpp) a few ticks late, and reaches the tilt. 5 %: five ticks of lag
  // against the response's initial slope θ_a / τ (2.5 % of the tilt each), common practice.
  const EstimatorSettings settings = Settings();
  ComplementaryEstimator estimator(settings);
  estimator.Update(Sample(0, 0, 0, 0, 0));
  const double tilt = 0.1;
  const double p1 = std::exp(-kPeriod / settings.tilt_filter_s);
  const double p2 = std::exp(-kPeriod / settings.bias_filter_s);
  double worst = 0, pitch = 0;
  for (int k = 1; k <= 4000; ++k) {
    upright_sensor_sample s = Sample(tilt, 0, 0, 0, 0);
    pitch = estimator.Update(s)(design::kPitch);
    const double expected =
        tilt *
        (1 - (p1 * std::pow(p2, k) * (1 - p2) - p2 * std::pow(p1, k) * (1 - p1)) / (p1 - p2));
    worst = std::max(worst, std::abs(pitch - expected));
  }
  EXPECT_LT(worst, 0.05 * tilt);
  EXPECT_NEAR(pitch, tilt, 1e-3 * tilt);
}

TEST(ComplementaryEstimator, ConsistentGyroAndAccelerometerGiveTheExactPitch) {
  // Tipping forward at 0.2 rad/s about a still axle: the gyro's step and the accelerometer's
  // tilt (with the IMU's centripetal θ̇² r) agree, and the estimate keeps the truth exactly.
  ComplementaryEstimator estimator(Settings());
  const double rate = 0.2;
  for (int k = 0; k <= 100; ++k) {
    const double pitch = rate * k * kPeriod;
    const design::StateVector& x =
        estimator.Update(Sample(pitch, rate, 0, -pitch, -pitch, -rate, -rate));
    ASSERT_NEAR(x(design::kPitch), pitch, 1e-12) << "tick " << k;
    ASSERT_NEAR(x(design::kXDot), 0, 1e-12) << "tick " << k;
  }
}

TEST(ComplementaryEstimator, TheIMUsLeverArmIsNotReadAsTiltOrSpeed) {
  // The chassis swings forward about a still axle at a constant 2 rad/s² from rest; the IMU sits
  // 0.05 m ahead of and 0.2 m above the axle, so it reads the tangential h θ̈ = 0.4 m/s² forward
  // (a tilt of −0.04 rad if taken for gravity) and growing centripetal terms. Allowing for them
  // (gyro differences give θ̈ exactly here), the pitch and the zero speed come out exact.
  ComplementaryEstimator estimator(Settings());
  const double alpha = 2;
  for (int k = 0; k <= 100; ++k) {
    const double t = k * kPeriod, pitch = alpha * t * t / 2, rate = alpha * t;
    const design::StateVector& x = estimator.Update(
        Sample(pitch, rate, 0, -pitch, -pitch, -rate, -rate, 0, k == 0 ? 0 : alpha));
    ASSERT_NEAR(x(design::kPitch), pitch, 1e-12) << "tick " << k;
    ASSERT_NEAR(x(design::kPitchRate), rate, 1e-12) << "tick " << k;
    ASSERT_NEAR(x(design::kXDot), 0, 1e-12) << "tick " << k;
  }
}

TEST(ComplementaryEstimator, ForwardAccelerationIsNotReadAsTilt) {
  // Upright, from rest, the axle's acceleration rising to 1 m/s² over the first tick and staying
  // there (wheels rolling, no pitch): the accelerometer reads f_x = a. Read as tilt it would pull
  // the estimate to −a / g = −0.1 rad within a few τ. The speed filter's prediction is exact for
  // an acceleration linear over each tick, so the speed is exact too:
  // v = a (t − T/2), x = a T²/6 + a T (t − T)/2 + a (t − T)²/2 after the first tick.
  const EstimatorSettings settings = Settings();
  ComplementaryEstimator estimator(settings);
  const double a = 1, r = settings.wheel_radius_m, T = kPeriod;
  estimator.Update(Sample(0, 0, 0, 0, 0));
  for (int k = 1; k <= 600; ++k) {
    const double t = k * T;
    const double travel = a * T * T / 6 + a * T * (t - T) / 2 + a * (t - T) * (t - T) / 2;
    const double speed = a * (t - T / 2);
    const double angle = travel / r, rate = speed / r;
    const design::StateVector& x = estimator.Update(Sample(0, 0, a, angle, angle, rate, rate));
    ASSERT_NEAR(x(design::kPitch), 0, 1e-12) << "t = " << t;
    ASSERT_NEAR(x(design::kXDot), speed, 1e-12) << "t = " << t;
  }
}

TEST(ComplementaryEstimator, LearnsAConstantPitchGyroBias) {
  // Standing still, the pitch gyro reading 0.02 rad/s: learnt as the tilt filter's closed form
  // says (tilt_filter.hpp), up to the few ticks the speed filter takes to turn the tilt error
  // into the acceleration it reads the accelerometer with: after 5 τ_b = 10 s within 2 % of the
  // bias, after 20 s within 0.1 %; the pitch rate state then reads zero and the pitch stays
  // within its closed-form peak, 0.315 b s (tilt_filter_test.cpp).
  const EstimatorSettings settings = Settings();
  ComplementaryEstimator estimator(settings);
  const double bias = 0.02;
  double peak = 0;
  for (int k = 0; k <= 4000; ++k) {
    upright_sensor_sample s = Sample(0, 0, 0, 0, 0);
    s.gyro_rad_s[1] += bias;
    const design::StateVector& x = estimator.Update(s);
    peak = std::max(peak, std::abs(x(design::kPitch)));
    if (k == 2000) {
      EXPECT_NEAR(estimator.gyro_bias_rad_s(), bias, 0.02 * bias);
    }
  }
  EXPECT_NEAR(estimator.gyro_bias_rad_s(), bias, 1e-3 * bias);
  EXPECT_NEAR(estimator.state()(design::kPitchRate), 0, 1e-3 * bias);
  EXPECT_LT(peak, 1.05 * 0.315 * bias);
}

TEST(ComplementaryEstimator, AnAccelerometerBiasReadsAsATiltItCannotTellApart) {
  // Standing still, the accelerometer's forward axis reading 0.15 m/s² too much: nothing in these
  // sensors tells it from a pitch of −0.15 / g (tilt_filter.hpp), and the estimate settles there,
  // atan2(−b, g) = −0.0153 rad. The speed filter's acceleration, read with that pitch, is zero.
  ComplementaryEstimator estimator(Settings());
  const double bias = 0.15;
  for (int k = 0; k <= 4000; ++k) {
    upright_sensor_sample s = Sample(0, 0, 0, 0, 0);
    s.accel_m_s2[0] += bias;
    estimator.Update(s);
  }
  EXPECT_NEAR(estimator.state()(design::kPitch), std::atan2(-bias, kG), 1e-6);
  EXPECT_NEAR(estimator.state()(design::kXDot), 0, 1e-9);
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
