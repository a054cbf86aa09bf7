// The spinning body of [SPG2020] (and of Doyle's classic loop-at-a-time counterexample) as a loop
// broken at its two inputs, for the margin and loop-response tests. Sources in
// tests/REFERENCES.md.
#pragma once

#include <Eigen/Dense>

#include "upright/design/simultaneous_margins.hpp"

namespace upright::design::testing {

// Plant 1/(s² + a²) [s − a², a(s + 1); −a(s + 1), s − a²] under K = I, realised as
// ẋ = [0 a; −a 0] x + u, y = [1 a; −a 1] x (C (sI − A)⁻¹ B gives the matrix above; derived by
// hand).
inline BrokenLoop SpinningBody(double a) {
  BrokenLoop l;
  l.A = (Eigen::MatrixXd(2, 2) << 0, a, -a, 0).finished();
  l.B = Eigen::MatrixXd::Identity(2, 2);
  l.C = (Eigen::MatrixXd(2, 2) << 1, a, -a, 1).finished();
  return l;
}

}  // namespace upright::design::testing
