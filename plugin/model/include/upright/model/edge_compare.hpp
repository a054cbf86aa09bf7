// Comparing a quantity computed from file values (a sum, a difference, a half-length) against a
// geometric limit: a value exactly on a documented edge counts as on it, whatever the rounding of
// the arithmetic that produced it. Every rule of model and scenario files that ties several fields
// together compares through these.
#pragma once

namespace upright::model {

// The tolerance is kEdgeUlps · ε · scale (ε = 2^-52, the machine epsilon of double: 4 to 8 units
// in the last place of scale), where scale is the largest of |value|, |limit| and the caller's
// `scale`, the sum of the magnitudes of the fields that went into the comparison. A sum of n terms
// rounds by at most (n - 1) · ε/2 of their summed magnitudes (Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., §4.2), so this covers sums of up to 9 terms.
inline constexpr double kEdgeUlps = 4;

// value <= limit, a value within the tolerance above the limit counting as on it (accepted).
bool NoMoreThan(double value, double limit, double scale);
// value < limit, a value within the tolerance below the limit counting as on it (refused).
bool LessThan(double value, double limit, double scale);

}  // namespace upright::model
