// Step-response figures of a uniformly sampled signal (handbook definitions): settling time into
// a band around the final value, and the peak excursion and the rebound past it (for a step, the
// percentage overshoot). MetricRecorder uses both after each disturbance; tests hold them to the
// second-order formulas.
#pragma once

#include <span>

namespace upright::runner {

// The time (from the first sample, samples dt_s apart) after which every remaining sample lies
// within `band` of `final_value`: 0 when all do, NaN when the last one does not (or y is empty).
// Samples are taken as held, so the answer is the time of the first sample of the final in-band
// run. A non-finite sample counts as out of band.
double SettlingTime(std::span<const double> y, double dt_s, double final_value, double band);

struct Rebound {
  double peak = 0;         // P = max |y − final|: the peak excursion (0 for an empty y)
  double peak_time_s = 0;  // the time of the peak's first sample
  double rebound = 0;      // R = the largest excursion past final on the other side, after the peak
  double rebound_pct = 0;  // 100 R / P, at most 100; NaN when P is 0
};

// How far a signal swings from its final value and back past it: the peak excursion and the
// rebound on the other side after it. For a step response from `initial` the peak excursion is
// |initial − final| at the start, so rebound_pct is the classic percentage overshoot; for a
// response that starts and ends at final it is the decay from one swing to the next. Samples equal
// to final_value lie on neither side; NaN samples are skipped.
Rebound PeakAndRebound(std::span<const double> y, double dt_s, double final_value);

}  // namespace upright::runner
