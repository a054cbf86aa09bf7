// The linear closed loop's response over time to the design push: what a design does to the
// robot on the model it was made on, for pictures beside the margins.
#pragma once

#include <vector>

#include "upright/base/result.hpp"
#include "upright/design/analysis.hpp"
#include "upright/design/design_push.hpp"
#include "upright/design/robot_limits.hpp"

namespace upright::design {

// Samples of the response, all of one length: the push force, the pitch and position states (the
// pitch measured from the model's equilibrium pitch) and each wheel's motor current.
struct PushResponse {
  std::vector<double> time_s, push_N, pitch_rad, position_m, current_left_A, current_right_A;
};

// From rest under `push`, the loop `pushed` (PushedLoop: input the push force, outputs [x; u]),
// solved exactly (the half-sine made by an oscillator in the state, the whole stepped by the
// matrix exponential) every push.duration_s / 20 until the push has ended and then eight time
// constants of the slowest decaying pole have passed (poles within 1e-9 of the fastest one's size
// of the origin, states that only integrate, count as settled), between 1 s and 30 s after the
// push. Fails for a pole in the right half-plane, sizes that disagree or a push of no size.
Result<PushResponse> ResponseToPush(const StateSpace& pushed, const CurrentMap& current,
                                    const DesignPush& push);

}  // namespace upright::design
