// Speed filter (internal to the built-in modules): each tick's ground travel from the encoders and
// the axle's horizontal acceleration from the IMU in; the forward speed out, without the half
// period of lag and the quantisation a one-period encoder difference carries.
//
// Why a filter and not the encoders' difference: the encoders report whole counts at each tick,
// no count times, so a time-between-counts estimate is not possible through the module ABI; and
// the difference of two readings quantised in steps Δ has the variance of two uniform errors,
// 2 Δ²/12 (a uniform quantiser's error variance, W. R. Bennett, "Spectra of quantized signals",
// Bell System Technical Journal 27, 1948; from memory), over T²: σ = Δ / (T √6). On the tabletop
// robot one count is Δ = 2π · 0.035 m / 700 = 0.31 mm, T = 10 ms, so one count per tick is
// 0.031 m/s and σ = 0.013 m/s. The IMU measures the acceleration the difference lacks: the filter
// below integrates it and lets the encoders correct only its slow error, which takes σ down to
// 0.75 mm/s on that robot (tests/controllers/speed_filter_test.cpp).
#pragma once

namespace upright::controllers {

// The α-β gains of a steady-state Kalman filter for position and speed with the acceleration as a
// known input: Δ-quantised position measurements (σ_z² = Δ²/12) and an acceleration input with a
// white error σ_a over each tick (the piecewise-constant white acceleration model). With the
// tracking index λ = σ_a T² / σ_z (P. R. Kalata, "The tracking index: a generalized parameter for
// α-β and α-β-γ target trackers", IEEE Transactions on Aerospace and Electronic Systems 20(2),
// 1984; from memory):
//   α = −(λ² + 8λ − (λ + 4) √(λ² + 8λ)) / 8,   β = (λ² + 4λ − λ √(λ² + 8λ)) / 4.
struct SpeedGains {
  double position = 0;  // α
  double speed = 0;     // β (the speed moves by β / T per metre of innovation)

  // The gains for tracking index `lambda` (> 0).
  static SpeedGains ForTrackingIndex(double lambda);
  // The steady-state speed noise that white position noise of variance σ_z² leaves, as a ratio
  // to σ_z² / T²: 2β² / (α (4 − 2α − β)) (the α-β filter's velocity noise-reduction ratio, the
  // Lyapunov equation of its error dynamics solved in closed form).
  double SpeedNoiseRatio() const;
};

// x̂ and v̂ from the measured travel z and the acceleration a, each tick:
//   predict  v⁻ = v̂ + T (a₋ + a) / 2,  x⁻ = x̂ + T v̂ + T² (2 a₋ + a) / 6
//            (exact for an acceleration that changes linearly over the tick, a₋ the last one),
//   correct  x̂ = x⁻ + α (z − x⁻),  v̂ = v⁻ + (β / T) (z − x⁻).
class SpeedFilter {
 public:
  SpeedFilter(double period_s, const SpeedGains& gains);
  // From the first sample: its travel, speed and acceleration.
  void Start(double travel_m, double speed_m_s, double accel_m_s2);
  void Update(double travel_m, double accel_m_s2);
  double speed_m_s() const { return speed_m_s_; }
  double travel_m() const { return travel_m_; }
  // The acceleration at the latest tick: the input plus what the travel's correction added to the
  // speed over the tick, a + (β / T²) (z − x⁻).
  double accel_m_s2() const { return accel_m_s2_ + correction_m_s2_; }

 private:
  double period_s_;
  SpeedGains gains_;
  double travel_m_ = 0, speed_m_s_ = 0, accel_m_s2_ = 0, correction_m_s2_ = 0;
};

}  // namespace upright::controllers
