// The regularised incomplete beta function by its continued fraction, and Student's t from it.
#include "upright/runner/tables/student_t.hpp"

#include <cmath>
#include <limits>

namespace upright::runner {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The continued fraction of I_x(a, b) (Abramowitz & Stegun 26.5.8) evaluated by the modified Lentz
// method, as in Press et al., Numerical Recipes, 3rd ed., §6.4 (from memory): the even and odd
// terms d_2m = m(b − m)x / ((a + 2m − 1)(a + 2m)), d_2m+1 = −(a + m)(a + b + m)x / ((a + 2m)(a +
// 2m + 1)). Converges fast for x < (a + 1) / (a + b + 2).
double BetaContinuedFraction(double a, double b, double x) {
  constexpr int kMaxTerms = 500;
  constexpr double kTolerance = 1e-15;
  constexpr double kTiny = 1e-300;  // keeps the Lentz ratios away from division by zero
  const auto guard = [](double v) { return std::fabs(v) < kTiny ? kTiny : v; };
  double c = 1;
  double d = 1 / guard(1 - (a + b) * x / (a + 1));
  double h = d;
  for (int m = 1; m <= kMaxTerms; ++m) {
    const double dm = static_cast<double>(m);
    const double even = dm * (b - dm) * x / ((a + 2 * dm - 1) * (a + 2 * dm));
    d = 1 / guard(1 + even * d);
    c = guard(1 + even / c);
    h *= d * c;
    const double odd = -(a + dm) * (a + b + dm) * x / ((a + 2 * dm) * (a + 2 * dm + 1));
    d = 1 / guard(1 + odd * d);
    c = guard(1 + odd / c);
    const double step = d * c;
    h *= step;
    if (std::fabs(step - 1) < kTolerance) break;
  }
  return h;
}

}  // namespace

double RegularisedIncompleteBeta(double a, double b, double x) {
  if (!(a > 0) || !(b > 0) || !(x >= 0) || !(x <= 1)) return kNaN;
  if (x == 0) return 0;
  if (x == 1) return 1;
  // x^a (1 − x)^b / (a B(a, b)) times the fraction (A&S 26.5.8).
  const double log_front =
      std::lgamma(a + b) - std::lgamma(a) - std::lgamma(b) + a * std::log(x) + b * std::log1p(-x);
  if (x < (a + 1) / (a + b + 2)) return std::exp(log_front) * BetaContinuedFraction(a, b, x) / a;
  return 1 - std::exp(log_front) * BetaContinuedFraction(b, a, 1 - x) / b;
}

double StudentTTwoSidedP(double t, double df) {
  if (std::isnan(t) || !(df > 0)) return kNaN;
  if (std::isinf(t)) return 0;
  return RegularisedIncompleteBeta(df / 2, 0.5, df / (df + t * t));
}

double StudentTUpperTail(double t, double df) {
  const double two_sided = StudentTTwoSidedP(t, df);
  return t >= 0 ? two_sided / 2 : 1 - two_sided / 2;
}

}  // namespace upright::runner
