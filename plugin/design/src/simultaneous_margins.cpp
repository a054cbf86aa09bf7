// Margins of a loop perturbed on several inputs at once: the perturbed loop is the matrix family
// M(c) = M0 + c M1 (c the common factor on the perturbed inputs), scanned in c for the changes of
// stability, and the multi-loop disk margin from the H-infinity norm of S − ½ I.
#include "upright/design/simultaneous_margins.hpp"

#include <Eigen/Eigenvalues>
#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <optional>
#include <string>

#include "analysis_frequency.hpp"
#include "upright/base/number_text.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXcd;
using Eigen::MatrixXd;
using internal::Complex;
using internal::kInf;
using internal::kNaN;

constexpr double kPi = std::numbers::pi;
constexpr double kRadToDeg = 180.0 / kPi;

// The scans (see simultaneous_margins.hpp): gain steps, their range, the phase step, and the
// bisection's end.
constexpr double kGainRatio = 1.02;
constexpr double kGainRange = 1e6;
constexpr double kPhaseStep = 0.5 * kPi / 180;
constexpr int kBisections = 60;

// The perturbed loop M(c) = M0 + c M1: c on the inputs J, the other inputs closed as they are.
struct Family {
  MatrixXd M0, M1;
  bool sampled = false;
  double period_s = 0;
  double scale = 1;  // the largest closed-loop pole's modulus (continuous), for tolerances
};

// A pole counts as unstable within a relative 1e-12 of the boundary (as the loop-at-a-time
// margins count it).
int UnstableCount(const Family& f, const Eigen::VectorXcd& poles) {
  int count = 0;
  for (const Complex& p : poles) {
    if (f.sampled ? std::abs(p) >= 1 - 1e-12 : p.real() >= -1e-12 * f.scale) ++count;
  }
  return count;
}

Eigen::VectorXcd PolesAt(const Family& f, Complex c) {
  if (c.imag() == 0) {
    const std::optional<Eigen::VectorXcd> poles = internal::Eigenvalues(f.M0 + c.real() * f.M1);
    if (poles) return *poles;
    return Eigen::VectorXcd::Constant(f.M0.rows(), Complex(kNaN, kNaN));
  }
  const MatrixXcd m = f.M0.cast<Complex>() + c * f.M1.cast<Complex>();
  Eigen::ComplexEigenSolver<MatrixXcd> solver(m, false);
  if (solver.info() != Eigen::Success) {
    return Eigen::VectorXcd::Constant(f.M0.rows(), Complex(kNaN, kNaN));
  }
  return solver.eigenvalues();
}

// A NaN pole (a failed eigenvalue computation) counts as unstable.
int UnstableAt(const Family& f, Complex c) {
  const Eigen::VectorXcd poles = PolesAt(f, c);
  int count = UnstableCount(f, poles);
  for (const Complex& p : poles) count += std::isnan(p.real()) ? 1 : 0;
  return count;
}

// The frequency, rad/s, of the pole nearest the stability boundary at c (signed: a complex c
// moves single poles, not pairs).
double BoundaryFrequency(const Family& f, Complex c) {
  const Eigen::VectorXcd poles = PolesAt(f, c);
  double best = kInf, omega = kNaN;
  for (const Complex& p : poles) {
    const double distance = f.sampled ? std::abs(std::abs(p) - 1) : std::abs(p.real());
    if (distance < best) {
      best = distance;
      omega = f.sampled ? std::arg(p) / f.period_s : p.imag();
    }
  }
  return omega;
}

// A gain margin: k stepped from 1 by `ratio` (> 1 upwards, < 1 downwards) until the loop is
// unstable, then the boundary bisected. nullopt when it stays stable over the range.
struct Boundary {
  double at;
  double omega;
};
std::optional<Boundary> GainBoundary(const Family& f, double ratio) {
  double stable = 1;
  for (double k = ratio; k <= kGainRange && k >= 1 / kGainRange; k *= ratio) {
    if (UnstableAt(f, k) == 0) {
      stable = k;
      continue;
    }
    double unstable = k;
    for (int i = 0; i < kBisections && std::abs(unstable / stable - 1) > 1e-12; ++i) {
      const double middle = std::sqrt(stable * unstable);
      (UnstableAt(f, middle) == 0 ? stable : unstable) = middle;
    }
    return Boundary{stable, std::abs(BoundaryFrequency(f, stable))};
  }
  return std::nullopt;
}

// Every φ in (0, 2π) at which a pole of M(e^{−jφ}) crosses the stability boundary, with its
// (signed) frequency.
std::vector<Boundary> PhaseCrossings(const Family& f) {
  std::vector<Boundary> crossings;
  const auto count_at = [&f](double phi) { return UnstableAt(f, std::polar(1.0, -phi)); };
  const int steps = static_cast<int>(std::ceil(2 * kPi / kPhaseStep));
  int previous_count = 0;
  double previous = 0;
  for (int i = 1; i <= steps; ++i) {
    const double phi = std::min(2 * kPi, i * kPhaseStep);
    const int count = count_at(phi);
    if (count != previous_count) {
      double same = previous, other = phi;
      for (int b = 0; b < kBisections && other - same > 1e-14; ++b) {
        const double middle = 0.5 * (same + other);
        (count_at(middle) == previous_count ? same : other) = middle;
      }
      crossings.push_back({same, BoundaryFrequency(f, std::polar(1.0, -same))});
    }
    previous_count = count;
    previous = phi;
  }
  return crossings;
}

// The disk fields from α (σ = 0): gains (2 − α)/(2 + α) to (2 + α)/(2 − α), phase 2 atan(α/2).
void SetDisk(double alpha, LoopMargins* m) {
  m->disk_alpha = alpha;
  m->disk_gain_low = std::max(0.0, (2 - alpha) / (2 + alpha));
  m->disk_gain_high = alpha < 2 ? (2 + alpha) / (2 - alpha) : kInf;
  m->disk_phase_deg = 2 * std::atan(alpha / 2) * kRadToDeg;
}

// The multi-loop disk margin over J from S_J − ½ I = (M0 − B_J C_J, B_J, −C_J, ½ I).
Status AddDiskMargin(const Family& f, const MatrixXd& b_j, const MatrixXd& c_j,
                     LoopMargins* result) {
  const Eigen::Index m = b_j.cols();
  StateSpace s_half{f.M0 + f.M1, b_j, -c_j, 0.5 * MatrixXd::Identity(m, m)};
  if (f.sampled) s_half = BilinearToContinuous(s_half);
  const AnalysisResult<NormPeak> norm = HinfNorm(s_half);
  if (!norm) return Failure("disk margin: " + norm.error().message);
  SetDisk(norm->norm > 0 ? 1 / norm->norm : kInf, result);
  double peak = norm->peak_rad_s;
  if (f.sampled && !std::isnan(peak)) {
    peak = (std::isinf(peak) ? kPi : 2 * std::atan(peak)) / f.period_s;
  }
  result->disk_rad_s = peak;
  return {};
}

}  // namespace

StateSpace BilinearToContinuous(const StateSpace& sampled) {
  // With W = (I + A)⁻¹: A_c = W (A − I), B_c = √2 W B, C_c = √2 C W, D_c = D − C W B.
  const Eigen::Index n = sampled.A.rows();
  const MatrixXd W = (MatrixXd::Identity(n, n) + sampled.A).partialPivLu().inverse();
  StateSpace c;
  c.A = W * (sampled.A - MatrixXd::Identity(n, n));
  c.B = std::sqrt(2.0) * W * sampled.B;
  c.C = std::sqrt(2.0) * sampled.C * W;
  c.D = sampled.D - sampled.C * W * sampled.B;
  return c;
}

AnalysisResult<LoopMargins> PerturbedMargins(const BrokenLoop& loop,
                                             const std::vector<int>& inputs) {
  LoopMargins result;
  const auto stopped = [&result](const std::string& why) {
    return Failure(AnalysisFailure<LoopMargins>{"PerturbedMargins: " + why, result});
  };
  const Eigen::Index n = loop.A.rows(), m = loop.B.cols();
  if (loop.A.cols() != n || loop.B.rows() != n || loop.C.rows() != m || loop.C.cols() != n) {
    return stopped("sizes disagree: A " + std::to_string(n) + "x" + std::to_string(loop.A.cols()) +
                   ", B " + std::to_string(loop.B.rows()) + "x" + std::to_string(m) + ", C " +
                   std::to_string(loop.C.rows()) + "x" + std::to_string(loop.C.cols()) +
                   " (need n×n, n×m, m×n)");
  }
  if (!(loop.period_s >= 0) || !std::isfinite(loop.period_s)) {
    return stopped("period_s must be finite and >= 0");
  }
  std::vector<bool> perturbed(static_cast<size_t>(m), false);
  for (int j : inputs) {
    if (j < 0 || j >= m || perturbed[static_cast<size_t>(j)]) {
      return stopped("input " + std::to_string(j) + " is not one of the " + std::to_string(m) +
                     " inputs, or is named twice");
    }
    perturbed[static_cast<size_t>(j)] = true;
  }
  if (inputs.empty()) return stopped("no input to perturb");
  // M(c) = A − B_rest C_rest − c B_J C_J.
  Family f;
  f.sampled = loop.sampled();
  f.period_s = loop.period_s;
  MatrixXd b_j(n, static_cast<Eigen::Index>(inputs.size()));
  MatrixXd c_j(static_cast<Eigen::Index>(inputs.size()), n);
  for (size_t i = 0; i < inputs.size(); ++i) {
    b_j.col(static_cast<Eigen::Index>(i)) = loop.B.col(inputs[i]);
    c_j.row(static_cast<Eigen::Index>(i)) = loop.C.row(inputs[i]);
  }
  f.M1 = -b_j * c_j;
  f.M0 = loop.A - loop.B * loop.C - f.M1;
  const Eigen::VectorXcd nominal = PolesAt(f, 1.0);
  f.scale = std::max(1e-300, nominal.size() > 0 ? nominal.cwiseAbs().maxCoeff() : 0.0);
  if (UnstableAt(f, 1.0) > 0) {
    return stopped(std::string("the closed loop is unstable") + (f.sampled ? " as sampled" : ""));
  }

  const std::optional<Boundary> high = GainBoundary(f, kGainRatio);
  const std::optional<Boundary> low = GainBoundary(f, 1 / kGainRatio);
  result.gain_high = high ? high->at : kInf;
  result.gain_high_rad_s = high ? high->omega : kNaN;
  result.gain_low = low ? low->at : 0.0;
  result.gain_low_rad_s = low ? low->omega : kNaN;

  result.phase_deg = kInf;
  result.delay_s = kInf;
  const double dc = 1e-10 * (f.sampled ? 1 / f.period_s : f.scale);
  for (const Boundary& b : PhaseCrossings(f)) {
    const double phase = std::min(b.at, 2 * kPi - b.at) * kRadToDeg;
    if (phase < result.phase_deg) {
      result.phase_deg = phase;
      result.phase_rad_s = std::abs(b.omega);
    }
    // e^{−jωτ} = e^{−jφ}: τ = φ / ω for ω > 0; a crossing at −ω is its mirror at 2π − φ.
    if (std::abs(b.omega) <= dc || std::isnan(b.omega)) continue;
    const double delay = (b.omega > 0 ? b.at : 2 * kPi - b.at) / std::abs(b.omega);
    if (delay < result.delay_s) {
      result.delay_s = delay;
      result.delay_rad_s = std::abs(b.omega);
    }
  }
  if (const Status disk = AddDiskMargin(f, b_j, c_j, &result); !disk) {
    return stopped(disk.error());
  }
  return result;
}

AnalysisResult<LoopMargins> SimultaneousMargins(const BrokenLoop& loop) {
  std::vector<int> all;
  for (Eigen::Index j = 0; j < loop.B.cols(); ++j) all.push_back(static_cast<int>(j));
  return PerturbedMargins(loop, all);
}

}  // namespace upright::design
