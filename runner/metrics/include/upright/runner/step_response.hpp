// Step-response figures of a uniformly sampled signal (handbook definitions): settling time into
// a band around the final value, overshoot past it and the time of the peak. MetricRecorder uses
// them after each disturbance; tests hold them to the second-order formulas.
#pragma once

#include <span>

namespace upright::runner {

// The time (from the first sample, samples dt_s apart) after which every remaining sample lies
// within `band` of `final_value`: 0 when all do, NaN when the last one does not (or y is empty).
// Samples are taken as held, so the answer is the time of the first sample of the final in-band
// run. A non-finite sample counts as out of band.
double SettlingTime(std::span<const double> y, double dt_s, double final_value, double band);

struct Excursion {
  double first_peak = 0;  // the largest |y − final| before y first crosses back over final
  double first_peak_time_s = 0;
  double rebound = 0;  // the largest |y − final| on the other side, after that crossing
  // rebound / first_peak × 100; 0 when there is no crossing; NaN when first_peak is 0.
  double overshoot_pct = 0;
};

// How a signal leaves and returns to `final_value`: its first excursion and the rebound past the
// final value. The first excursion's side is that of the first sample off final_value; samples
// equal to final_value are on neither side. For a step response from `initial` (final_value ≠
// initial) the classic percentage overshoot is (max(y) − final) / (final − initial), given by
// StepOvershootPct.
Excursion AnalyseExcursion(std::span<const double> y, double dt_s, double final_value);

// Percentage overshoot of a step response from `initial` to `final_value`; 0 when y never passes
// the final value. And the time of its peak (first sample of the maximum excursion in the step's
// direction). Both NaN when y is empty or final_value == initial.
double StepOvershootPct(std::span<const double> y, double initial, double final_value);
double PeakTime(std::span<const double> y, double dt_s, double initial, double final_value);

}  // namespace upright::runner
