#include "upright/design/sampled_loop.hpp"

#include <algorithm>
#include <cmath>

#include "upright/design/riccati.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

}  // namespace

// z, their largest modulus, and s = log(z) / T (the principal logarithm: a pole on the negative
// real axis shows as a ±π/T oscillation).
SampledPoles PolesOfTransition(const MatrixXd& phi, double period_s) {
  SampledPoles out;
  out.period_s = period_s;
  const Eigen::VectorXcd z = phi.eigenvalues();
  for (Eigen::Index i = 0; i < z.size(); ++i) {
    out.max_abs_z = std::max(out.max_abs_z, std::abs(z(i)));
    out.s.push_back(std::log(z(i)) / period_s);
  }
  std::sort(out.s.begin(), out.s.end(), [](auto a, auto b) {
    return a.real() != b.real() ? a.real() < b.real() : a.imag() < b.imag();
  });
  return out;
}

Result<SampledPoles, SolveError> SampledStateFeedback(const LinearModel& plant, const Gain& K,
                                                      double period_s) {
  const Result<ZohSystem, SolveError> sampled = DiscretiseZoh(plant.A, plant.B, period_s);
  if (!sampled) return Failure(sampled.error());
  return PolesOfTransition(sampled->Ad - sampled->Bd * K, period_s);
}

SampledPoles SampledLqg(const Gain& K, const LqgFilter& filter, double period_s) {
  // x̂_k = L C x_k + (I − L C) p_k (the D u terms cancel), u_k = −K x̂_k, so
  // x_{k+1} = Ad x_k − Bd K x̂_k and p_{k+1} = Ad x̂_k + Bd u_k = (Ad − Bd K) x̂_k.
  const MatrixXd& Ad = filter.Ad;
  const MatrixXd& Bd = filter.Bd;
  const MatrixXd LC = filter.L_discrete * filter.sensors.C;
  const MatrixXd I = MatrixXd::Identity(kStates, kStates);
  MatrixXd estimate(kStates, 2 * kStates);  // x̂_k from [x_k; p_k]
  estimate << LC, I - LC;
  MatrixXd phi(2 * kStates, 2 * kStates);
  phi.topRows(kStates) = -Bd * K * estimate;
  phi.topLeftCorner(kStates, kStates) += Ad;
  phi.bottomRows(kStates) = (Ad - Bd * K) * estimate;
  return PolesOfTransition(phi, period_s);
}

}  // namespace upright::design
