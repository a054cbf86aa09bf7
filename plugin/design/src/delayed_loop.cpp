// The module's sampled loop with delayed inputs, broken at the plant inputs (see
// delayed_loop.hpp), and its margins with the delay margin made exact for the held input.
#include "upright/design/delayed_loop.hpp"

#include <algorithm>
#include <cmath>
#include <string>

namespace upright::design {
namespace {

using Eigen::MatrixXd;

// The age of the input a sensor that feels the input (the accelerometer) reads at tick k under a
// delay τ = ℓT + τ': u[k − ℓ − 1] (the input held over the physics step the reading ends).
int SensedAge(double delay_s, double period_s) {
  return static_cast<int>(std::floor(delay_s / period_s + 1e-9)) + 1;
}

// State feedback on [x; the law's own past commands]: states [ξ; c].
DelayedLoop StateFeedbackLoop(const DelayedPlant& plant, const SampledLaw& law, double period_s) {
  const int n = plant.plant_states, big_n = plant.states();
  const int m = static_cast<int>(plant.Gamma.cols());
  const int memory = law.memory, nc = m * memory;
  DelayedLoop out;
  BrokenLoop& open = out.open;
  open.period_s = period_s;
  open.C = MatrixXd::Zero(m, big_n + nc);  // u = −C [ξ; c]
  open.C.leftCols(n) = law.K.leftCols(n);
  open.C.rightCols(nc) = law.K.rightCols(nc);
  open.A = MatrixXd::Zero(big_n + nc, big_n + nc);
  open.A.topLeftCorner(big_n, big_n) = plant.Phi;
  // c ages by one each tick; its newest entry is this tick's command u = −C x.
  for (int j = 0; j < m; ++j) {
    for (int age = memory; age >= 2; --age) {
      open.A(big_n + j * memory + memory - age, big_n + j * memory + memory - age + 1) = 1;
    }
    if (memory >= 1) open.A.row(big_n + j * memory + memory - 1) -= open.C.row(j);
  }
  open.B = MatrixXd::Zero(big_n + nc, m);
  open.B.topRows(big_n) = plant.Gamma;
  const bool same_memory =
      std::all_of(plant.stored.begin(), plant.stored.end(), [&](int s) { return s == memory; });
  if (memory == 0) {
    // The gain reads x alone: Φ − Γ [K 0].
    MatrixXd gain = MatrixXd::Zero(m, big_n);
    gain.leftCols(n) = law.K;
    out.poles = PolesOfTransition(plant.Phi - plant.Gamma * gain, period_s);
  } else if (same_memory) {
    // In the closed loop the law's memory is the plant's stored inputs: Φ − Γ K.
    out.poles = PolesOfTransition(plant.Phi - plant.Gamma * law.K, period_s);
  } else {
    out.poles = PolesOfTransition(open.A - open.B * open.C, period_s);
  }
  return out;
}

// The lqg module's filter: x̂_k = p_k + L (y_k − C p_k − D u_{k−1}), y_k = C x_k + D (the input
// the sensor felt), p_{k+1} = Ad x̂_k + Bd u_k, u_k = −K x̂_k. States [ξ; p; c], c = u_{k−1}.
DelayedLoop LqgLoop(const DelayedPlant& plant, const SampledLaw& law, double period_s,
                    const std::vector<double>& delays_s) {
  const LqgFilter& filter = *law.filter;
  const int n = plant.plant_states, big_n = plant.states();
  const int m = static_cast<int>(plant.Gamma.cols());
  const MatrixXd& C = filter.sensors.C;
  const MatrixXd& D = filter.sensors.D;
  const MatrixXd& L = filter.L_discrete;
  const MatrixXd K = law.K.leftCols(n);
  MatrixXd Cy = MatrixXd::Zero(C.rows(), big_n);  // y = Cy ξ
  Cy.leftCols(n) = C;
  for (int j = 0; j < m; ++j) {
    Cy.col(plant.StoredIndex(j, SensedAge(delays_s[static_cast<size_t>(j)], period_s))) += D.col(j);
  }
  const MatrixXd I = MatrixXd::Identity(n, n);
  MatrixXd estimate(n, big_n + n + m);  // x̂ from [ξ; p; c]
  estimate << L * Cy, I - L * C, -L * D;
  DelayedLoop out;
  BrokenLoop& open = out.open;
  open.period_s = period_s;
  open.C = K * estimate;
  open.A = MatrixXd::Zero(big_n + n + m, big_n + n + m);
  open.A.topLeftCorner(big_n, big_n) = plant.Phi;
  open.A.middleRows(big_n, n) = (filter.Ad - filter.Bd * K) * estimate;
  open.A.bottomRows(m) = -open.C;
  open.B = MatrixXd::Zero(big_n + n + m, m);
  open.B.topRows(big_n) = plant.Gamma;
  const bool all_delayed =
      std::all_of(plant.stored.begin(), plant.stored.end(), [](int s) { return s >= 1; }) &&
      std::all_of(delays_s.begin(), delays_s.end(), [](double d) { return d > 0; });
  if (std::all_of(delays_s.begin(), delays_s.end(), [](double d) { return d == 0; })) {
    out.poles = SampledLqg(Gain(K), filter, period_s);  // the D u terms cancel
    return out;
  }
  if (!all_delayed) {
    out.poles = PolesOfTransition(open.A - open.B * open.C, period_s);
    return out;
  }
  // In the closed loop c is the plant's newest stored input: the loop on [ξ; p] alone.
  MatrixXd newest = MatrixXd::Zero(m, big_n);
  for (int j = 0; j < m; ++j) newest(j, plant.StoredIndex(j, 1)) = 1;
  MatrixXd reduced(n, big_n + n);  // x̂ from [ξ; p]
  reduced << L * Cy - L * D * newest, I - L * C;
  MatrixXd phi = MatrixXd::Zero(big_n + n, big_n + n);
  phi.topLeftCorner(big_n, big_n) = plant.Phi;
  phi.topRows(big_n) -= plant.Gamma * K * reduced;
  phi.bottomRows(n) = (filter.Ad - filter.Bd * K) * reduced;
  out.poles = PolesOfTransition(phi, period_s);
  return out;
}

bool StableAt(const LinearModel& plant, const SampledLaw& law, double period_s,
              const std::vector<double>& delays_s) {
  const Result<DelayedLoop, SolveError> loop = SampledDelayedLoop(plant, law, period_s, delays_s);
  if (!loop) return false;
  const Eigen::VectorXcd z = (loop->open.A - loop->open.B * loop->open.C).eigenvalues();
  return z.size() == 0 || z.cwiseAbs().maxCoeff() < 1 - 1e-12;
}

// The delay margin beyond the latency for the inputs in `inputs`, exact for the held input. The
// phase estimate is exact at whole periods, so the first instability lies within a period of it:
// steps of T/8 from the estimate less a period to the estimate plus a period (from 0 when the
// loop is already unstable there), and the first unstable step bisected. The estimate itself when
// no step is unstable, or when it is beyond kMaxPeriods periods (the augmented loop grows with
// the delay).
double ExactDelayMargin(const LinearModel& plant, const SampledLaw& law, double period_s,
                        double latency_s, const std::vector<int>& inputs, double estimate) {
  constexpr double kMaxPeriods = 20;
  if (!std::isfinite(estimate) || estimate > kMaxPeriods * period_s) return estimate;
  const auto stable = [&](double extra_s) {
    std::vector<double> delays(kInputs, latency_s);
    for (int j : inputs) delays[static_cast<size_t>(j)] += extra_s;
    return StableAt(plant, law, period_s, delays);
  };
  const double step = period_s / 8;
  double previous = std::max(0.0, estimate - period_s);
  if (previous > 0 && !stable(previous)) previous = 0;
  for (double extra = previous + step; extra <= estimate + period_s; extra += step) {
    if (stable(extra)) {
      previous = extra;
      continue;
    }
    double unstable = extra;
    for (int i = 0; i < 50 && unstable - previous > 1e-12 * period_s; ++i) {
      const double middle = 0.5 * (previous + unstable);
      (stable(middle) ? previous : unstable) = middle;
    }
    return previous;
  }
  return estimate;
}

}  // namespace

Result<DelayedLoop, SolveError> SampledDelayedLoop(const LinearModel& plant, const SampledLaw& law,
                                                   double period_s,
                                                   const std::vector<double>& delays_s) {
  const int n = kStates, m = kInputs;
  const auto invalid = [](const std::string& why) {
    return Failure(SolveError{SolveFailure::kInvalidInput, "SampledDelayedLoop: " + why});
  };
  if (law.memory < 0 || (law.filter != nullptr && law.memory != 0)) {
    return invalid("memory = " + std::to_string(law.memory) +
                   ", must be >= 0 (and 0 with the lqg filter)");
  }
  if (law.K.rows() != m || law.K.cols() != n + m * law.memory) {
    return invalid("K is " + std::to_string(law.K.rows()) + "x" + std::to_string(law.K.cols()) +
                   ", expected " + std::to_string(m) + "x" + std::to_string(n + m * law.memory));
  }
  if (static_cast<int>(delays_s.size()) != m) {
    return invalid(std::to_string(delays_s.size()) + " delays for " + std::to_string(m) +
                   " inputs");
  }
  std::vector<int> sensed;
  if (law.filter != nullptr) {
    for (double d : delays_s) sensed.push_back(SensedAge(d, period_s));
  }
  const Result<DelayedPlant, SolveError> delayed =
      DelayInputs(plant.A, plant.B, period_s, delays_s, sensed);
  if (!delayed) return Failure(delayed.error());
  if (law.filter != nullptr) return LqgLoop(*delayed, law, period_s, delays_s);
  return StateFeedbackLoop(*delayed, law, period_s);
}

AnalysisResult<SampledMargins> AnalyseSampledMargins(const LinearModel& plant,
                                                     const SampledLaw& law, double period_s,
                                                     double latency_s) {
  SampledMargins out;
  const auto stopped = [&out](const std::string& why) {
    return Failure(AnalysisFailure<SampledMargins>{"sampled margins: " + why, out});
  };
  // The scans grow with the cube of the loop's states, which grow with the latency.
  constexpr int kMaxLatencyPeriods = 10;
  if (latency_s > kMaxLatencyPeriods * period_s) {
    return stopped("not analysed beyond a latency of " + std::to_string(kMaxLatencyPeriods) +
                   " periods");
  }
  const std::vector<double> nominal(kInputs, latency_s);
  const Result<DelayedLoop, SolveError> loop = SampledDelayedLoop(plant, law, period_s, nominal);
  if (!loop) return stopped(loop.error().message);
  out.period_s = period_s;
  out.latency_s = latency_s;
  std::vector<AnalysisResult<LoopMargins>> wheels;
  for (int j = 0; j < kInputs; ++j) {
    wheels.push_back(PerturbedMargins(loop->open, {j}));
    if (wheels.back()) {
      wheels.back()->delay_s =
          ExactDelayMargin(plant, law, period_s, latency_s, {j}, wheels.back()->delay_s);
    }
    out.wheels.push_back(wheels.back() ? *wheels.back() : wheels.back().error().found);
  }
  const AnalysisResult<LoopMargins> worst = WorstOf(wheels);
  out.worst_wheel = worst ? *worst : worst.error().found;
  AnalysisResult<LoopMargins> both = SimultaneousMargins(loop->open);
  if (both) {
    both->delay_s = ExactDelayMargin(plant, law, period_s, latency_s, {0, 1}, both->delay_s);
  }
  out.both_wheels = both ? *both : both.error().found;
  if (!worst) return stopped(worst.error().message);
  if (!both) return stopped(both.error().message);
  return out;
}

}  // namespace upright::design
