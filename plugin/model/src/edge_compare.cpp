#include "upright/model/edge_compare.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace upright::model {
namespace {

double Tolerance(double value, double limit, double scale) {
  const double magnitude = std::max({std::abs(value), std::abs(limit), std::abs(scale)});
  return kEdgeUlps * std::numeric_limits<double>::epsilon() * magnitude;
}

}  // namespace

bool NoMoreThan(double value, double limit, double scale) {
  return value <= limit + Tolerance(value, limit, scale);
}

bool LessThan(double value, double limit, double scale) {
  return value < limit - Tolerance(value, limit, scale);
}

}  // namespace upright::model
