#include "upright/design/design_push.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <sstream>
#include <unsupported/Eigen/MatrixFunctions>

#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

constexpr int kStepsPerPush = 200;
constexpr int kMostSteps = 100000;
constexpr double kTimeConstantsAfter = 10;

}  // namespace

double DesignPush::peak_N() const { return std::numbers::pi / 2 * impulse_Ns / duration_s; }

Status DesignPush::Validate() const {
  if (impulse_Ns > 0 && std::isfinite(impulse_Ns) && duration_s > 0 && std::isfinite(duration_s)) {
    return {};
  }
  std::ostringstream why;
  why << "design push: impulse " << impulse_Ns << " N s over " << duration_s
      << " s, both must be > 0 and finite";
  return Failure(why.str());
}

DesignPush DesignPushFor(const LinearModel& plant, double push_scale_N) {
  // From A rather than fall_rate_1_s, so that a model rebuilt from the matrices alone (a module's)
  // gets the same push to the last bit.
  const double fall_rate_1_s = std::sqrt(std::max(plant.A(kPitchRate, kPitch), 0.0));
  return DesignPush{push_scale_N * 1.0, 2 / fall_rate_1_s};
}

Result<PushPeaks> LinearPushPeaks(const LinearModel& plant, const Gain& K,
                                  const CurrentMap& current, const DesignPush& push) {
  if (Status valid = push.Validate(); !valid) return Failure(valid.error());
  const StateMatrix closed = plant.A - plant.B * K;
  const Eigen::VectorXcd poles = closed.eigenvalues();
  double slowest_decay = std::numeric_limits<double>::infinity();
  for (const auto& p : poles) slowest_decay = std::min(slowest_decay, -p.real());
  if (!(slowest_decay > 0) || !closed.allFinite()) {
    return Failure("design push: the closed loop is not asymptotically stable");
  }
  const double step_s = push.duration_s / kStepsPerPush;
  const double after_s = kTimeConstantsAfter / slowest_decay;
  const int steps =
      kStepsPerPush + static_cast<int>(std::min<double>(std::ceil(after_s / step_s), kMostSteps));

  // ξ = [x; sin ωt; cos ωt]: ẋ = (A − BK) x + E₁ F_peak sin ωt, and the oscillator (ω = π / T)
  // that makes the half-sine, so one matrix exponential steps the pushed loop exactly.
  constexpr int n = kStates + 2;
  const double omega = std::numbers::pi / push.duration_s;
  Eigen::Matrix<double, n, n> pushed = Eigen::Matrix<double, n, n>::Zero();
  pushed.topLeftCorner<kStates, kStates>() = closed;
  pushed.block<kStates, 1>(0, kStates) = plant.E.col(0) * push.peak_N();
  pushed(kStates, kStates + 1) = omega;
  pushed(kStates + 1, kStates) = -omega;
  const Eigen::Matrix<double, n, n> step_pushed = (pushed * step_s).exp();
  const StateMatrix step_free = (closed * step_s).exp();

  Eigen::Matrix<double, n, 1> xi = Eigen::Matrix<double, n, 1>::Zero();
  xi(kStates + 1) = 1;  // cos 0
  PushPeaks peaks;
  StateVector x = StateVector::Zero();
  for (int k = 1; k <= steps; ++k) {
    if (k <= kStepsPerPush) {
      xi = step_pushed * xi;
      x = xi.head<kStates>();
    } else {
      x = step_free * x;
    }
    const Eigen::Vector2d u = -K * x;
    const Eigen::Vector2d i = current.per_input * u + current.per_state * x;
    peaks.tilt_rad = std::max(peaks.tilt_rad, std::abs(x(kPitch)));
    peaks.current_A = std::max(peaks.current_A, i.cwiseAbs().maxCoeff());
  }
  return peaks;
}

Result<PushPeaks> SampledPushPeaks(const LinearModel& plant, const Gain& K,
                                   const CurrentMap& current, const DesignPush& push,
                                   double period_s) {
  if (Status valid = push.Validate(); !valid) return Failure(valid.error());
  if (!(period_s > 0) || !std::isfinite(period_s)) {
    std::ostringstream why;
    why << "design push: period " << period_s << " s, must be > 0 and finite";
    return Failure(why.str());
  }
  // ξ = [x; u; sin ωt; cos ωt], u held between the ticks: one matrix exponential a sub-step.
  constexpr int n = kStates + kInputs + 2;
  constexpr int kS = kStates + kInputs, kC = kS + 1;
  const double omega = std::numbers::pi / push.duration_s;
  Eigen::Matrix<double, n, n> M = Eigen::Matrix<double, n, n>::Zero();
  M.topLeftCorner<kStates, kStates>() = plant.A;
  M.block<kStates, kInputs>(0, kStates) = plant.B;
  M.block<kStates, 1>(0, kS) = plant.E.col(0) * push.peak_N();
  M(kS, kC) = omega;
  M(kC, kS) = -omega;
  // The sampled loop, tick to tick, for its stability and slowest decay.
  const Eigen::Matrix<double, n, n> period = (M * period_s).exp();
  const StateMatrix sampled =
      period.topLeftCorner<kStates, kStates>() - period.block<kStates, kInputs>(0, kStates) * K;
  double largest_z = 0;
  for (const auto& z : sampled.eigenvalues()) largest_z = std::max(largest_z, std::abs(z));
  if (!(largest_z < 1) || !sampled.allFinite()) {
    return Failure("design push: the sampled loop is not asymptotically stable");
  }
  constexpr int kSubsteps = 20;
  const double step_s = period_s / kSubsteps;
  const Eigen::Matrix<double, n, n> step = (M * step_s).exp();
  const double decay_1_s = -std::log(largest_z) / period_s;
  const double end_s = push.duration_s + kTimeConstantsAfter / decay_1_s;
  const long ticks =
      std::min<long>(static_cast<long>(std::ceil(std::min(end_s / period_s, 1e9))), kMostSteps);

  Eigen::Matrix<double, n, 1> xi = Eigen::Matrix<double, n, 1>::Zero();
  xi(kC) = 1;  // cos 0
  bool pushing = true;
  PushPeaks peaks;
  const auto note = [&] {
    const StateVector x = xi.head<kStates>();
    const Eigen::Vector2d u = xi.segment<kInputs>(kStates);
    const Eigen::Vector2d i = current.per_input * u + current.per_state * x;
    peaks.tilt_rad = std::max(peaks.tilt_rad, std::abs(x(kPitch)));
    peaks.current_A = std::max(peaks.current_A, i.cwiseAbs().maxCoeff());
  };
  for (long k = 0; k < ticks; ++k) {
    xi.segment<kInputs>(kStates) = -K * xi.head<kStates>();
    note();
    for (int j = 0; j < kSubsteps; ++j) {
      const double t0 = static_cast<double>(k * kSubsteps + j) * step_s;
      if (pushing && t0 + step_s >= push.duration_s) {
        // The push ends inside this sub-step: up to its end, then with the oscillator stopped.
        const double first_s = push.duration_s - t0;
        xi = (M * first_s).exp() * xi;
        xi(kS) = 0;
        xi(kC) = 0;
        pushing = false;
        xi = (M * (step_s - first_s)).exp() * xi;
      } else {
        xi = step * xi;
      }
      note();
    }
  }
  return peaks;
}

}  // namespace upright::design
