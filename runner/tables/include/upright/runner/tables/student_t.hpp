// Student's t distribution for the paired comparisons of the result tables: a t statistic and its
// degrees of freedom in, tail probabilities out, through the regularised incomplete beta function.
// Pure functions of their arguments.
#pragma once

namespace upright::runner {

// I_x(a, b), the regularised incomplete beta function, for a, b > 0 and x in [0, 1]; NaN outside.
// Evaluated by its continued fraction (Abramowitz & Stegun 26.5.8), on the side of x where it
// converges fast, with the symmetry I_x(a, b) = 1 − I_{1−x}(b, a).
double RegularisedIncompleteBeta(double a, double b, double x);

// P[T > t] for T ~ Student's t with `df` > 0 degrees of freedom (SciPy's t.sf): half of
// I_{df/(df+t²)}(df/2, 1/2) above t = 0 (Abramowitz & Stegun 26.7.1), its complement below.
// ±inf give 0 and 1; NaN in, NaN out.
double StudentTUpperTail(double t, double df);

// The two-sided p-value P[|T| ≥ |t|] = I_{df/(df+t²)}(df/2, 1/2): 1 at t = 0, 0 at ±inf.
double StudentTTwoSidedP(double t, double df);

}  // namespace upright::runner
