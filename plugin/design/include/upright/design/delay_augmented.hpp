// The plant as a module sees it through a delay: sampled with a zero-order hold, each input
// reaching the plant a fixed time after the tick that computed it, its past values carried as
// extra states of the sampled model. A measurement delay acts like the same input delay (the
// plant is linear and time-invariant), so this is also the model of the sensors' latency.
#pragma once

#include <Eigen/Dense>
#include <vector>

#include "upright/design/linear_model.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {

// ξ_{k+1} = Φ ξ_k + Γ u_k with ξ_k = [x_k; the stored past inputs]. x_k is the state the delayed
// sensors report at tick k (the plant's state delay_s before it); input j's past values
// u_j[k−a], 1 ≤ a ≤ stored[j], follow x, input by input, oldest first.
struct DelayedPlant {
  Eigen::MatrixXd Phi, Gamma;
  int plant_states = 0;     // n, the rows of x
  std::vector<int> stored;  // per input, its past values kept in ξ
  int states() const { return static_cast<int>(Phi.rows()); }
  // The index in ξ of u_j[k − age], 1 ≤ age ≤ stored[input].
  int StoredIndex(int input, int age) const;
};

// ẋ = A x + B u(t − τ_j) per input j, sampled at period_s with u held between ticks. A delay
// τ = ℓT + τ' (0 ≤ τ' < T) splits each period into u[k−ℓ−1] for τ' and u[k−ℓ] for T − τ':
//   x_{k+1} = Φ(T) x_k + Φ(T − τ') Γ(τ') u[k−ℓ−1] + Γ(T − τ') u[k−ℓ],  Γ(h) = ∫₀ʰ e^{As} ds B,
// so input j keeps ⌈τ_j / T⌉ past values (a delay within 1e-9 T of a whole number of periods is
// that number). `min_stored` (empty, or one per input) keeps more, for a sensor that feels an
// older input. Fails like DiscretiseZoh, or for a negative or non-finite delay.
Result<DelayedPlant, SolveError> DelayInputs(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                             double period_s, const std::vector<double>& delays_s,
                                             const std::vector<int>& min_stored = {});

// The same delay on every input of the robot's linear model.
Result<DelayedPlant, SolveError> DelayRobotInputs(const LinearModel& plant, double period_s,
                                                  double delay_s);

// Discrete LQR on the delay-augmented robot: minimises Σ x_kᵀ Q x_k + u_kᵀ R u_k (the weights of
// RobotDiscreteLqr, nothing on the stored inputs). The gain, m × (n + stored inputs), feeds back
// the state the sensors report and the module's own past commands: u_k = −K ξ_k.
Result<Eigen::MatrixXd, SolveError> RobotDelayedLqr(const LinearModel& plant, const StateMatrix& Q,
                                                    const Eigen::Matrix2d& R, double period_s,
                                                    double delay_s);

}  // namespace upright::design
