#include "upright/design/lqg_filter.hpp"

#include "upright/model/conventions.hpp"

namespace upright::design {

FilterNoise DefaultFilterNoise(const model::RobotModel& model, const LinearModel& plant) {
  const double total_mass_kg = model.total_mass_kg();
  FilterNoise noise;
  noise.push_sigma_N = 0.05 * total_mass_kg * model::kStandardGravity_m_s2;
  noise.torque_sigma_Nm = 0.05 * plant.body.mass_kg * model::kStandardGravity_m_s2 * 0.1;
  noise.yaw_torque_sigma_Nm =
      0.05 * total_mass_kg * model::kStandardGravity_m_s2 * model.wheel.track_m / 2;
  return noise;
}

SensorLinearisation FilterSensors(const model::RobotModel& model, const LinearModel& plant,
                                  const FilterNoise& noise) {
  // The sensors, with the accelerometer's variance widened by the disturbances it feels
  // directly. f_x / g holds (ẍ + h θ̈) / g, into which this sample's push and pitch torque w enter
  // at once, y = C x + D u + F w; a filter for y = C x + D u + v does not see that term, so its
  // variance F Σ_w Fᵀ joins the row's (neglecting its correlation with the process noise).
  // Without it the filter trusts the model's acceleration, and any force the model lacks (rolling
  // resistance, wheel friction) pulls its pitch estimate into a friction limit cycle at about
  // 1 Hz: RMS pitch 0.81° on the courier robot without this, 0.46° with it.
  SensorLinearisation sensors = LineariseSensors(model, plant);
  const double h = model.sensors.imu_z_m;
  const Eigen::RowVector2d F =
      (plant.E.row(kXDot) + h * plant.E.row(kPitchRate)) / model::kStandardGravity_m_s2;
  const Eigen::Vector2d w_variance(noise.push_sigma_N * noise.push_sigma_N,
                                   noise.torque_sigma_Nm * noise.torque_sigma_Nm);
  constexpr int kAccelRow = SensorLinearisation::kAccelRow;
  sensors.Rv(kAccelRow, kAccelRow) += F * w_variance.asDiagonal() * F.transpose();
  return sensors;
}

Result<LqgFilter, SolveError> DesignLqgFilter(const model::RobotModel& model,
                                              const LinearModel& plant,
                                              const LinearModel& torque_plant,
                                              const FilterNoise& noise, double period_s) {
  LqgFilter f;
  f.sensors = FilterSensors(model, plant, noise);

  // Process noise: the push and pitch torque of E, a yaw torque, and the floor on every state.
  // ψ̈ = τ / J_yaw, 1 / J_yaw read off the torque model as B(ψ̇, right) r / (track / 2). The yaw
  // torque keeps the heading filter listening to the encoders and gyro: without it the only yaw
  // noise is the floor, the filter follows its model, and wheel friction the model lacks stalls
  // the turn (the tabletop robot turned 95° of 143° in 5 s, against 137° with it).
  StateVector yaw_torque = StateVector::Zero();
  yaw_torque(kYawRate) =
      torque_plant.B(kYawRate, model::kRight) * model.wheel.radius_m / (model.wheel.track_m / 2);
  Eigen::MatrixXd inputs(kStates, kInputs + kDisturbances + 1);
  inputs << plant.B, plant.E, yaw_torque;
  const Result<ZohSystem, SolveError> sampled = DiscretiseZoh(plant.A, inputs, period_s);
  if (!sampled) return Failure(sampled.error());
  f.Ad = sampled->Ad;
  const Eigen::MatrixXd& Gd = sampled->Bd;
  f.Bd = Gd.leftCols<kInputs>();
  const Eigen::MatrixXd Gw = Gd.rightCols(kDisturbances + 1);
  const Eigen::Vector3d variance(noise.push_sigma_N * noise.push_sigma_N,
                                 noise.torque_sigma_Nm * noise.torque_sigma_Nm,
                                 noise.yaw_torque_sigma_Nm * noise.yaw_torque_sigma_Nm);
  f.Qd = Gw * variance.asDiagonal() * Gw.transpose() +
         noise.floor * Eigen::MatrixXd::Identity(kStates, kStates);

  const Result<Eigen::MatrixXd, SolveError> discrete =
      DiscreteKalmanGain(f.Ad, f.sensors.C, f.Qd, f.sensors.Rv, &f.P_discrete);
  // Per-sample variances σ² over a period T are white-noise intensities σ² T.
  const Result<Eigen::MatrixXd, SolveError> continuous =
      KalmanBucyGain(plant.A, f.sensors.C, f.Qd / period_s, f.sensors.Rv * period_s);
  if (!discrete) return Failure(discrete.error());
  if (!continuous) return Failure(continuous.error());
  f.L_discrete = *discrete;
  f.L = *continuous;
  return f;
}

}  // namespace upright::design
