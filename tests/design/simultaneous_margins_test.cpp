// PerturbedMargins and SimultaneousMargins: the common-mode and multi-loop disk margins against
// closed forms derived by hand (the spinning body of [SPG2020], a first-order sampled loop),
// against the exact loop-at-a-time analysis (SisoMargins, InputMargins) on the same loops, and
// against brute-force frequency grids. Sources cited as [Key] are listed in tests/REFERENCES.md.
#include "upright/design/simultaneous_margins.hpp"

#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <limits>
#include <numbers>
#include <vector>

#include "demo_robot.hpp"
#include "spinning_body.hpp"
#include "succeeded.hpp"
#include "upright/design/design_set.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;
using Cd = std::complex<double>;
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kPi = std::numbers::pi;
constexpr double kDeg = 180 / kPi;

using testing::SpinningBody;

// k / (s³ + a2 s² + a1 s + a0) in companion form, as a one-input loop.
BrokenLoop ThirdOrder(double k, double a2, double a1, double a0) {
  BrokenLoop l;
  l.A = (MatrixXd(3, 3) << 0, 1, 0, 0, 0, 1, -a0, -a1, -a2).finished();
  l.B = Eigen::Vector3d(0, 0, 1);
  l.C = Eigen::RowVector3d(k, 0, 0);
  return l;
}

// σ̄(S(jω) − ½ I) of a continuous loop, S = (I + C (jωI − A)⁻¹ B)⁻¹, evaluated directly.
double SensitivityGap(const BrokenLoop& l, Cd s) {
  const Eigen::Index n = l.A.rows(), m = l.B.cols();
  Eigen::MatrixXcd resolvent = s * Eigen::MatrixXcd::Identity(n, n) - l.A.cast<Cd>();
  const Eigen::MatrixXcd loop = l.C.cast<Cd>() * resolvent.partialPivLu().solve(l.B.cast<Cd>());
  const Eigen::MatrixXcd sensitivity =
      (Eigen::MatrixXcd::Identity(m, m) + loop).partialPivLu().inverse();
  return Eigen::JacobiSVD<Eigen::MatrixXcd>(sensitivity - 0.5 * Eigen::MatrixXcd::Identity(m, m))
      .singularValues()(0);
}

// Brute force: 1 / max over a dense grid of σ̄(S − ½ I): ω log-spaced over [1e-3, 1e4] rad/s
// (continuous), or θ uniform over [0, π] on the unit circle (sampled). An upper bound on α.
double GridDiskAlpha(const BrokenLoop& l) {
  double peak = 0;
  constexpr int kPoints = 200000;
  for (int i = 0; i <= kPoints; ++i) {
    const double t = static_cast<double>(i) / kPoints;
    const Cd s = l.sampled() ? std::polar(1.0, kPi * t) : Cd(0, std::pow(10.0, -3 + 7 * t));
    peak = std::max(peak, SensitivityGap(l, s));
  }
  return 1 / peak;
}

TEST(SimultaneousMargins, SpinningBodyLoopAtATimeIsAnIntegrator) {
  // With the other loop closed each loop is 1/s (derived by hand: the closed loop is
  // 1/(s + 1) [1 a; −a 1]), so one input at a time has gain margins 0..inf, 90° at 1 rad/s, a
  // delay margin of π/2 s and α = 2 (|S − ½| = |(s − 1)/(2(s + 1))| = ½).
  for (int input : {0, 1}) {
    const AnalysisResult<LoopMargins> m = PerturbedMargins(SpinningBody(10), {input});
    ASSERT_TRUE(Succeeded(m));
    EXPECT_EQ(m->gain_low, 0);
    EXPECT_EQ(m->gain_high, kInf);
    EXPECT_NEAR(m->phase_deg, 90, 1e-9);
    EXPECT_NEAR(m->phase_rad_s, 1, 1e-9);
    EXPECT_NEAR(m->delay_s, kPi / 2, 1e-9);
    EXPECT_NEAR(m->disk_alpha, 2, 1e-8);
  }
}

TEST(SimultaneousMargins, SpinningBodyHasTheClosedFormMultiLoopDiskMargin) {
  // S − ½ I = ½ I − (I + aJ)/(s + 1), J = [0 1; −1 0], is normal with eigenvalues
  // ½ − (1 ± ja)/(s + 1); |·|² = (1 + (ω ± 2a)²) / (4 (1 + ω²)), whose largest value over ω is
  // f/4 with f = (2 + c² + c √(c² + 4)) / 2, c = 2a (the larger eigenvalue of [1 c; c 1 + c²]):
  // α = 2 / √f (derived by hand). For a = 10, α = 0.0997 with gains 0.905..1.105 and phase
  // ±5.7° in both loops at once ([SPG2020], the spinning body example; from memory).
  for (double a : {1.0, 10.0}) {
    const double c = 2 * a;
    const double alpha = 2 / std::sqrt((2 + c * c + c * std::sqrt(c * c + 4)) / 2);
    const AnalysisResult<LoopMargins> m = SimultaneousMargins(SpinningBody(a));
    ASSERT_TRUE(Succeeded(m));
    EXPECT_NEAR(m->disk_alpha, alpha, 1e-8 * alpha) << "a = " << a;
    if (a == 10) {
      EXPECT_NEAR(m->disk_alpha, 0.0997, 1e-4);  // the printed digits, truncated
      EXPECT_NEAR(m->disk_gain_low, 0.905, 5e-4);
      EXPECT_NEAR(m->disk_gain_high, 1.105, 5e-4);
      EXPECT_NEAR(m->disk_phase_deg, 5.7, 0.05);
    }
    // Independent of the norm computation: a dense grid of σ̄(S − ½ I) (an upper bound on α).
    const double grid = GridDiskAlpha(SpinningBody(a));
    EXPECT_LE(m->disk_alpha, grid * (1 + 1e-9));
    EXPECT_GE(m->disk_alpha, grid * (1 - 1e-4));
  }
}

TEST(SimultaneousMargins, SpinningBodyHasTheClosedFormCommonModeMargins) {
  // A − c B C = −c I + (1 − c) a J has the eigenvalues −c ± j a (1 − c) (derived by hand):
  //  - real c = k: −k ± j a (1 − k), stable for every k > 0, so gain margins 0..inf;
  //  - c = e^{−jφ}: Re = −cos φ ± a sin φ, first zero at φ = δ = atan(1/a), so the phase margin
  //    is δ, at ω = sin δ − a (1 − cos δ);
  //  - a delay: the crossing at φ = π + δ has ω = −(sin δ + a (1 + cos δ)), so a delay of
  //    (π − δ) / (sin δ + a (1 + cos δ)) puts a pole on the axis, earlier than the one at δ,
  //    δ / (sin δ − a (1 − cos δ)).
  for (double a : {1.0, 10.0}) {
    const double delta = std::atan(1 / a);
    const AnalysisResult<LoopMargins> m = SimultaneousMargins(SpinningBody(a));
    ASSERT_TRUE(Succeeded(m));
    EXPECT_EQ(m->gain_low, 0);
    EXPECT_EQ(m->gain_high, kInf);
    EXPECT_NEAR(m->phase_deg, delta * kDeg, 1e-9);
    EXPECT_NEAR(m->phase_rad_s, std::abs(std::sin(delta) - a * (1 - std::cos(delta))), 1e-9);
    const double fast = (kPi - delta) / (std::sin(delta) + a * (1 + std::cos(delta)));
    const double slow = delta / (std::sin(delta) - a * (1 - std::cos(delta)));
    EXPECT_NEAR(m->delay_s, slow > 0 ? std::min(fast, slow) : fast, 1e-9);
  }
}

TEST(SimultaneousMargins, OneInputLoopsAgreeWithTheExactSisoAnalysis) {
  // The scan against the crossover analysis of SisoMargins (exact crossovers, polished): the
  // third-order loops of the margin handbook checks ([Octave-control, margin.m] and [SPG2020]).
  for (const BrokenLoop& l : {ThirdOrder(24, 6, 11, 6), ThirdOrder(25, 10, 10, 10)}) {
    const AnalysisResult<LoopMargins> scanned = SimultaneousMargins(l);
    const AnalysisResult<LoopMargins> exact =
        SisoMargins({l.A, l.B, l.C, Eigen::MatrixXd::Zero(1, 1)});
    ASSERT_TRUE(Succeeded(scanned));
    ASSERT_TRUE(Succeeded(exact));
    EXPECT_NEAR(scanned->gain_high, exact->gain_high, 1e-9 * exact->gain_high);
    EXPECT_NEAR(scanned->gain_high_rad_s, exact->gain_high_rad_s, 1e-6);
    EXPECT_EQ(scanned->gain_low, exact->gain_low);
    EXPECT_NEAR(scanned->phase_deg, exact->phase_deg, 1e-9);
    EXPECT_NEAR(scanned->phase_rad_s, exact->phase_rad_s, 1e-8);
    EXPECT_NEAR(scanned->delay_s, exact->delay_s, 1e-9);
    EXPECT_NEAR(scanned->disk_alpha, exact->disk_alpha, 1e-9);
  }
}

TEST(SimultaneousMargins, RobotWheelsOneAtATimeAgreeWithInputMargins) {
  // Each design's loop broken at one wheel, scanned, against InputMargins' exact crossovers.
  for (const char* robot : {"courier.xml", "tabletop.xml"}) {
    const DesignSet d = DesignAll(Demo(robot), DesignRequest{});
    for (const Gain& K : {d.lqr.K, d.hinf.K}) {
      const BrokenLoop l{d.plant.A, d.plant.B, K};
      for (int wheel : {0, 1}) {
        const AnalysisResult<LoopMargins> scanned = PerturbedMargins(l, {wheel});
        const AnalysisResult<LoopMargins> exact = InputMargins(d.plant.A, d.plant.B, K, wheel);
        ASSERT_TRUE(Succeeded(scanned));
        ASSERT_TRUE(Succeeded(exact));
        EXPECT_NEAR(scanned->gain_low, exact->gain_low, 1e-9 * exact->gain_low) << robot;
        EXPECT_EQ(scanned->gain_high, exact->gain_high) << robot;
        EXPECT_NEAR(scanned->phase_deg, exact->phase_deg, 1e-8) << robot;
        EXPECT_NEAR(scanned->delay_s, exact->delay_s, 1e-9) << robot;
        EXPECT_NEAR(scanned->disk_alpha, exact->disk_alpha, 1e-8) << robot;
      }
    }
  }
}

TEST(SimultaneousMargins, BothWheelsAreNoBetterThanOneAndMatchABruteForceGrid) {
  // Perturbing both wheels includes perturbing one, so no simultaneous figure can beat the worst
  // wheel's (derived by hand); the multi-loop α against a dense grid; the common gain margin
  // against the closed loop A − k B K just inside and outside it.
  for (const char* robot : {"courier.xml", "tabletop.xml"}) {
    const DesignSet d = DesignAll(Demo(robot), DesignRequest{});
    const BrokenLoop l{d.plant.A, d.plant.B, d.hinf.K};
    const AnalysisResult<LoopMargins> both = SimultaneousMargins(l);
    ASSERT_TRUE(Succeeded(both));
    const LoopMargins& worst = d.hinf.loop.margins;
    EXPECT_GE(both->gain_low, worst.gain_low);
    EXPECT_LE(both->phase_deg, worst.phase_deg);
    EXPECT_LE(both->delay_s, worst.delay_s);
    EXPECT_LE(both->disk_alpha, worst.disk_alpha);
    const double grid = GridDiskAlpha(l);
    EXPECT_LE(both->disk_alpha, grid * (1 + 1e-9)) << robot;
    EXPECT_GE(both->disk_alpha, grid * (1 - 1e-4)) << robot;
    const auto stable = [&](double k) {
      return (l.A - k * l.B * l.C).eigenvalues().real().maxCoeff() < 0;
    };
    EXPECT_TRUE(stable(both->gain_low * (1 + 1e-9))) << robot;
    EXPECT_FALSE(stable(both->gain_low * (1 - 1e-9))) << robot;
  }
}

TEST(SimultaneousMargins, FirstOrderSampledLoopHasTheClosedForms) {
  // L(z) = g / (z − p), p = 0.9, g = 0.5, T = 0.01 s; the closed loop's pole is p − c g
  // (derived by hand):
  //  - real k: stable for −1 < p − k g < 1, so gain margins 0..(p + 1)/g = 3.8, at z = −1 (π/T);
  //  - |p − g e^{−jφ}| = 1 at cos φ = (p² + g² − 1) / (2 p g), the phase margin, where the pole
  //    z = p − g e^{−jφ} has the angle θ; the delay z^{−τ/T} = e^{−jθτ/T} reaches e^{−jφ} at
  //    τ = φ T / θ;
  //  - |S − ½| = |z − p − g| / (2 |z − p + g|) peaks at z = −1: α = 2 (1 + p − g)/(1 + p + g).
  const double p = 0.9, g = 0.5, T = 0.01;
  BrokenLoop l;
  l.A = MatrixXd::Constant(1, 1, p);
  l.B = MatrixXd::Constant(1, 1, 1);
  l.C = MatrixXd::Constant(1, 1, g);
  l.period_s = T;
  const AnalysisResult<LoopMargins> m = SimultaneousMargins(l);
  ASSERT_TRUE(Succeeded(m));
  EXPECT_EQ(m->gain_low, 0);
  EXPECT_NEAR(m->gain_high, (p + 1) / g, 1e-10);
  EXPECT_NEAR(m->gain_high_rad_s, kPi / T, 1e-6);
  const double phi = std::acos((p * p + g * g - 1) / (2 * p * g));
  const double theta = std::arg(p - g * std::polar(1.0, -phi));
  EXPECT_NEAR(m->phase_deg, phi * kDeg, 1e-9);
  EXPECT_NEAR(m->phase_rad_s, theta / T, 1e-6);
  EXPECT_NEAR(m->delay_s, phi * T / theta, 1e-11);
  EXPECT_NEAR(m->disk_alpha, 2 * (1 + p - g) / (1 + p + g), 1e-9);
  EXPECT_NEAR(m->disk_rad_s, kPi / T, 1e-3 / T);
  EXPECT_NEAR(m->disk_alpha, GridDiskAlpha(l), 1e-9);
}

TEST(SimultaneousMargins, BilinearMapKeepsTheResponseOnTheCircle) {
  // G(e^{jθ}) = G_c(j tan(θ/2)) for a sampled two-state system (the map's defining property).
  StateSpace sampled{(MatrixXd(2, 2) << 0.5, 0.2, -0.1, 0.8).finished(),
                     (MatrixXd(2, 1) << 1, 0.5).finished(), (MatrixXd(1, 2) << 0.3, -2).finished(),
                     MatrixXd::Constant(1, 1, 0.25)};
  const StateSpace c = BilinearToContinuous(sampled);
  for (double theta : {0.1, 1.0, 2.5}) {
    const Cd z = std::polar(1.0, theta), s(0, std::tan(theta / 2));
    const Eigen::MatrixXcd gz =
        sampled.C.cast<Cd>() *
            (z * Eigen::MatrixXcd::Identity(2, 2) - sampled.A.cast<Cd>()).inverse() *
            sampled.B.cast<Cd>() +
        sampled.D.cast<Cd>();
    const Eigen::MatrixXcd gs =
        c.C.cast<Cd>() * (s * Eigen::MatrixXcd::Identity(2, 2) - c.A.cast<Cd>()).inverse() *
            c.B.cast<Cd>() +
        c.D.cast<Cd>();
    EXPECT_LT(std::abs(gz(0, 0) - gs(0, 0)), 1e-12) << theta;
  }
}

TEST(SimultaneousMargins, RefusesBadInputAndUnstableLoops) {
  BrokenLoop l = SpinningBody(10);
  EXPECT_NE(FailureOf(PerturbedMargins(l, {2})).message.find("not one of the 2 inputs"),
            std::string::npos);
  EXPECT_NE(FailureOf(PerturbedMargins(l, {0, 0})).message.find("named twice"), std::string::npos);
  EXPECT_NE(FailureOf(PerturbedMargins(l, {})).message.find("no input"), std::string::npos);
  l.C = -l.C;  // positive feedback: A + C = [1 2a; −2a 1], eigenvalues 1 ± 2aj
  EXPECT_NE(FailureOf(SimultaneousMargins(l)).message.find("unstable"), std::string::npos);
  l.C = MatrixXd::Zero(3, 2);
  EXPECT_NE(FailureOf(SimultaneousMargins(l)).message.find("sizes disagree"), std::string::npos);
}

}  // namespace
}  // namespace upright::design
