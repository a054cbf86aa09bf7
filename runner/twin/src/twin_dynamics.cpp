#include "upright/runner/twin/twin_dynamics.hpp"

#include <cmath>
#include <numbers>

#include "upright/design/riccati.hpp"
#include "upright/model/check.hpp"
#include "upright/model/conventions.hpp"

namespace upright::runner {

TwinDynamics::TwinDynamics(const model::RobotModel& model, design::InputKind input, double dt_s,
                           const std::vector<sim::Push>& pushes)
    : linear_(design::Linearise(model, input)), dt_s_(dt_s), pushes_(pushes) {
  UPRIGHT_CHECK(dt_s > 0 && std::isfinite(dt_s), "dt_s = %g", dt_s);
  // E's push column is linear in the height (Linearise: a force F at height h adds F h cos θ_eq
  // to the pitch equation), so two heights give it at any height, below the axle included.
  const design::StateVector at_axle = design::Linearise(model, input, 0.0).E.col(0);
  const design::StateVector per_metre = design::Linearise(model, input, 1.0).E.col(0) - at_axle;
  const int n = static_cast<int>(pushes.size());
  Eigen::MatrixXd inputs(design::kStates, design::kInputs + n);
  inputs.leftCols(design::kInputs) = linear_.B;
  for (const sim::Push& p : pushes) {
    e_.push_back(at_axle + p.height_m * per_metre);
    x_part_.push_back(std::cos(p.direction_deg * std::numbers::pi / 180));
    inputs.col(design::kInputs + static_cast<int>(e_.size()) - 1) = e_.back();
  }
  // A model the plant accepted linearises to finite matrices, and dt_s is checked above.
  const auto sampled = design::DiscretiseZoh(linear_.A, inputs, dt_s);
  UPRIGHT_CHECK(sampled.has_value(), "%s", sampled.error().message.c_str());
  Ad_ = sampled->Ad;
  const Eigen::MatrixXd& inputs_d = sampled->Bd;
  Bd_ = inputs_d.leftCols(design::kInputs);
  for (int j = 0; j < n; ++j) ed_.push_back(inputs_d.col(design::kInputs + j));
}

double TwinDynamics::PushForce(std::size_t j, long step) const {
  if (step < 0) return 0;
  const sim::Push& p = pushes_[j];
  // The step's interval exactly as the plant forms it.
  const double t0 = static_cast<double>(step) * dt_s_, t1 = t0 + dt_s_;
  if (t1 <= p.start_s || t0 >= p.end_s()) return 0;
  return p.MeanForce(t0, t1) * x_part_[j];
}

void TwinDynamics::Step(long step, const Eigen::Vector2d& u, design::StateVector* x) const {
  design::StateVector next = Ad_ * *x + Bd_ * u;
  for (std::size_t j = 0; j < ed_.size(); ++j) {
    const double f = PushForce(j, step);
    if (f != 0) next += ed_[j] * f;
  }
  *x = next;
}

design::StateVector TwinDynamics::Derivative(const design::StateVector& x, const Eigen::Vector2d& u,
                                             long step) const {
  design::StateVector dx = linear_.A * x + linear_.B * u;
  for (std::size_t j = 0; j < e_.size(); ++j) {
    const double f = PushForce(j, step);
    if (f != 0) dx += e_[j] * f;
  }
  return dx;
}

}  // namespace upright::runner
