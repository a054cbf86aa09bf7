// TwinDynamics: the linear robot (design::Linearise) discretised exactly at the physics step by a
// zero-order hold — the wheel inputs and each push's mean force over the step held across it. A
// state and a step's inputs in, the next state out; the continuous derivative for the sensors.
#pragma once

#include <Eigen/Dense>
#include <vector>

#include "upright/design/linear_model.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/push.hpp"

namespace upright::runner {

class TwinDynamics {
 public:
  // The linear model of `model` for `input` (torque or voltage), stepped every `dt_s`. Each push
  // acts at its own height with its direction's x component only (the linear model is planar:
  // x along the heading, pitch, yaw). Allocates here, never in Step or Derivative.
  TwinDynamics(const model::RobotModel& model, design::InputKind input, double dt_s,
               const std::vector<sim::Push>& pushes);

  // Physics step `step` (from t = step·dt_s to (step + 1)·dt_s): x ← Ad x + Bd u + Σ ed_j f_j,
  // with u [left, right] (N·m or V) held and f_j push j's mean x-force over the step
  // (sim::Push::MeanForce, as the plant applies it). Exact for inputs held over the step.
  void Step(long step, const Eigen::Vector2d& u, design::StateVector* x) const;
  // ẋ = A x + B u + Σ E_j f_j with the push forces of physics step `step` (none for step < 0).
  design::StateVector Derivative(const design::StateVector& x, const Eigen::Vector2d& u,
                                 long step) const;
  // Push j's mean force along world x over physics step `step` (N); 0 when it does not act then.
  double PushForce(std::size_t j, long step) const;

  const design::LinearModel& linear() const { return linear_; }
  double dt_s() const { return dt_s_; }

 private:
  design::LinearModel linear_;
  double dt_s_ = 0;
  design::StateMatrix Ad_;
  design::InputMatrix Bd_;
  std::vector<sim::Push> pushes_;
  std::vector<double> x_part_;               // cos(direction) of each push
  std::vector<design::StateVector> e_, ed_;  // each push's column, continuous and discrete
};

}  // namespace upright::runner
