// The delay-augmented sampled plant and the discrete LQR on it. The split of a period by a
// fractional delay is the modified z-transform's state-space form: Franklin, Powell and Workman,
// "Digital Control of Dynamic Systems", 3rd ed., 1998, chapter 4, the state-space models of
// systems with delay (from memory; the formula in delay_augmented.hpp is derived there by
// integrating the held input over the two parts of the period).
#include "upright/design/delay_augmented.hpp"

#include <cmath>
#include <string>

#include "riccati_common.hpp"
#include "upright/design/synthesis.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

// A delay as whole periods and the rest: τ = whole · T + fraction · T, 0 ≤ fraction < 1, a
// fraction within 1e-9 of 0 or 1 rounded to it.
struct SplitDelay {
  int whole = 0;
  double fraction = 0;
};

SplitDelay Split(double delay_s, double period_s) {
  const double periods = delay_s / period_s;
  double whole = std::floor(periods);
  double fraction = periods - whole;
  if (fraction > 1 - 1e-9) {
    whole += 1;
    fraction = 0;
  } else if (fraction < 1e-9) {
    fraction = 0;
  }
  return {static_cast<int>(whole), fraction};
}

}  // namespace

int DelayedPlant::StoredIndex(int input, int age) const {
  int index = plant_states;
  for (int j = 0; j < input; ++j) index += stored[static_cast<size_t>(j)];
  return index + stored[static_cast<size_t>(input)] - age;
}

Result<DelayedPlant, SolveError> DelayInputs(const MatrixXd& A, const MatrixXd& B, double period_s,
                                             const std::vector<double>& delays_s,
                                             const std::vector<int>& min_stored) {
  const int n = static_cast<int>(A.rows());
  const int m = static_cast<int>(B.cols());
  const auto invalid = [](const std::string& why) {
    return internal::Fail(SolveFailure::kInvalidInput, "DelayInputs: " + why);
  };
  if (static_cast<int>(delays_s.size()) != m) {
    return invalid(std::to_string(delays_s.size()) + " delays for " + std::to_string(m) +
                   " inputs");
  }
  if (!min_stored.empty() && static_cast<int>(min_stored.size()) != m) {
    return invalid(std::to_string(min_stored.size()) + " stored counts for " + std::to_string(m) +
                   " inputs");
  }
  if (!(period_s > 0) || !std::isfinite(period_s)) {
    return invalid("period_s = " + std::to_string(period_s) + ", must be finite and > 0");
  }
  for (double delay : delays_s) {
    if (!(delay >= 0) || !std::isfinite(delay)) {
      return invalid("delay " + std::to_string(delay) + " s, must be finite and >= 0");
    }
  }
  const Result<ZohSystem, SolveError> whole = DiscretiseZoh(A, B, period_s);
  if (!whole) return Failure(whole.error());

  DelayedPlant out;
  out.plant_states = n;
  std::vector<SplitDelay> split;
  for (int j = 0; j < m; ++j) {
    split.push_back(Split(delays_s[static_cast<size_t>(j)], period_s));
    const int needed = split.back().whole + (split.back().fraction > 0 ? 1 : 0);
    out.stored.push_back(
        std::max(needed, min_stored.empty() ? 0 : min_stored[static_cast<size_t>(j)]));
  }
  int total = n;
  for (int s : out.stored) total += s;
  out.Phi = MatrixXd::Zero(total, total);
  out.Gamma = MatrixXd::Zero(total, m);
  out.Phi.topLeftCorner(n, n) = whole->Ad;
  // Where u_j[k − age] enters: a stored value's column of Φ, or Γ for age 0.
  const auto add_input = [&out, n](int j, int age, const MatrixXd& column) {
    if (age == 0) {
      out.Gamma.block(0, j, n, 1) += column;
    } else {
      out.Phi.block(0, out.StoredIndex(j, age), n, 1) += column;
    }
  };
  for (int j = 0; j < m; ++j) {
    const SplitDelay& d = split[static_cast<size_t>(j)];
    if (d.fraction == 0) {
      add_input(j, d.whole, whole->Bd.col(j));
    } else {
      // u[k−ℓ−1] over the first τ' of the period, u[k−ℓ] over the remaining T − τ'.
      const double early_s = d.fraction * period_s;
      const Result<ZohSystem, SolveError> early = DiscretiseZoh(A, B.col(j), early_s);
      const Result<ZohSystem, SolveError> late = DiscretiseZoh(A, B.col(j), period_s - early_s);
      if (!early) return Failure(early.error());
      if (!late) return Failure(late.error());
      add_input(j, d.whole + 1, late->Ad * early->Bd);
      add_input(j, d.whole, late->Bd);
    }
    // The stored values age by one each tick; the newest is this tick's input.
    const int kept = out.stored[static_cast<size_t>(j)];
    for (int age = kept; age >= 2; --age) {
      out.Phi(out.StoredIndex(j, age), out.StoredIndex(j, age - 1)) = 1;
    }
    if (kept >= 1) out.Gamma(out.StoredIndex(j, 1), j) = 1;
  }
  return out;
}

Result<DelayedPlant, SolveError> DelayRobotInputs(const LinearModel& plant, double period_s,
                                                  double delay_s) {
  return DelayInputs(plant.A, plant.B, period_s, std::vector<double>(kInputs, delay_s));
}

Result<MatrixXd, SolveError> RobotDelayedLqr(const LinearModel& plant, const StateMatrix& Q,
                                             const Eigen::Matrix2d& R, double period_s,
                                             double delay_s) {
  const Result<DelayedPlant, SolveError> delayed = DelayRobotInputs(plant, period_s, delay_s);
  if (!delayed) return Failure(delayed.error());
  MatrixXd q = MatrixXd::Zero(delayed->states(), delayed->states());
  q.topLeftCorner(kStates, kStates) = Q;
  Result<MatrixXd, SolveError> gain = DiscreteLqrGain(delayed->Phi, delayed->Gamma, q, R);
  if (!gain) gain.error().message = "on the delay-augmented model: " + gain.error().message;
  return gain;
}

}  // namespace upright::design
