#include "upright/runner/metrics/metric_recorder.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <numbers>
#include <span>
#include <utility>

#include "upright/model/check.hpp"
#include "upright/model/conventions.hpp"
#include "upright/runner/metrics/step_response.hpp"

namespace upright::runner {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kDeg = 180.0 / std::numbers::pi;
// Sample indices computed from times are rounded with this slack (in samples), so a time that
// lands on a sample up to rounding counts as that sample.
constexpr double kIndexSlack = 1e-6;

double Mean(std::span<const double> y) {
  double sum = 0;
  for (double v : y) sum += v;
  return sum / static_cast<double>(y.size());
}

}  // namespace

MetricRecorder::MetricRecorder(const MetricSettings& settings, double dt_s, double duration_s,
                               std::vector<double> disturbance_starts_s)
    : settings_(settings),
      dt_s_(dt_s),
      duration_s_(duration_s),
      disturbances_s_(std::move(disturbance_starts_s)) {
  UPRIGHT_CHECK(dt_s > 0 && std::isfinite(dt_s), "dt_s = %g", dt_s);
  UPRIGHT_CHECK(duration_s >= 0 && std::isfinite(duration_s), "duration_s = %g", duration_s);
  UPRIGHT_CHECK(std::is_sorted(disturbances_s_.begin(), disturbances_s_.end()),
                "disturbance starts must be ascending");
  const auto capacity = static_cast<std::size_t>(std::ceil(duration_s / dt_s)) + 2;
  tilt_rad_.reserve(capacity);
  drift_m_.reserve(capacity);
}

void MetricRecorder::Add(const StepSample& s) {
  UPRIGHT_CHECK(samples_ == 0 || s.time_s > last_time_s_, "sample at t = %g after t = %g", s.time_s,
                last_time_s_);
  if (samples_ == 0) first_time_s_ = s.time_s;
  last_time_s_ = s.time_s;
  ++samples_;

  const double abs_tilt = std::abs(s.tilt_rad);
  max_tilt_rad_ = std::max(max_tilt_rad_, abs_tilt);
  sum_tilt2_ += s.tilt_rad * s.tilt_rad;
  sum_abs_tilt_ += abs_tilt;
  max_drift_m_ = std::max(max_drift_m_, std::abs(s.drift_m));

  bool slipping = false;
  for (int w = 0; w < 2; ++w) {
    effort_ += s.torque_Nm[w] * s.torque_Nm[w] * dt_s_;
    peak_torque_ = std::max(peak_torque_, std::abs(s.torque_Nm[w]));
    peak_current_ = std::max(peak_current_, std::abs(s.current_A[w]));
    energy_J_ += std::max(0.0, s.power_W[w]) * dt_s_;  // regeneration is not credited
    if (s.touching[w]) {
      const double slip = std::abs(s.slip_ratio[w]);
      max_slip_ = std::max(max_slip_, slip);
      slipping = slipping || slip > settings_.slip_threshold;
    }
  }
  if (slipping) ++slipping_steps_;
  if (s.saturated) ++saturated_steps_;
  if (s.command_at_limit) ++command_limited_steps_;

  // Within the capacity reserved up front push_back never allocates; beyond it, stop buffering.
  if (tilt_rad_.size() < tilt_rad_.capacity() && drift_m_.size() < drift_m_.capacity()) {
    tilt_rad_.push_back(s.tilt_rad);
    drift_m_.push_back(s.drift_m);
  }
}

RunMetrics MetricRecorder::Finish(RunStatus status, const std::string& message) const {
  RunMetrics m;
  m.status = status;
  m.message = message;
  if (samples_ == 0) return m;  // never stepped: every figure stays NaN
  const auto n = static_cast<double>(samples_);
  m.end_time_s = last_time_s_;
  if (status == RunStatus::kFell) m.fall_time_s = last_time_s_;
  m.max_tilt_deg = max_tilt_rad_ * kDeg;
  m.max_drift_m = max_drift_m_;
  m.rms_tilt_deg = std::sqrt(sum_tilt2_ / n) * kDeg;
  m.saturation_pct = 100.0 * static_cast<double>(saturated_steps_) / n;
  m.command_limit_pct = 100.0 * static_cast<double>(command_limited_steps_) / n;
  m.iae_tilt_deg_s = sum_abs_tilt_ * dt_s_ * kDeg;
  m.effort_Nm2s = effort_;
  m.peak_torque_Nm = peak_torque_;
  m.peak_current_A = peak_current_;
  m.max_slip_ratio = max_slip_;
  m.slip_time_s = static_cast<double>(slipping_steps_) * dt_s_;
  m.energy_J = energy_J_;
  if (status == RunStatus::kOk) JudgeSettling(&m);
  return m;
}

void MetricRecorder::JudgeSettling(RunMetrics* metrics) const {
  const std::size_t count = tilt_rad_.size();
  if (disturbances_s_.empty() || count == 0) return;
  const double window_s = settings_.window_s;
  const double tilt_band_rad = settings_.tilt_band_deg / kDeg;
  const auto time_of = [&](std::size_t i) {
    return first_time_s_ + static_cast<double>(i) * dt_s_;
  };
  const double data_end_s = time_of(count - 1);
  // Data that stop short of the run's normal end (and not because the buffer filled) mean the
  // run ended early: a window cut short by that cannot show settling.
  const bool truncated = static_cast<long>(count) < samples_;
  const bool ended_early = !truncated && data_end_s < duration_s_ - 0.5 * dt_s_;
  const auto final_count =
      static_cast<std::size_t>(std::max(1L, std::lround(0.1 * window_s / dt_s_)));

  bool judged = false, tilt_unsettled = false, drift_unsettled = false;
  double worst_tilt_s = 0, worst_drift_s = 0, worst_rebound_rad = 0, worst_rebound_pct = 0;
  for (double start_s : disturbances_s_) {
    const double end_s = start_s + window_s;
    // A window running past the data: cut short by an early end, it did not settle; past the
    // run's normal end, it is judged on what there is if that is at least half of it.
    const bool cut_short = end_s > data_end_s + 0.5 * dt_s_;
    if (cut_short && !ended_early && data_end_s - start_s < 0.5 * window_s) continue;
    const double first = std::max(0.0, std::ceil((start_s - first_time_s_) / dt_s_ - kIndexSlack));
    const double last = std::floor((end_s - first_time_s_) / dt_s_ + kIndexSlack);
    const auto i0 = static_cast<std::size_t>(first);
    const auto i1 = std::min(count - 1, static_cast<std::size_t>(std::max(0.0, last)));
    if (i0 > i1) continue;
    judged = true;
    if (cut_short && ended_early) tilt_unsettled = drift_unsettled = true;
    const std::size_t n = i1 - i0 + 1;
    const std::size_t tail = std::min(n, final_count);
    // From the disturbance's start to the window's first sample: under a step, 0 when they meet.
    double lag_s = time_of(i0) - start_s;
    if (lag_s < kIndexSlack * dt_s_) lag_s = 0;

    const std::span<const double> tilt(tilt_rad_.data() + i0, n);
    const double tilt_final = Mean(tilt.last(tail));
    const double tilt_s = SettlingTime(tilt, dt_s_, tilt_final, tilt_band_rad);
    tilt_unsettled = tilt_unsettled || std::isnan(tilt_s);
    if (!std::isnan(tilt_s)) worst_tilt_s = std::max(worst_tilt_s, tilt_s + lag_s);

    const std::span<const double> drift(drift_m_.data() + i0, n);
    const double drift_final = Mean(drift.last(tail));
    const double drift_s = SettlingTime(drift, dt_s_, drift_final, settings_.drift_band_m);
    drift_unsettled = drift_unsettled || std::isnan(drift_s);
    if (!std::isnan(drift_s)) worst_drift_s = std::max(worst_drift_s, drift_s + lag_s);

    // The rebound after the peak excursion; none when tilt never left the band.
    const Rebound rebound = PeakAndRebound(tilt, dt_s_, tilt_final);
    if (rebound.peak > tilt_band_rad) {
      worst_rebound_rad = std::max(worst_rebound_rad, rebound.rebound);
      worst_rebound_pct = std::max(worst_rebound_pct, rebound.rebound_pct);
    }
  }
  if (!judged) return;
  metrics->tilt_settle_s = tilt_unsettled ? kNaN : worst_tilt_s;
  metrics->drift_settle_s = drift_unsettled ? kNaN : worst_drift_s;
  metrics->tilt_rebound_deg = worst_rebound_rad * kDeg;
  metrics->tilt_rebound_pct = worst_rebound_pct;
}

}  // namespace upright::runner
