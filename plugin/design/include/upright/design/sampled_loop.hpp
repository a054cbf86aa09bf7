// SampledLoop: the closed loop as a module runs it — the plant's input held over each sample
// (zero-order hold) and the controller acting once a sample — for the designs whose sampled law
// is known: state feedback, and the LQR on the lqg module's Kalman filter. Sensor latency, the
// built-in state estimators other than that filter, and limits are left out.
#pragma once

#include <complex>
#include <vector>

#include "upright/design/linear_model.hpp"
#include "upright/design/lqg_filter.hpp"
#include "upright/design/riccati.hpp"
#include "upright/design/synthesis.hpp"

namespace upright::design {

struct SampledPoles {
  double period_s = 0;                     // 0: not analysed
  std::vector<std::complex<double>> s;     // log(z) / T, sorted by real part (slowest last)
  double max_abs_z = 0;                    // < 1: the sampled loop is stable
  bool analysed() const { return period_s > 0; }
};

// u_k = −K x_k held over [kT, (k+1)T): the poles of Ad − Bd K, or why the plant could not be
// sampled at period_s.
Result<SampledPoles, SolveError> SampledStateFeedback(const LinearModel& plant, const Gain& K,
                                                      double period_s);

// u_k = −K x̂_k with the lqg module's filter (a-priori form): p_k = Ad x̂_{k−1} + Bd u_{k−1},
// x̂_k = p_k + L (y_k − C p_k − D u_{k−1}), y_k = C x_k + D u_{k−1}; `filter` designed at
// period_s. State [x_k; p_k].
SampledPoles SampledLqg(const Gain& K, const LqgFilter& filter, double period_s);

// The poles of a sampled loop x_{k+1} = Φ x_k: log(z) / T sorted by real part, and max |z|.
SampledPoles PolesOfTransition(const Eigen::MatrixXd& phi, double period_s);

}  // namespace upright::design
