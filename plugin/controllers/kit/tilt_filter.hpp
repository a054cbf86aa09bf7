// Tilt filter (internal to the built-in modules): each tick's pitch rate from the gyro and the
// pitch the accelerometer reads in; the pitch and the gyro's bias out. A complementary filter with
// an integral term (the planar case of the explicit complementary filter of R. Mahony, T. Hamel and
// J.-M. Pflimlin, "Nonlinear complementary filters on the special orthogonal group", IEEE
// Transactions on Automatic Control 53(5), 2008; from memory), discrete at the module's rate.
#pragma once

namespace upright::controllers {

// Each tick, with ω the gyro's mean rate over the tick and θ_a the accelerometer's pitch:
//   predict   θ⁻ = θ̂ + T (ω − b̂),
//   correct   θ̂ = θ⁻ + l₁ (θ_a − θ⁻),   b̂ = b̂ − (l₂ / T) (θ_a − θ⁻).
// With a true pitch that moves as the bias-free gyro says, the errors e = θ̂ − θ and
// Tβ = T (b − b̂) step as [e, Tβ]⁺ = M [e, Tβ], M = [[1 − l₁, 1 − l₁], [−l₂, 1 − l₂]]
// (trace 2 − l₁ − l₂, determinant 1 − l₁). The gains put M's eigenvalues at p₁ = exp(−T/τ)
// and p₂ = exp(−T/τ_b) — the continuous filter's poles −1/τ and −1/τ_b, mapped exactly:
//   l₁ = 1 − p₁p₂,  l₂ = (1 − p₁)(1 − p₂).
// So a constant gyro bias b, unknown at the start, is learnt as (p₁ ≠ p₂, k ticks)
//   b̂_k = b (1 − (p₁^(k+1) (1 − p₂) − p₂^(k+1) (1 − p₁)) / (p₁ − p₂)),
//   e_k = T b p₁p₂ (p₁^k − p₂^k) / (p₁ − p₂),
// and with p₁ = p₂ = p, b̂_k = b (1 − p^k (1 + k (1 − p))), e_k = T b k p^(k+1). For any
// τ_b ≥ τ, 5 τ_b leave about 4 % of b unlearnt at most (the double pole is the slowest case,
// e^(−5) (1 + 5) = 4.0 %; with τ_b = 2 τ, 1.3 %). A pitch seen by the accelerometer alone is
// approached as θ_a (1 − (p₁ p₂^k (1 − p₂) − p₂ p₁^k (1 − p₁)) / (p₁ − p₂)). With τ_b → ∞
// (l₂ = 0) it is the first-order complementary filter θ̂ = p₁ θ⁻ + (1 − p₁) θ_a.
//
// The gate: an accelerometer pitch more than `gate` from the prediction is no tilt the gyro
// missed over one tick but an acceleration the pitch reading did not allow for (a knock, a wheel
// that slips); that tick the filter keeps the prediction and the bias as they are. A disagreement
// that outlasts τ is no knock: from then on the corrections are taken again, until a reading
// falls inside the gate, so that a lost estimate comes back instead of being shut out for good.
//
// What it observes: the gyro's bias about the pitch axis, because the accelerometer's pitch is an
// absolute reference. It cannot tell an accelerometer bias from a tilt: a bias b_x on the forward
// axis reads as a pitch −b_x / g, standing still as in motion, and from these sensors at rest
// nothing distinguishes it (nor from an error in the centre of mass's forward position, which
// moves the pitch the robot balances at). The estimate then carries that error for good.
class TiltFilter {
 public:
  // `period_s` T, `tilt_time_constant_s` τ, `bias_time_constant_s` τ_b, `gate_rad`; all > 0.
  TiltFilter(double period_s, double tilt_time_constant_s, double bias_time_constant_s,
             double gate_rad);
  void Start(double pitch_rad);  // from the first sample: θ̂ = its pitch, b̂ = 0
  void Update(double gyro_rad_s, double accel_pitch_rad);
  bool gated() const { return gated_; }  // whether the latest Update dropped its correction
  double pitch_rad() const { return pitch_rad_; }
  double bias_rad_s() const { return bias_rad_s_; }
  double tilt_gain() const { return tilt_gain_; }  // l₁
  double bias_gain() const { return bias_gain_; }  // l₂

 private:
  double period_s_;
  double tilt_gain_, bias_gain_;
  double gate_rad_;
  long hold_ticks_;  // τ / T: the most ticks in a row the gate drops
  long gated_ticks_ = 0;
  bool gated_ = false;
  double pitch_rad_ = 0, bias_rad_s_ = 0;
};

}  // namespace upright::controllers
