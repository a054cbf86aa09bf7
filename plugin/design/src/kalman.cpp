#include <cmath>
#include <numbers>

#include "upright/design/synthesis.hpp"
#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

// Variance of uniform quantisation with step q: q² / 12 (Widrow, quantisation noise model;
// handbook, from memory).
double QuantisationVariance(double step) { return step * step / 12; }

}  // namespace

SensorLinearisation LineariseSensors(const model::RobotModel& model, const LinearModel& plant) {
  const model::SensorModel& s = model.sensors;
  const double r = model.wheel.radius_m, half_track = model.wheel.track_m / 2;
  const double g = model::kStandardGravity_m_s2;
  const double count_rad = 2 * std::numbers::pi / s.encoder_counts_per_rev;
  // A sampled white-noise density N gives σ² = N² f_s per sample (as the plant samples it).
  const double gyro_var = s.gyro_noise_rad_s_rthz * s.gyro_noise_rad_s_rthz * s.imu_rate_hz +
                          QuantisationVariance(s.gyro_resolution_rad_s);
  const double accel_var = s.accel_noise_m_s2_rthz * s.accel_noise_m_s2_rthz * s.imu_rate_hz +
                           QuantisationVariance(s.accel_resolution_m_s2);
  SensorLinearisation out;
  constexpr int m = SensorLinearisation::kMeasurements;
  out.C = MatrixXd::Zero(m, kStates);
  out.D = MatrixXd::Zero(m, kInputs);
  Eigen::Matrix<double, m, 1> variance;
  // Mean encoder angle relative to the chassis: x / r − θ.
  out.C(0, kX) = 1 / r;
  out.C(0, kPitch) = -1;
  variance(0) = QuantisationVariance(count_rad) / 2;
  // Gyro pitch rate.
  out.C(1, kPitchRate) = 1;
  variance(1) = gyro_var;
  // Heading from the encoder difference: r (φ_R − φ_L) / (2 d).
  out.C(2, kYaw) = 1;
  variance(2) = 2 * QuantisationVariance(count_rad) * (r / (2 * half_track)) * (r / (2 * half_track));
  // Gyro yaw rate.
  out.C(3, kYawRate) = 1;
  variance(3) = gyro_var;
  // Accelerometer along body x, over g: the specific force Rᵀ(a − g) there is
  // −g sin θ + ẍ + h θ̈ for an IMU h above the axle (conventions.hpp), so f_x / g ≈ −θ + (ẍ + h θ̈)/g.
  const double h = s.imu_z_m;
  constexpr int a = SensorLinearisation::kAccelRow;
  out.C.row(a) = (plant.A.row(kXDot) + h * plant.A.row(kPitchRate)) / g;
  out.C(a, kPitch) -= 1;
  out.D.row(a) = (plant.B.row(kXDot) + h * plant.B.row(kPitchRate)) / g;
  variance(a) = accel_var / (g * g);
  // A floor keeps the filter well posed for ideal sensors.
  out.Rv = variance.cwiseMax(1e-12).asDiagonal();
  return out;
}

}  // namespace upright::design
