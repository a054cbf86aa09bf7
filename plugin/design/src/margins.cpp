// Stability margins of a SISO loop L(s) = C (sI − A)⁻¹ B + D under unit negative feedback, and of
// a state-feedback loop broken at each plant input. Crossover frequencies are solved for exactly,
// as imaginary-axis zeros of L(s) − L(−s) (phase crossovers) and of L(s) L(−s) − 1 (gain
// crossovers), polished by Newton's method and verified on L(jω).
#include <algorithm>
#include <cmath>
#include <numbers>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "upright/base/number_text.hpp"
#include "analysis_frequency.hpp"
#include "upright/design/analysis.hpp"

namespace upright::design {
namespace {

using internal::Complex;
using internal::kInf;
using internal::kNaN;

constexpr double kRadToDeg = 180.0 / std::numbers::pi;

// A candidate crossover is accepted when, after polishing, |Im L| ≤ kResidual |L| (phase
// crossover) or ||L|² − 1| ≤ 2 kResidual (gain crossover).
constexpr double kResidual = 1e-7;

// A gain factor k at which k L has a closed-loop pole on the imaginary axis at ω (0 for a real
// pole through the origin, inf for a pole through infinity when 1 + k D = 0).
struct CriticalGain {
  double k;
  double omega;
};

// A − k B C / (1 + k D): the closed loop of k L under unit negative feedback; nullopt when
// 1 + k D = 0 (not well posed).
std::optional<Eigen::MatrixXd> ClosedLoop(const StateSpace& l, double k) {
  const double denominator = 1 + k * l.D(0, 0);
  if (std::abs(denominator) <= 1e-14 * (1 + std::abs(k * l.D(0, 0)))) return std::nullopt;
  return Eigen::MatrixXd(l.A - (k / denominator) * l.B * l.C);
}

bool IsStable(const StateSpace& l, double k) {
  const std::optional<Eigen::MatrixXd> a = ClosedLoop(l, k);
  return a && !internal::UnstableEigenvalue(*a);
}

// L(s) − L(−s) = [C C] (sI − diag(A, −A))⁻¹ [B; B]: zero on the imaginary axis exactly where
// L(jω) is real.
StateSpace OddPart(const StateSpace& l) {
  const Eigen::Index n = l.A.rows();
  StateSpace g;
  g.A = Eigen::MatrixXd::Zero(2 * n, 2 * n);
  g.A.topLeftCorner(n, n) = l.A;
  g.A.bottomRightCorner(n, n) = -l.A;
  g.B.resize(2 * n, 1);
  g.B << l.B, l.B;
  g.C.resize(1, 2 * n);
  g.C << l.C, l.C;
  g.D = Eigen::MatrixXd::Zero(1, 1);
  return g;
}

// L(s) L(−s) − 1, with L(−s) realised by (−A, −B, C, D) feeding L: zero on the imaginary axis
// exactly where |L(jω)| = 1.
StateSpace UnitGainGap(const StateSpace& l) {
  const Eigen::Index n = l.A.rows();
  const double d = l.D(0, 0);
  StateSpace g;
  g.A = Eigen::MatrixXd::Zero(2 * n, 2 * n);
  g.A.topLeftCorner(n, n) = l.A;
  g.A.topRightCorner(n, n) = l.B * l.C;
  g.A.bottomRightCorner(n, n) = -l.A;
  g.B.resize(2 * n, 1);
  g.B << l.B * d, -l.B;
  g.C.resize(1, 2 * n);
  g.C << l.C, d * l.C;
  g.D = Eigen::MatrixXd::Constant(1, 1, d * d - 1);
  return g;
}

// Candidate frequencies ω ≥ 0 of the zeros of a SISO system on the imaginary axis: eigenvalues of
// A − B C / D when D is clearly non-zero, otherwise finite eigenvalues of the Rosenbrock pencil
// [A B; C D] − s diag(I, 0). nullopt if the eigenvalue computation fails.
std::optional<std::vector<double>> ImaginaryAxisZeros(const StateSpace& g, double scale) {
  const Eigen::Index n = g.A.rows();
  const double d = g.D(0, 0);
  std::optional<Eigen::VectorXcd> zeros;
  if (std::abs(d) > 1e-8 * std::max({1.0, g.B.norm() * g.C.norm() / std::max(scale, 1e-300)})) {
    zeros = internal::Eigenvalues(g.A - g.B * g.C / d);
  } else {
    Eigen::MatrixXd m(n + 1, n + 1);
    m << g.A, g.B, g.C, g.D;
    Eigen::MatrixXd e = Eigen::MatrixXd::Zero(n + 1, n + 1);
    e.topLeftCorner(n, n).setIdentity();
    zeros = internal::FinitePencilEigenvalues(m, e);
  }
  if (!zeros) return std::nullopt;
  return internal::NearImaginaryAxis(*zeros, scale);
}

// A real function of the loop's response whose zeros are crossovers: its value, its slope in ω,
// and the size against which the value counts as zero.
struct Residual {
  double value;
  double slope;
  double scale;
};

// Im L(jω) (zero at a phase crossover), judged relative to |L|.
Residual ImaginaryPart(const std::pair<Complex, Complex>& at) {
  return {at.first.imag(), at.second.imag(), std::abs(at.first)};
}

// (|L(jω)|² − 1)/2 (zero at a gain crossover, close to |L| − 1 there) and its slope
// Re(conj(L) dL/dω).
Residual SquaredGainGap(const std::pair<Complex, Complex>& at) {
  return {0.5 * (std::norm(at.first) - 1), (std::conj(at.first) * at.second).real(), 1.0};
}

// Newton's method on a residual from ω0 ≥ 0, keeping the best iterate. Returns ω when
// |value| ≤ kResidual · scale there, else nullopt (the candidate was not a crossover).
template <typename ResidualOf>
std::optional<double> Polish(const StateSpace& l, double omega0, ResidualOf residual_of) {
  double omega = omega0;
  std::optional<std::pair<Complex, Complex>> at = internal::ResponseAndSlope(l, omega);
  if (!at) return std::nullopt;
  Residual f = residual_of(*at);
  for (int i = 0; i < 50 && f.value != 0 && f.slope != 0; ++i) {
    const double next = omega - f.value / f.slope;
    if (!std::isfinite(next) || next < 0) break;
    const std::optional<std::pair<Complex, Complex>> at_next = internal::ResponseAndSlope(l, next);
    if (!at_next) break;
    const Residual f_next = residual_of(*at_next);
    if (!(std::abs(f_next.value) < std::abs(f.value))) break;
    omega = next;
    f = f_next;
  }
  if (std::abs(f.value) <= kResidual * f.scale) return omega;
  return std::nullopt;
}

// Removes frequencies within a relative 1e-9 of a kept one (sorted input).
std::vector<double> Unique(std::vector<double> omegas) {
  std::sort(omegas.begin(), omegas.end());
  std::vector<double> unique;
  for (double w : omegas) {
    if (unique.empty() || w - unique.back() > 1e-9 * std::max(w, 1e-300)) unique.push_back(w);
  }
  return unique;
}

// The closed-loop eigenvalue of k L nearest the imaginary axis, as a frequency |Im λ|.
double BoundaryFrequency(const StateSpace& l, double k) {
  const std::optional<Eigen::MatrixXd> a = ClosedLoop(l, k);
  if (!a) return kInf;
  const std::optional<Eigen::VectorXcd> eigenvalues = internal::Eigenvalues(*a);
  if (!eigenvalues || eigenvalues->size() == 0) return kNaN;
  Eigen::Index nearest = 0;
  eigenvalues->real().cwiseAbs().minCoeff(&nearest);
  return std::abs((*eigenvalues)(nearest).imag());
}

// The stability boundary between a stable gain and an unstable one, by geometric bisection on
// closed-loop stability (used only when the crossover analysis missed a boundary).
CriticalGain BisectBoundary(const StateSpace& l, double k_stable, double k_unstable) {
  for (int i = 0; i < 200 && std::abs(k_unstable / k_stable - 1) > 1e-13; ++i) {
    const double middle = std::sqrt(k_stable * k_unstable);
    if (IsStable(l, middle)) {
      k_stable = middle;
    } else {
      k_unstable = middle;
    }
  }
  return {k_stable, BoundaryFrequency(l, k_stable)};
}

// The first critical gain in `ordered` (sorted away from 1, upwards or downwards) past which the
// loop is unstable, checked by closed-loop stability between consecutive critical gains; `step`
// (2 upwards, ½ downwards) sets the test point past the last one. nullopt when the loop stays
// stable.
std::optional<CriticalGain> FirstUnstable(const StateSpace& l,
                                          const std::vector<CriticalGain>& ordered, double step) {
  double previous = 1;
  for (std::size_t i = 0; i < ordered.size(); ++i) {
    const double k = ordered[i].k;
    if (std::abs(k / previous - 1) <= 1e-12) continue;
    // Between the previous gain and this one there is no critical gain: it must be stable.
    const double before = std::sqrt(previous * k);
    if (!IsStable(l, before)) return BisectBoundary(l, previous, before);
    const double next = i + 1 < ordered.size() ? ordered[i + 1].k : k * step;
    const double after = std::abs(next / k - 1) > 1e-12 ? std::sqrt(k * next) : k * std::sqrt(step);
    if (!IsStable(l, after)) return ordered[i];
    previous = k;
  }
  const double beyond = previous * step;
  if (!IsStable(l, beyond)) return BisectBoundary(l, previous, beyond);
  return std::nullopt;
}

// Fills the disk-margin fields from α.
void SetDisk(double alpha, LoopMargins* m) {
  m->disk_alpha = alpha;
  m->disk_gain_low = std::max(0.0, (2 - alpha) / (2 + alpha));
  m->disk_gain_high = alpha < 2 ? (2 + alpha) / (2 - alpha) : kInf;
  m->disk_phase_deg = 2 * std::atan(alpha / 2) * kRadToDeg;
}

// A SISO loop as the margin phases read it: its states balanced, closed under unit negative
// feedback (and stable), and the frequency scale of its open and closed poles.
struct ClosedSisoLoop {
  StateSpace l;
  Eigen::MatrixXd closed;  // A − B C / (1 + D)
  double scale = 0;        // a frequency scale for the imaginary-axis tests
  // Crossovers at or below this frequency count as DC.
  double dc_threshold() const { return 1e-10 * scale; }
};

// The loop checked (consistent sizes, one input and one output, 1 + D ≠ 0) and closed; a failure
// when it is not, or when the closed loop is unstable.
Result<ClosedSisoLoop> CloseSisoLoop(const StateSpace& loop) {
  ClosedSisoLoop c;
  c.l = loop;
  StateSpace& l = c.l;
  if (const Status valid = internal::CheckAndNormalise(&l); !valid) return Failure(valid.error());
  if (l.D.rows() != 1 || l.D.cols() != 1) {
    return Failure("the loop must have one input and one output, D is " +
                   std::to_string(l.D.rows()) + "×" + std::to_string(l.D.cols()));
  }
  internal::BalanceStates(&l);
  const std::optional<Eigen::MatrixXd> closed = ClosedLoop(l, 1.0);
  if (!closed) return Failure("1 + D = 0, the feedback loop is not well posed");
  if (const std::optional<Complex> lambda = internal::UnstableEigenvalue(*closed)) {
    return Failure("the closed loop is unstable, it has the eigenvalue " +
                   ComplexText(*lambda, 6));
  }
  c.closed = *closed;
  const Eigen::VectorXcd open_poles = internal::Eigenvalues(l.A).value_or(Eigen::VectorXcd());
  const Eigen::VectorXcd closed_poles = internal::Eigenvalues(*closed).value_or(Eigen::VectorXcd());
  if (open_poles.size() > 0) c.scale = std::max(c.scale, open_poles.cwiseAbs().maxCoeff());
  if (closed_poles.size() > 0) c.scale = std::max(c.scale, closed_poles.cwiseAbs().maxCoeff());
  return c;
}

// The gain factors at which the loop may gain a closed-loop pole on the imaginary axis: at DC, at
// infinity (1 + k D = 0) and at each phase crossover (L(jω) real and negative), the crossovers
// found as imaginary-axis zeros of L(s) − L(−s) and polished by Newton's method.
Result<std::vector<CriticalGain>> CriticalGains(const ClosedSisoLoop& c) {
  const StateSpace& l = c.l;
  const double d = l.D(0, 0);
  std::vector<CriticalGain> critical;
  if (const std::optional<std::pair<Complex, Complex>> at_dc = internal::ResponseAndSlope(l, 0.0);
      at_dc && at_dc->first.real() < 0) {
    critical.push_back({-1 / at_dc->first.real(), 0.0});
  }
  if (d < 0) critical.push_back({-1 / d, kInf});
  const std::optional<std::vector<double>> phase_candidates =
      l.A.rows() > 0 ? ImaginaryAxisZeros(OddPart(l), c.scale) : std::vector<double>();
  if (!phase_candidates) return Failure("the phase crossover eigenvalue problem failed");
  std::vector<double> phase_crossovers;
  for (double w : *phase_candidates) {
    if (w <= c.dc_threshold()) continue;
    if (const std::optional<double> polished = Polish(l, w, ImaginaryPart)) {
      phase_crossovers.push_back(*polished);
    }
  }
  for (double w : Unique(phase_crossovers)) {
    const Complex value = internal::ResponseAndSlope(l, w)->first;
    if (value.real() < 0) critical.push_back({-1 / value.real(), w});
  }
  return critical;
}

// Gain margins: of the critical gains, the first one in each direction past which the closed
// loop is actually unstable.
Status AddGainMargins(const ClosedSisoLoop& c, LoopMargins* result) {
  const Result<std::vector<CriticalGain>> critical = CriticalGains(c);
  if (!critical) return Failure(critical.error());
  std::vector<CriticalGain> above, below;
  for (const CriticalGain& g : *critical) (g.k > 1 ? above : below).push_back(g);
  std::sort(above.begin(), above.end(), [](auto a, auto b) { return a.k < b.k; });
  std::sort(below.begin(), below.end(), [](auto a, auto b) { return a.k > b.k; });
  const std::optional<CriticalGain> high = FirstUnstable(c.l, above, 2.0);
  const std::optional<CriticalGain> low = FirstUnstable(c.l, below, 0.5);
  result->gain_high = high ? high->k : kInf;
  result->gain_high_rad_s = high ? high->omega : kNaN;
  result->gain_low = low ? low->k : 0.0;
  result->gain_low_rad_s = low ? low->omega : kNaN;
  return {};
}

// The gain crossovers |L(jω)| = 1, as imaginary-axis zeros of L(s) L(−s) − 1 polished by
// Newton's method, those at or below the DC threshold at 0; sorted, without duplicates.
Result<std::vector<double>> GainCrossovers(const ClosedSisoLoop& c) {
  const StateSpace& l = c.l;
  const std::optional<std::vector<double>> gain_candidates =
      l.A.rows() > 0 ? ImaginaryAxisZeros(UnitGainGap(l), c.scale) : std::vector<double>();
  if (!gain_candidates) return Failure("the gain crossover eigenvalue problem failed");
  std::vector<double> gain_crossovers;
  for (double w : *gain_candidates) {
    if (const std::optional<double> polished = Polish(l, w, SquaredGainGap)) {
      gain_crossovers.push_back(*polished <= c.dc_threshold() ? 0.0 : *polished);
    }
  }
  return Unique(gain_crossovers);
}

// Phase and delay margins from the gain crossovers.
Status AddPhaseAndDelayMargins(const ClosedSisoLoop& c, LoopMargins* result) {
  const Result<std::vector<double>> crossovers = GainCrossovers(c);
  if (!crossovers) return Failure(crossovers.error());
  result->phase_deg = kInf;
  result->phase_rad_s = kNaN;
  result->delay_s = kInf;
  result->delay_rad_s = kNaN;
  for (double w : *crossovers) {
    const double phase = std::arg(internal::ResponseAndSlope(c.l, w)->first);  // (−π, π]
    const double margin_deg = 180 - std::abs(phase) * kRadToDeg;
    if (margin_deg < result->phase_deg) {
      result->phase_deg = margin_deg;
      result->phase_rad_s = w;
    }
    // A delay τ lags the phase by ωτ: it reaches −π after (φ + π) / ω. A delay does nothing at DC.
    if (w > 0) {
      const double delay = (phase + std::numbers::pi) / w;
      if (delay < result->delay_s) {
        result->delay_s = delay;
        result->delay_rad_s = w;
      }
    }
  }
  return {};
}

// Disk margin (σ = 0): α = 1 / ‖S − ½‖∞, S − ½ = (1 − L) / (2 (1 + L)), realised as
// (A − B C/(1 + D), B/(1 + D), −C/(1 + D), 1/(1 + D) − ½).
Status AddDiskMargin(const ClosedSisoLoop& c, LoopMargins* result) {
  const StateSpace& l = c.l;
  const double d = l.D(0, 0);
  const StateSpace s_half{c.closed, l.B / (1 + d), -l.C / (1 + d),
                          Eigen::MatrixXd::Constant(1, 1, 1 / (1 + d) - 0.5)};
  const AnalysisResult<NormPeak> disk = HinfNorm(s_half);
  if (!disk) return Failure("disk margin: " + disk.error().message);
  SetDisk(disk->norm > 0 ? 1 / disk->norm : kInf, result);
  result->disk_rad_s = disk->peak_rad_s;
  return {};
}

}  // namespace

AnalysisResult<LoopMargins> SisoMargins(const StateSpace& loop) {
  LoopMargins result;
  // A failure keeping the margins found so far.
  const auto stopped = [&result](const std::string& why) {
    return Failure(AnalysisFailure<LoopMargins>{"SisoMargins: " + why, result});
  };
  const Result<ClosedSisoLoop> closed = CloseSisoLoop(loop);
  if (!closed) return stopped(closed.error());
  if (const Status gain = AddGainMargins(*closed, &result); !gain) return stopped(gain.error());
  if (const Status phase = AddPhaseAndDelayMargins(*closed, &result); !phase) {
    return stopped(phase.error());
  }
  if (const Status disk = AddDiskMargin(*closed, &result); !disk) return stopped(disk.error());
  return result;
}

StateSpace InputSensitivity(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                            const Eigen::MatrixXd& K) {
  const bool sizes_agree =
      A.rows() == A.cols() && B.rows() == A.rows() && K.rows() == B.cols() && K.cols() == A.rows();
  return {sizes_agree ? Eigen::MatrixXd(A - B * K) : A, B, -K,
          Eigen::MatrixXd::Identity(K.rows(), K.rows())};
}

AnalysisResult<LoopMargins> InputMargins(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                         const Eigen::MatrixXd& K, int channel) {
  const auto stopped = [](std::string why) {
    return Failure(AnalysisFailure<LoopMargins>{std::move(why), LoopMargins{}});
  };
  const Eigen::Index n = A.rows();
  const Eigen::Index m = B.cols();
  if (A.cols() != n || B.rows() != n || K.rows() != m || K.cols() != n) {
    return stopped("InputMargins: sizes disagree: A " + std::to_string(A.rows()) + "×" +
                   std::to_string(A.cols()) + ", B " + std::to_string(B.rows()) + "×" +
                   std::to_string(B.cols()) + ", K " + std::to_string(K.rows()) + "×" +
                   std::to_string(K.cols()) + " (need n×n, n×m, m×n)");
  }
  if (channel < 0 || channel >= m) {
    return stopped("InputMargins: channel = " + std::to_string(channel) + ", must be in [0, " +
                   std::to_string(m) + ")");
  }
  // L_j(s) = K_j (sI − A + Σ_{i≠j} b_i K_i)⁻¹ b_j.
  const Eigen::MatrixXd b_j = B.col(channel);
  const Eigen::MatrixXd k_j = K.row(channel);
  AnalysisResult<LoopMargins> result =
      SisoMargins({A - B * K + b_j * k_j, b_j, k_j, Eigen::MatrixXd::Zero(1, 1)});
  if (!result) {
    result.error().message =
        "input channel " + std::to_string(channel) + ": " + result.error().message;
  }
  return result;
}

AnalysisResult<LoopMargins> WorstOf(const std::vector<AnalysisResult<LoopMargins>>& channels) {
  if (channels.empty()) {
    return Failure(AnalysisFailure<LoopMargins>{"no input channels", LoopMargins{}});
  }
  LoopMargins worst;
  for (size_t j = 0; j < channels.size(); ++j) {
    if (!channels[j]) return channels[j];
    const LoopMargins& c = *channels[j];
    if (j == 0) {
      worst = c;
      continue;
    }
    if (c.gain_low > worst.gain_low) {
      worst.gain_low = c.gain_low;
      worst.gain_low_rad_s = c.gain_low_rad_s;
    }
    if (c.gain_high < worst.gain_high) {
      worst.gain_high = c.gain_high;
      worst.gain_high_rad_s = c.gain_high_rad_s;
    }
    if (c.phase_deg < worst.phase_deg) {
      worst.phase_deg = c.phase_deg;
      worst.phase_rad_s = c.phase_rad_s;
    }
    if (c.delay_s < worst.delay_s) {
      worst.delay_s = c.delay_s;
      worst.delay_rad_s = c.delay_rad_s;
    }
    if (c.disk_alpha < worst.disk_alpha) {
      SetDisk(c.disk_alpha, &worst);
      worst.disk_rad_s = c.disk_rad_s;
    }
  }
  return worst;
}

AnalysisResult<LoopMargins> WorstInputMargins(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                              const Eigen::MatrixXd& K) {
  std::vector<AnalysisResult<LoopMargins>> channels;
  for (Eigen::Index j = 0; j < B.cols(); ++j) {
    channels.push_back(InputMargins(A, B, K, static_cast<int>(j)));
  }
  AnalysisResult<LoopMargins> worst = WorstOf(channels);
  if (B.cols() == 0) worst.error().message = "WorstInputMargins: B has no columns";
  return worst;
}

}  // namespace upright::design
