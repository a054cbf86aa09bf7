// The loop as a module runs it, with the sensors' latency: the delay-augmented plant
// (delay_augmented.hpp) under the module's sampled law, closed for its poles and broken at the
// plant inputs for its margins — wheel by wheel and both wheels at once.
#pragma once

#include <vector>

#include "upright/design/delay_augmented.hpp"
#include "upright/design/lqg_filter.hpp"
#include "upright/design/sampled_loop.hpp"
#include "upright/design/simultaneous_margins.hpp"

namespace upright::design {

// A module's sampled law: state feedback u_k = −K [x_k; its own past commands] (`memory` past
// commands per input, ordered as DelayedPlant's stored inputs; memory 0 for a plain gain on the
// state), or the lqg module's filter with the regulator K.
struct SampledLaw {
  Eigen::MatrixXd K;  // m × (n + m · memory)
  int memory = 0;
  const LqgFilter* filter = nullptr;  // the lqg module's filter (then memory is 0)
};

// The loop of `law` on `plant` sampled at period_s, input j reaching the plant delays_s[j] after
// its tick: broken at the plant inputs, and its closed-loop poles (the delayed sensors see the
// inputs' effect a delay late, so the state the law reads is the delay-augmented model's x).
struct DelayedLoop {
  BrokenLoop open;
  SampledPoles poles;
};
Result<DelayedLoop, SolveError> SampledDelayedLoop(const LinearModel& plant, const SampledLaw& law,
                                                   double period_s,
                                                   const std::vector<double>& delays_s);

// The sampled loop's margins at the latency the model has: per wheel (the other closed), their
// worst, and both wheels at once (common mode; the disk figures multi-loop). delay_s is the delay
// beyond the latency that destabilises the loop: found on the z^{−τ/T} phase crossings (exact at
// whole periods), then made exact for the held input by stepping the delay-augmented loop by T/8
// over the period on either side of it and bisecting the first unstable step (left at the
// phase figure beyond 20 periods). Not analysed (a failure, period_s 0) for a latency of more than
// 10 periods: the scans grow with the cube of the loop's states.
struct SampledMargins {
  double period_s = 0;  // 0: not analysed
  double latency_s = 0;
  std::vector<LoopMargins> wheels;
  LoopMargins worst_wheel;
  LoopMargins both_wheels;
  bool analysed() const { return period_s > 0; }
};
AnalysisResult<SampledMargins> AnalyseSampledMargins(const LinearModel& plant,
                                                     const SampledLaw& law, double period_s,
                                                     double latency_s);

}  // namespace upright::design
