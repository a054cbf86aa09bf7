#include "upright/runner/metrics/metric_recorder.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstddef>
#include <functional>
#include <numbers>
#include <vector>

#include "allocation_count.hpp"

namespace upright::runner {
namespace {

constexpr double kDeg = 180 / std::numbers::pi;
constexpr double kDt = 0.001;

// Sample i of a run is taken after physics step i + 1, at t = (i + 1) dt, as the runner does.
double TimeOf(long i) { return static_cast<double>(i + 1) * kDt; }

// Feeds `steps` samples made by `make` (given the sample index and time) into `recorder`.
void Feed(MetricRecorder* recorder, long steps,
          const std::function<StepSample(long, double)>& make) {
  for (long i = 0; i < steps; ++i) {
    StepSample s = make(i, TimeOf(i));
    s.time_s = TimeOf(i);
    recorder->Add(s);
  }
}

// The metrics of a survived 6 s run (default settings) disturbed at `start_s` whose tilt is
// tilt(t).
RunMetrics TiltOnlyRun(const std::function<double(double)>& tilt, double start_s) {
  MetricRecorder recorder(MetricSettings{}, kDt, 6.0, {start_s});
  Feed(&recorder, 6000, [&](long, double t) {
    StepSample s;
    s.tilt_rad = tilt(t);
    return s;
  });
  return recorder.Finish(RunStatus::kOk, "survived");
}

// The mean of f over the last 0.1·window_s of the window's samples ending at sample `last`: the
// final value as the README's "Metrics" section defines it, evaluated on the analytic signal.
double FinalValue(const std::function<double(double)>& f, long last, double window_s) {
  const long count = std::lround(0.1 * window_s / kDt);
  double sum = 0;
  for (long i = last - count + 1; i <= last; ++i) sum += f(TimeOf(i));
  return sum / static_cast<double>(count);
}

TEST(MetricRecorder, ConstantTorqueEffortIsTwoTauSquaredT) {
  const double tau_Nm = 1.7;
  const long steps = 3000;  // T = 3 s
  MetricRecorder recorder(MetricSettings{}, kDt, 3.0, {});
  Feed(&recorder, steps, [&](long, double) {
    StepSample s;
    s.torque_Nm = {tau_Nm, -tau_Nm};
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // ∫(τ² + τ²) dt = 2τ²T exactly for a constant torque.
  EXPECT_NEAR(m.effort_Nm2s, 2 * tau_Nm * tau_Nm * 3.0, 1e-12 * m.effort_Nm2s);
  EXPECT_DOUBLE_EQ(m.peak_torque_Nm, tau_Nm);
  EXPECT_DOUBLE_EQ(m.end_time_s, TimeOf(steps - 1));
  EXPECT_EQ(m.status, RunStatus::kOk);
  EXPECT_EQ(m.message, "survived");
  EXPECT_TRUE(std::isnan(m.fall_time_s));
}

TEST(MetricRecorder, ARunThatNeverSteppedHasEveryFigureNaN) {
  // A controller fault on the first tick: the run ends before its first physics step.
  MetricRecorder recorder(MetricSettings{}, kDt, 3.0, {0.5});
  for (RunStatus status : {RunStatus::kControllerFault, RunStatus::kSetupFailed, RunStatus::kOk}) {
    const RunMetrics m = recorder.Finish(status, "why");
    EXPECT_EQ(m.status, status);
    EXPECT_EQ(m.message, "why");
    for (double figure :
         {m.fall_time_s, m.end_time_s, m.max_tilt_deg, m.max_drift_m, m.tilt_settle_s,
          m.drift_settle_s, m.tilt_rebound_deg, m.tilt_rebound_pct, m.rms_tilt_deg,
          m.iae_tilt_deg_s, m.effort_Nm2s, m.peak_torque_Nm, m.peak_current_A, m.saturation_pct,
          m.command_limit_pct, m.max_slip_ratio, m.slip_time_s, m.energy_J}) {
      EXPECT_TRUE(std::isnan(figure)) << ToString(status) << ": " << figure;
    }
  }
}

TEST(MetricRecorder, SinusoidalTiltRmsIsAmplitudeOverRootTwo) {
  const double a_rad = 0.05, f_hz = 2;
  const long per_period = 500, steps = 6 * per_period;  // six whole periods
  MetricRecorder recorder(MetricSettings{}, kDt, 3.0, {});
  Feed(&recorder, steps, [&](long, double t) {
    StepSample s;
    s.tilt_rad = a_rad * std::sin(2 * std::numbers::pi * f_hz * t);
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // Over whole periods of N > 2 equally spaced samples Σ sin² = N/2 exactly (Σ cos(4πk/N) = 0),
  // so the sampled RMS equals the continuous A/√2.
  EXPECT_NEAR(m.rms_tilt_deg, a_rad / std::sqrt(2.0) * kDeg, 1e-12);
  EXPECT_NEAR(m.max_tilt_deg, a_rad * kDeg, 1e-12);  // t = 0.125 s is a sample: sin = 1
  // Σ|sin(2πk/N)| over a period = 2 Σ_{k=0}^{N/2} sin(2πk/N) = 2 cot(π/N) (the sum-of-sines
  // identity Σ_{k=1}^{M} sin kx = sin(Mx/2) sin((M+1)x/2) / sin(x/2) with M = N/2, x = 2π/N);
  // the continuous ∫|A sin| dt = 2AT/π differs from it by the factor ≈ 1 − (π/N)²/3.
  const double iae_rad_s = a_rad * kDt * 6 * 2 / std::tan(std::numbers::pi / per_period);
  EXPECT_NEAR(m.iae_tilt_deg_s, iae_rad_s * kDeg, 1e-9 * iae_rad_s * kDeg);
  EXPECT_NEAR(m.iae_tilt_deg_s, 2 * a_rad * 3.0 / std::numbers::pi * kDeg, 2e-5 * m.iae_tilt_deg_s);
}

TEST(MetricRecorder, EnergyCountsOnlyPowerDrawn) {
  const long steps = 2000;  // 2 s: the first half draws on the left, the second on the right
  MetricRecorder recorder(MetricSettings{}, kDt, 2.0, {});
  Feed(&recorder, steps, [&](long i, double) {
    StepSample s;
    s.power_W = i < steps / 2 ? std::array<double, 2>{50, -10} : std::array<double, 2>{-30, 20};
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // 50 W for 1 s + 20 W for 1 s drawn; the regenerated −10 W and −30 W are not credited.
  EXPECT_NEAR(m.energy_J, 70, 1e-9);
}

TEST(MetricRecorder, SaturationPercentagesPeaksAndDrift) {
  const long steps = 1000;
  MetricRecorder recorder(MetricSettings{}, kDt, 1.0, {});
  Feed(&recorder, steps, [&](long i, double) {
    StepSample s;
    s.saturated = i % 4 == 0;
    s.command_at_limit = i < 125;
    s.current_A = {i == 300 ? -12.0 : 3.0, 4.0};
    s.torque_Nm = {0.5, i == 700 ? -5.5 : 1.0};
    s.drift_m = i == 500 ? 0.42 : 0.1;
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // Percentages of the 1000 steps: 250 saturated, the first 125 with the command at its limit.
  EXPECT_DOUBLE_EQ(m.saturation_pct, 25.0);
  EXPECT_DOUBLE_EQ(m.command_limit_pct, 12.5);
  EXPECT_DOUBLE_EQ(m.peak_current_A, 12.0);
  EXPECT_DOUBLE_EQ(m.peak_torque_Nm, 5.5);
  EXPECT_DOUBLE_EQ(m.max_drift_m, 0.42);
}

TEST(MetricRecorder, SlipCountsOnlyWheelsOnTheGround) {
  const long steps = 1000;
  MetricRecorder recorder(MetricSettings{}, kDt, 1.0, {});  // threshold 0.15
  Feed(&recorder, steps, [&](long i, double) {
    StepSample s;
    s.touching = {true, i >= 400 && i < 600};  // the right wheel is in the air but for 0.2 s
    s.slip_ratio = {i < 500 ? 0.3 : 0.05, i >= 400 && i < 600 ? -0.2 : 0.9};
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // The airborne right wheel's 0.9 is not slip; left slips on [0, 500), right on [400, 600):
  // either one on [0, 600), counted once.
  EXPECT_DOUBLE_EQ(m.max_slip_ratio, 0.3);
  EXPECT_NEAR(m.slip_time_s, 0.6, 1e-12);
}

TEST(MetricRecorder, AddNeverAllocatesEvenPastItsCapacity) {
  MetricSettings settings;
  settings.window_s = 0.5;
  MetricRecorder recorder(settings, kDt, 1.0, {0.2});  // room for 1002 samples
  StepSample s;
  s.torque_Nm = {1.0, 1.0};
  const long before = testing::AllocationCount();
  for (long i = 0; i < 1500; ++i) {
    s.time_s = TimeOf(i);
    s.tilt_rad = 0.01;
    recorder.Add(s);
  }
  const long allocations = testing::AllocationCount() - before;
  EXPECT_EQ(allocations, 0);
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // Running figures keep counting past the buffer: 1500 steps of 2 N²m² each.
  EXPECT_NEAR(m.effort_Nm2s, 2 * 1.5, 1e-12);
  EXPECT_DOUBLE_EQ(m.end_time_s, TimeOf(1499));
  EXPECT_EQ(m.tilt_settle_s, 0);  // in band throughout its window [0.2, 0.7] s
}

// A disturbance at t_d = 2 s: tilt jumps to A and decays as A e^{−s/τ}, drift rises as
// D (1 − e^{−s/τd}), s = t − t_d.
struct Decay {
  double start_s = 2.0, a_rad = 0.2, tau_s = 0.3, d_m = 0.5, tau_d_s = 0.8;
  double Tilt(double t) const { return t < start_s ? 0 : a_rad * std::exp(-(t - start_s) / tau_s); }
  double Drift(double t) const {
    return t < start_s ? 0 : d_m * (1 - std::exp(-(t - start_s) / tau_d_s));
  }
  StepSample Sample(double t) const {
    StepSample s;
    s.tilt_rad = Tilt(t);
    s.drift_m = Drift(t);
    return s;
  }
};

TEST(MetricRecorder, SettlingAfterADecayMatchesTheExactTime) {
  const MetricSettings settings;  // 1° and 0.05 m bands, 4 s window
  const Decay d;
  MetricRecorder recorder(settings, kDt, 10.0, {d.start_s});
  Feed(&recorder, 10000, [&](long, double t) { return d.Sample(t); });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");

  // The window [2, 6] s ends at sample 5999 (t = 6.000 s).
  const long last = 5999;
  const double band_rad = settings.tilt_band_deg / kDeg;
  const double tilt_final = FinalValue([&](double t) { return d.Tilt(t); }, last, 4.0);
  // A e^{−s/τ} − final = band ⇔ s = τ ln(A / (band + final)); samples are held, so the answer is
  // the first sample after it: within [s, s + dt).
  const double tilt_exact = d.tau_s * std::log(d.a_rad / (band_rad + tilt_final));
  EXPECT_GE(m.tilt_settle_s, tilt_exact - 1e-9);
  EXPECT_LT(m.tilt_settle_s, tilt_exact + kDt);
  // Drift: D − D e^{−s/τd} against final = D − ε: out of band while D e^{−s/τd} − ε > band.
  const double drift_final = FinalValue([&](double t) { return d.Drift(t); }, last, 4.0);
  const double eps = d.d_m - drift_final;
  const double drift_exact = d.tau_d_s * std::log(d.d_m / (settings.drift_band_m + eps));
  EXPECT_GE(m.drift_settle_s, drift_exact - 1e-9);
  EXPECT_LT(m.drift_settle_s, drift_exact + kDt);
  // The peak excursion is the jump to A at t = 2.000 s; the decay falls through its tail mean
  // within the tail, so the only rebound is the mean less the last sample: of order 1e-4 % here,
  // for a decay that never turns back.
  const double peak_rad = d.Tilt(TimeOf(1999)) - tilt_final;
  const double rebound_rad = tilt_final - d.Tilt(TimeOf(last));
  EXPECT_NEAR(m.tilt_rebound_pct, 100 * rebound_rad / peak_rad, 1e-9);
  EXPECT_NEAR(m.tilt_rebound_deg, rebound_rad * kDeg, 1e-12);
  EXPECT_LT(m.tilt_rebound_pct, 1e-3);
}

// Tilt A e^{−a s} sin ωs after the disturbance at t_d, s = t − t_d, with ω = 2π·1.3 rad/s.
struct DampedSwing {
  double start_s = 1.0, a_rad = 0.3, a = 1.5, w = 2 * std::numbers::pi * 1.3;
  double operator()(double t) const {
    const double s = t - start_s;
    return s < 0 ? 0 : a_rad * std::exp(-a * s) * std::sin(w * s);
  }
  // Its extrema: t₁ = atan(ω/a)/ω and every π/ω after, each e^{−aπ/ω} times the one before (see
  // step_response_test): the first peak and the opposite one after it.
  double FirstPeak() const {
    const double t1 = std::atan(w / a) / w;
    return a_rad * std::exp(-a * t1) * std::sin(w * t1);
  }
  double SecondPeak() const { return FirstPeak() * std::exp(-a * std::numbers::pi / w); }
  // Sampling lowers each peak by at most ½|y''| dt², relative 0.5 (ω+a)² dt² √(a²+ω²)/ω each;
  // twice that bounds the relative error of a ratio of two peaks.
  double RatioTolerance() const {
    return 2 * 0.5 * (w + a) * (w + a) * kDt * kDt * std::sqrt(a * a + w * w) / w;
  }
};

TEST(MetricRecorder, ReboundOfADampedOscillationIsTheHalfPeriodDecay) {
  // Against the final value f (the window's tail mean) the peak excursion is p₁ − f and the
  // rebound past f on the other side p₂ + f.
  const DampedSwing tilt;
  const RunMetrics m = TiltOnlyRun(tilt, tilt.start_s);
  const double f = FinalValue(tilt, 4999, 4.0);  // the window [1, 5] s ends at sample 4999
  const double p1 = tilt.FirstPeak(), p2 = tilt.SecondPeak();
  const double expected = 100 * (p2 + f) / (p1 - f);
  EXPECT_NEAR(m.tilt_rebound_pct, expected, expected * tilt.RatioTolerance());
  EXPECT_NEAR(m.tilt_rebound_deg, (p2 + f) * kDeg, (p2 + f) * kDeg * tilt.RatioTolerance());
}

TEST(MetricRecorder, WorstDisturbanceIsReported) {
  Decay first, second;
  first.start_s = 1.0;
  first.tau_s = 0.2;
  second.start_s = 5.5;
  second.tau_s = 0.4;
  MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {first.start_s, second.start_s});
  Feed(&recorder, 10000, [&](long, double t) {
    StepSample s;
    s.tilt_rad = first.Tilt(t) + second.Tilt(t);
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // The slower decay sets the figure: τ ln(A / (band + final)), window [5.5, 9.5] s.
  const double band_rad = 1.0 / kDeg;
  const double final_rad = FinalValue([&](double t) { return second.Tilt(t); }, 9499, 4.0);
  const double slow = second.tau_s * std::log(second.a_rad / (band_rad + final_rad));
  EXPECT_GE(m.tilt_settle_s, slow - 1e-9);
  EXPECT_LT(m.tilt_settle_s, slow + kDt);
}

TEST(MetricRecorder, WindowPastTheEndIsJudgedIfHalfOfItIsThere) {
  // Duration 10 s, window 4 s: a disturbance at 7.5 s has 2.5 s of its window; one at 8.5 s
  // only 1.5 s and is skipped.
  Decay late;
  late.start_s = 7.5;
  late.tau_s = 0.25;
  {
    MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {late.start_s});
    Feed(&recorder, 10000, [&](long, double t) { return late.Sample(t); });
    const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
    const double band_rad = 1.0 / kDeg;
    const double final_rad = FinalValue([&](double t) { return late.Tilt(t); }, 9999, 4.0);
    const double exact = late.tau_s * std::log(late.a_rad / (band_rad + final_rad));
    EXPECT_GE(m.tilt_settle_s, exact - 1e-9);
    EXPECT_LT(m.tilt_settle_s, exact + kDt);
  }
  Decay too_late = late;
  too_late.start_s = 8.5;
  {
    MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {too_late.start_s});
    Feed(&recorder, 10000, [&](long, double t) { return too_late.Sample(t); });
    const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
    EXPECT_TRUE(std::isnan(m.tilt_settle_s));
    EXPECT_TRUE(std::isnan(m.drift_settle_s));
    EXPECT_TRUE(std::isnan(m.tilt_rebound_deg));
    EXPECT_TRUE(std::isnan(m.tilt_rebound_pct));
  }
  {
    // With an earlier disturbance judged, the skipped one does not blank the figures.
    const Decay early;  // at 2 s, τ = 0.3 s
    MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {early.start_s, too_late.start_s});
    Feed(&recorder, 10000, [&](long, double t) {
      StepSample s;
      s.tilt_rad = early.Tilt(t) + too_late.Tilt(t);
      return s;
    });
    const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
    const double final_rad = FinalValue([&](double t) { return early.Tilt(t); }, 5999, 4.0);
    const double exact = early.tau_s * std::log(early.a_rad / (1.0 / kDeg + final_rad));
    EXPECT_GE(m.tilt_settle_s, exact - 1e-9);
    EXPECT_LT(m.tilt_settle_s, exact + kDt);
  }
}

TEST(MetricRecorder, FallLeavesSettlingUnjudged) {
  const Decay d;
  MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {d.start_s});
  Feed(&recorder, 7000, [&](long, double t) { return d.Sample(t); });
  const RunMetrics m = recorder.Finish(RunStatus::kFell, "fell at t = 7.000 s");
  EXPECT_EQ(m.status, RunStatus::kFell);
  EXPECT_DOUBLE_EQ(m.fall_time_s, TimeOf(6999));
  EXPECT_DOUBLE_EQ(m.end_time_s, TimeOf(6999));
  EXPECT_TRUE(std::isnan(m.tilt_settle_s));
  EXPECT_TRUE(std::isnan(m.drift_settle_s));
  EXPECT_TRUE(std::isnan(m.tilt_rebound_deg));
  EXPECT_TRUE(std::isnan(m.tilt_rebound_pct));
  EXPECT_NEAR(m.max_tilt_deg, d.a_rad * kDeg, 1e-9);  // running figures still reported
}

TEST(MetricRecorder, SignalThatNeverSettlesIsNaN) {
  // A sustained oscillation 0.1 cos 2πs rad after t_d = 1 s: at the window's end (s = 4) it is at
  // 0.1 rad, far outside 1° of its tail mean.
  const double start_s = 1.0;
  MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {start_s, 6.0});
  Feed(&recorder, 10000, [&](long, double t) {
    StepSample s;
    s.tilt_rad = t < start_s || t > 5.5 ? 0 : 0.1 * std::cos(2 * std::numbers::pi * (t - start_s));
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  // The second disturbance (at 6 s, nothing happens) settles at once; the first does not, and
  // one unsettled disturbance makes the figure NaN rather than the settled one's 0.
  EXPECT_TRUE(std::isnan(m.tilt_settle_s));
  EXPECT_EQ(m.drift_settle_s, 0);
  EXPECT_FALSE(std::isnan(m.tilt_rebound_pct));
}

TEST(MetricRecorder, RunThatStopsShortOfItsDurationDidNotSettle) {
  const Decay d;
  MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {d.start_s});
  Feed(&recorder, 4000, [&](long, double t) { return d.Sample(t); });  // data end at 4 s
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  EXPECT_TRUE(std::isnan(m.tilt_settle_s));
  EXPECT_TRUE(std::isnan(m.drift_settle_s));
}

TEST(MetricRecorder, NoDisturbanceMeansNoSettlingFigures) {
  MetricRecorder recorder(MetricSettings{}, kDt, 2.0, {});
  Feed(&recorder, 2000, [&](long, double t) {
    StepSample s;
    s.tilt_rad = 0.001 * std::sin(t);
    return s;
  });
  const RunMetrics m = recorder.Finish(RunStatus::kOk, "survived");
  EXPECT_TRUE(std::isnan(m.tilt_settle_s));
  EXPECT_TRUE(std::isnan(m.drift_settle_s));
  EXPECT_TRUE(std::isnan(m.tilt_rebound_deg));
  EXPECT_TRUE(std::isnan(m.tilt_rebound_pct));
}

TEST(MetricRecorder, FaultedRunHasNoFallTimeNorSettling) {
  const Decay d;
  MetricRecorder recorder(MetricSettings{}, kDt, 10.0, {d.start_s});
  Feed(&recorder, 10000, [&](long, double t) { return d.Sample(t); });
  const RunMetrics m = recorder.Finish(RunStatus::kControllerFault, "output not finite");
  EXPECT_EQ(m.status, RunStatus::kControllerFault);
  EXPECT_EQ(m.message, "output not finite");
  EXPECT_TRUE(std::isnan(m.fall_time_s));
  EXPECT_TRUE(std::isnan(m.tilt_settle_s));
}

TEST(MetricRecorder, ATinyFirstExcursionDoesNotInflateTheRebound) {
  // Before the swing takes hold tilt dips just out of the 1° band: −1.2° over 40 ms, then the
  // damped swing. Measured from that dip, the swing would read as a rebound of over 1000 %;
  // measured from the peak excursion it is the swing's own decay, and never above 100 %.
  DampedSwing swing;
  const double dip_s = 0.04, dip_rad = 1.2 / kDeg;
  const auto tilt = [&](double t) {
    const double s = t - 1.0;
    if (s < 0) return 0.0;
    if (s < dip_s) return -dip_rad * std::sin(std::numbers::pi * s / dip_s);
    return swing(t - dip_s);
  };
  const RunMetrics m = TiltOnlyRun(tilt, 1.0);
  const double f = FinalValue(tilt, 4999, 4.0);
  const double p1 = swing.FirstPeak(), p2 = swing.SecondPeak();
  ASSERT_GT(p1 / dip_rad, 5);  // the dip is small beside the swing
  const double expected = 100 * (p2 + f) / (p1 - f);
  EXPECT_NEAR(m.tilt_rebound_pct, expected, expected * swing.RatioTolerance());
  EXPECT_LE(m.tilt_rebound_pct, 100);
}

TEST(MetricRecorder, TiltThatNeverLeavesTheBandHasNoRebound) {
  // A swing of 0.8° peak, inside the 1° band: the rebound is 0 and 0, not the swing's ratio.
  DampedSwing swing;
  swing.a_rad = 0.8 / kDeg / (swing.FirstPeak() / swing.a_rad);
  const RunMetrics m = TiltOnlyRun(swing, swing.start_s);
  EXPECT_NEAR(m.max_tilt_deg, 0.8, 1e-3);
  EXPECT_EQ(m.tilt_rebound_deg, 0);
  EXPECT_EQ(m.tilt_rebound_pct, 0);
}

}  // namespace
}  // namespace upright::runner
