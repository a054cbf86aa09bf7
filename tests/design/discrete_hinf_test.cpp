// Discrete-time H-infinity state feedback against its scalar closed form, the best static gain of
// a scalar loop, the discrete LQR as γ grows, the continuous design as the rate grows, and the
// closed loop's norm computed on the unit circle. The comparison with SciPy and SLICOT on the
// indefinite DARE is in scipy_riccati_test.py and slicot_riccati_test.cpp. Sources cited as [Key]
// are listed in tests/REFERENCES.md.
#include "upright/design/discrete_hinf.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <complex>
#include <cstdio>
#include <limits>
#include <string>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/discrete_norm.hpp"
#include "upright/design/sampled_loop.hpp"
#include "upright/design/weights.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

MatrixXd Scalar(double x) { return MatrixXd::Constant(1, 1, x); }

// x⁺ = a x + b1 w + b2 u, z = [x; u]. With G = b2² − b1²/γ² the game Riccati equation in
// [BB1995]'s form, X = 1 + a² X / (1 + G X), is G X² + (1 − G − a²) X − 1 = 0, whose positive
// root is X; the saddle point's u row is K = b2 a X / (1 + G X) (derived by hand from
// [w; u] = −(R̃ + B̃ᵀX B̃)⁻¹ B̃ᵀX a x, whose determinant is −γ² (1 + G X)).
struct ScalarGame {
  double a, b1, b2, gamma;
  double X() const {
    const double g = b2 * b2 - b1 * b1 / (gamma * gamma);
    const double c = 1 - g - a * a;
    return (-c + std::sqrt(c * c + 4 * g)) / (2 * g);
  }
  double K() const {
    const double g = b2 * b2 - b1 * b1 / (gamma * gamma);
    return b2 * a * X() / (1 + g * X());
  }
  Result<MatrixXd, SolveError> Design(MatrixXd* X = nullptr) const {
    return DiscreteHinfGain(Scalar(a), Scalar(b1), Scalar(b2), Scalar(1), Scalar(1), gamma, X);
  }
};

// ‖T_zw‖∞ of the scalar loop under u = −K x: x⁺ = p x + b1 w, p = a − b2 K, z = [1; −K] x, so
// |T(e^{jθ})| = √(1 + K²) |b1| / |e^{jθ} − p|, largest at the point of the circle nearest p:
// √(1 + K²) |b1| / (1 − |p|) (derived by hand); infinite when |p| ≥ 1.
double ScalarLoopNorm(const ScalarGame& s, double k) {
  const double p = s.a - s.b2 * k;
  return std::abs(p) < 1 ? std::sqrt(1 + k * k) * std::abs(s.b1) / (1 - std::abs(p))
                         : std::numeric_limits<double>::infinity();
}

// The smallest loop norm over static gains: a grid over the stabilising gains, |a − b2 K| < 1,
// then golden-section search around the best point. An independent value of γ_opt, since the
// state-feedback optimum is reached by a static gain ([BB1995], ch. 3; from memory).
double BestStaticNorm(const ScalarGame& s) {
  const double k_lo = (s.a - 1) / s.b2, k_hi = (s.a + 1) / s.b2;
  const double lo_k = std::min(k_lo, k_hi), hi_k = std::max(k_lo, k_hi);
  constexpr int kPoints = 100001;
  const double step = (hi_k - lo_k) / (kPoints - 1);
  int best = 1;
  for (int i = 1; i + 1 < kPoints; ++i) {
    if (ScalarLoopNorm(s, lo_k + i * step) < ScalarLoopNorm(s, lo_k + best * step)) best = i;
  }
  double lo = lo_k + (best - 1) * step, hi = lo_k + (best + 1) * step;
  const double ratio = (std::sqrt(5.0) - 1) / 2;
  for (int k = 0; k < 100; ++k) {
    const double x = hi - ratio * (hi - lo), y = lo + ratio * (hi - lo);
    if (ScalarLoopNorm(s, x) < ScalarLoopNorm(s, y)) {
      hi = y;
    } else {
      lo = x;
    }
  }
  return ScalarLoopNorm(s, 0.5 * (lo + hi));
}

TEST(DiscreteHinf, ScalarGainMatchesTheClosedForm) {
  // Values checked numerically with SciPy's solve_discrete_are on the indefinite form.
  for (const ScalarGame s :
       {ScalarGame{1.2, 0.5, 1, 3}, ScalarGame{0.5, 1, 1, 2}, ScalarGame{-0.8, 1, 0.5, 4}}) {
    MatrixXd X;
    const Result<MatrixXd, SolveError> k = s.Design(&X);
    ASSERT_TRUE(Succeeded(k)) << "a = " << s.a;
    EXPECT_NEAR(X(0, 0), s.X(), 1e-12 * s.X()) << "a = " << s.a;
    EXPECT_NEAR((*k)(0, 0), s.K(), 1e-12 * std::abs(s.K())) << "a = " << s.a;
    // The conditions hold: X ≥ 0, γ² − b1² X > 0, and the loop norm is below γ.
    EXPECT_GT(s.gamma * s.gamma - s.b1 * s.b1 * X(0, 0), 0);
    EXPECT_LT(ScalarLoopNorm(s, (*k)(0, 0)), s.gamma) << "a = " << s.a;
  }
  // a = 1.2, b1 = 0.5, b2 = 1, γ = 3: X = 1.973708003387099, K = 0.8114233361559159 (the closed
  // form above, evaluated; SciPy agrees to 1e-15).
  MatrixXd X;
  const Result<MatrixXd, SolveError> k = ScalarGame{1.2, 0.5, 1, 3}.Design(&X);
  ASSERT_TRUE(Succeeded(k));
  EXPECT_NEAR(X(0, 0), 1.973708003387099, 1e-12);
  EXPECT_NEAR((*k)(0, 0), 0.8114233361559159, 1e-12);
}

TEST(DiscreteHinf, ScalarOptimumIsTheBestStaticGainsNorm) {
  // γ_opt from the Riccati conditions must equal the smallest norm any static gain reaches. The
  // cases include optima at a deadbeat gain (p = 0: a = 1.2, b2 = 1 gives 0.5 √(1 + 1.44)) and
  // inside the stable range (a = 0.5, b2 = 0.1; a = 0.9, b2 = 0.2).
  for (const ScalarGame s : {ScalarGame{1.2, 0.5, 1, 0}, ScalarGame{0.5, 1, 0.1, 0},
                             ScalarGame{-0.8, 1, 0.5, 0}, ScalarGame{0.9, 0.3, 0.2, 0}}) {
    const double best = BestStaticNorm(s);
    const Result<GammaSearch, SolveError> search = DiscreteOptimalGamma(
        Scalar(s.a), Scalar(s.b1), Scalar(s.b2), Scalar(1), Scalar(1), 4 * best, 1e-9);
    ASSERT_TRUE(Succeeded(search)) << "a = " << s.a;
    EXPECT_NEAR(search->gamma_opt, best, 1e-7 * best) << "a = " << s.a << ", b2 = " << s.b2;
  }
  EXPECT_NEAR(BestStaticNorm({1.2, 0.5, 1, 0}), 0.5 * std::sqrt(1 + 1.44), 1e-9);
}

TEST(DiscreteHinf, InfeasibleGammaFailsWithTheConditionItBreaks) {
  // Just below γ_opt the scalar games break X ≥ 0 or γ² − b1² X > 0 (which one depends on the
  // case; checked numerically with SciPy).
  const ScalarGame concave{1.2, 0.5, 1, 0.7810249675906658 * 0.999};
  const SolveError concavity = FailureOf(concave.Design());
  EXPECT_EQ(concavity.reason, SolveFailure::kNotPositiveSemidefinite) << concavity.message;
  EXPECT_NE(concavity.message.find("discrete H-infinity at gamma = 0.780244"), std::string::npos)
      << concavity.message;
  EXPECT_NE(concavity.message.find("gamma² I − B1ᵀX B1 is not positive definite"),
            std::string::npos)
      << concavity.message;
  // Where the stabilising X is indefinite (SciPy returns X = −0.333 and −0.0745 there), the
  // doubling finds no solution that is stabilising or satisfies the equation: no design either
  // way, for a reason that is not the input's.
  for (const ScalarGame s : {ScalarGame{0.5, 1, 0.1, 1.9611613513818 * 0.999},
                             ScalarGame{0.9, 0.3, 0.2, 1.3416407864999 * 0.999}}) {
    const SolveError e = FailureOf(s.Design());
    EXPECT_NE(e.reason, SolveFailure::kInvalidInput) << e.message;
    EXPECT_NE(e.message.find("discrete H-infinity at gamma = "), std::string::npos) << e.message;
  }
}

TEST(DiscreteHinf, RefusesBadInput) {
  for (const double gamma : {0.0, -1.0, std::nan(""), HUGE_VAL}) {
    const SolveError e =
        FailureOf(DiscreteHinfGain(Scalar(0.5), Scalar(1), Scalar(1), Scalar(1), Scalar(1), gamma));
    EXPECT_EQ(e.reason, SolveFailure::kInvalidInput) << gamma;
    EXPECT_NE(e.message.find("must be finite and > 0"), std::string::npos) << e.message;
  }
  const SolveError r =
      FailureOf(DiscreteHinfGain(Scalar(0.5), Scalar(1), Scalar(1), Scalar(1), Scalar(-1), 2.0));
  EXPECT_EQ(r.reason, SolveFailure::kInvalidInput);
  EXPECT_NE(r.message.find("R is not positive definite"), std::string::npos) << r.message;
  const SolveError sizes = FailureOf(
      DiscreteHinfGain(Scalar(0.5), MatrixXd::Ones(2, 1), Scalar(1), Scalar(1), Scalar(1), 2.0));
  EXPECT_EQ(sizes.reason, SolveFailure::kInvalidInput) << sizes.message;
}

TEST(DiscreteHinf, GammaSearchChecksItsLowerBound) {
  // A push that barely reaches the output: γ_opt scales with b1 (X is that of b1 = 0 as
  // b1 → 0), far below 1e-6 × the upper bound, so the lower bound is feasible and the search
  // must say so rather than return it.
  const SolveError e = FailureOf(
      DiscreteOptimalGamma(Scalar(0.5), Scalar(1e-9), Scalar(1), Scalar(1), Scalar(1), 2.0));
  EXPECT_EQ(e.reason, SolveFailure::kInvalidInput);
  EXPECT_NE(e.message.find("the lower bound gamma = 2e-06"), std::string::npos) << e.message;
  EXPECT_NE(e.message.find("is feasible too"), std::string::npos) << e.message;
  const SolveError upper = FailureOf(
      DiscreteOptimalGamma(Scalar(1.2), Scalar(0.5), Scalar(1), Scalar(1), Scalar(1), 0.5));
  EXPECT_NE(upper.message.find("the upper bound gamma = 0.5 is infeasible"), std::string::npos)
      << upper.message;
}

// The demo robots' designs, as `upright design` weighs them.
class RobotDiscreteHinfTest : public ::testing::TestWithParam<const char*> {
 protected:
  model::RobotModel model_ = Demo(GetParam());
  LinearModel plant_ = Linearise(model_, InputKind::kTorque);
  DesignWeights weights_ =
      WeightsForRobot(DesignWeights{}, model_, plant_.equilibrium_pitch_rad).value();
  StateMatrix Q_ = StateWeight(weights_);
  Eigen::Matrix2d R_ = InputWeight(weights_, model_, InputKind::kTorque);
  double push_N_ = 0.1 * model_.total_mass_kg() * 9.80665;
  double period_s_ = 1 / model_.control_rate_hz;
};

TEST_P(RobotDiscreteHinfTest, LargeGammaGivesTheDiscreteLqr) {
  // As γ → ∞ the game's weight −γ² I leaves the equation and X → the LQR's
  // ([BB1995], ch. 3; from memory); the gap closes like γ⁻² (measured here: each tenfold γ
  // shrinks it a hundredfold).
  const Result<ZohSystem, SolveError> zoh = DiscretiseZoh(plant_.A, plant_.B, period_s_);
  ASSERT_TRUE(Succeeded(zoh));
  const Result<MatrixXd, SolveError> lqr = DiscreteLqrGain(zoh->Ad, zoh->Bd, Q_, R_);
  ASSERT_TRUE(Succeeded(lqr));
  const Result<GammaSearch, SolveError> search =
      RobotDiscreteOptimalGamma(plant_, Q_, R_, push_N_, period_s_);
  ASSERT_TRUE(Succeeded(search));
  double gap[3];
  for (int i = 0; i < 3; ++i) {
    const double gamma = search->gamma_opt * std::pow(10.0, 2 + i);
    const Result<MatrixXd, SolveError> k =
        RobotDiscreteHinf(plant_, Q_, R_, push_N_, gamma, period_s_);
    ASSERT_TRUE(Succeeded(k)) << gamma;
    gap[i] = (*k - *lqr).norm() / lqr->norm();
  }
  EXPECT_LT(gap[0], 1e-3);
  EXPECT_NEAR(gap[1] / gap[0], 1e-2, 2e-3);
  EXPECT_NEAR(gap[2] / gap[1], 1e-2, 2e-3);
}

TEST_P(RobotDiscreteHinfTest, ApproachesTheContinuousDesignAsTheRateGrows) {
  // With the push held like the input and the weights per sample, T Σ tends to ∫ on both sides
  // of Σ zᵀz < γ² Σ wᵀw, so the discrete design at a fixed γ tends to the continuous one
  // [DGKF1989] and the discrete γ_opt to the continuous γ_opt. Measured: both errors are first
  // order in T (halving T halves them; at the model's rate the gain is 6 % off on the courier at
  // 200 Hz and 31 % on the tabletop at 100 Hz, γ_opt 0.3 % and 0.5 %).
  const Result<GammaSearch, SolveError> continuous_search =
      RobotOptimalGamma(plant_, Q_, R_, push_N_);
  ASSERT_TRUE(Succeeded(continuous_search));
  const double gamma = 1.5 * continuous_search->gamma_opt;
  const Result<MatrixXd, SolveError> kc = RobotHinf(plant_, Q_, R_, push_N_, gamma);
  ASSERT_TRUE(Succeeded(kc));
  constexpr int kHalvings = 5;
  double error[kHalvings], gamma_error[kHalvings];
  for (int i = 0; i < kHalvings; ++i) {
    const double T = period_s_ / (1 << i);
    const Result<MatrixXd, SolveError> kd = RobotDiscreteHinf(plant_, Q_, R_, push_N_, gamma, T);
    ASSERT_TRUE(Succeeded(kd)) << "T = " << T;
    error[i] = (*kd - *kc).norm() / kc->norm();
    const Result<GammaSearch, SolveError> search =
        RobotDiscreteOptimalGamma(plant_, Q_, R_, push_N_, T);
    ASSERT_TRUE(Succeeded(search)) << "T = " << T;
    gamma_error[i] = std::abs(search->gamma_opt / continuous_search->gamma_opt - 1);
    std::printf("%s T = %.6g s: |K_d − K_c| / |K_c| = %.4g, |γ_opt,d / γ_opt,c − 1| = %.3g\n",
                GetParam(), T, error[i], gamma_error[i]);
  }
  // The first halving of the tabletop's 10 ms is not yet in the asymptotic range (0.57).
  for (int i = 2; i < kHalvings; ++i) EXPECT_NEAR(error[i] / error[i - 1], 0.5, 0.04) << i;
  EXPECT_LT(error[kHalvings - 1], 0.03);
  EXPECT_LT(gamma_error[kHalvings - 1], 4e-4);
}

TEST_P(RobotDiscreteHinfTest, SampledLoopNormIsBelowGammaAndReachesTheOptimum) {
  // The central controller at γ keeps the sampled loop's norm below γ; at the search's γ_opt
  // (within its relative gap above the true optimum) the norm lies between the optimum and γ,
  // so within the gap of γ_opt. The norm is checked against a dense sweep of the unit circle.
  const Result<GammaSearch, SolveError> search =
      RobotDiscreteOptimalGamma(plant_, Q_, R_, push_N_, period_s_);
  ASSERT_TRUE(Succeeded(search));
  const double gamma_opt = search->gamma_opt;
  const Performance performance{Q_, R_, push_N_};
  for (const double factor : {1.1, 2.0}) {
    const Result<MatrixXd, SolveError> k =
        RobotDiscreteHinf(plant_, Q_, R_, push_N_, factor * gamma_opt, period_s_);
    ASSERT_TRUE(Succeeded(k));
    const AnalysisResult<NormPeak> norm = SampledPushNorm(plant_, *k, performance, period_s_);
    ASSERT_TRUE(Succeeded(norm));
    EXPECT_LT(norm->norm, factor * gamma_opt) << factor;
    EXPECT_GT(norm->norm, gamma_opt / (1 + 1e-4)) << factor;  // no gain beats the optimum
  }
  const Result<MatrixXd, SolveError> at_optimum =
      RobotDiscreteHinf(plant_, Q_, R_, push_N_, gamma_opt, period_s_);
  ASSERT_TRUE(Succeeded(at_optimum));
  const AnalysisResult<NormPeak> norm =
      SampledPushNorm(plant_, *at_optimum, performance, period_s_);
  ASSERT_TRUE(Succeeded(norm));
  EXPECT_LT(norm->norm, gamma_opt);
  EXPECT_GT(norm->norm, gamma_opt / (1 + 1e-4) * (1 - 1e-9));

  // The same loop evaluated directly on 20 001 points of the unit circle: σ̄ of
  // [Q½; −R½ K] (e^{jθ} I − (Ad − Bd K))⁻¹ Bw never exceeds the norm and comes within 1e-3 of it.
  MatrixXd inputs(kStates, kInputs + 1);
  inputs << plant_.B, plant_.E.col(0) * push_N_;
  const Result<ZohSystem, SolveError> zoh = DiscretiseZoh(plant_.A, inputs, period_s_);
  ASSERT_TRUE(Succeeded(zoh));
  const MatrixXd loop = zoh->Ad - zoh->Bd.leftCols(kInputs) * *at_optimum;
  MatrixXd C(kStates + kInputs, kStates);
  C << Q_.cwiseSqrt(), -R_.cwiseSqrt() * *at_optimum;  // Q and R are diagonal (Bryson's rule)
  double swept = 0;
  for (int i = 0; i <= 20000; ++i) {
    using Cd = std::complex<double>;
    Eigen::MatrixXcd m = -loop.cast<Cd>();
    m.diagonal().array() += std::polar(1.0, 3.14159265358979323846 * i / 20000);
    const Eigen::MatrixXcd g =
        C.cast<Cd>() * m.partialPivLu().solve(zoh->Bd.rightCols(1).cast<Cd>());
    swept = std::max(swept, Eigen::JacobiSVD<Eigen::MatrixXcd>(g).singularValues()(0));
  }
  EXPECT_LE(swept, norm->norm * (1 + 1e-9));
  EXPECT_GE(swept, norm->norm * (1 - 1e-3));
}

// The largest |z| of u_k = −K x_k held over each period and applied `delay_s` late: with
// delay_s = d T + f (0 ≤ f < T), x_{k+1} = Ad x_k + Γ1 u_{k−d−1} + Γ0 u_{k−d}, Γ0 = ∫₀^{T−f} e^{As}
// ds B and Γ1 = e^{A(T−f)} ∫₀^f e^{As} ds B, the past inputs as extra states (Franklin, Powell and
// Workman, Digital Control of Dynamic Systems, 3rd ed., "systems with time delay"; from memory).
double DelayedLoopRadius(const LinearModel& plant, const MatrixXd& K, double T, double delay_s) {
  const int d = static_cast<int>(std::floor(delay_s / T + 1e-12));
  const double f = delay_s - d * T;
  const ZohSystem late = DiscretiseZoh(plant.A, plant.B, T - f).value();
  const ZohSystem early = DiscretiseZoh(plant.A, plant.B, f).value();
  const MatrixXd gamma0 = late.Bd, gamma1 = late.Ad * early.Bd;
  const int n = kStates, m = kInputs, blocks = d + 1, size = n + m * blocks;
  // State [x_k; u_{k−d−1}; u_{k−d}; …; u_{k−1}].
  MatrixXd phi = MatrixXd::Zero(size, size);
  phi.topLeftCorner(n, n) = late.Ad * early.Ad;
  phi.block(0, n, n, m) = gamma1;
  if (d == 0) {
    phi.topLeftCorner(n, n) -= gamma0 * K;
  } else {
    phi.block(0, n + m, n, m) = gamma0;
  }
  for (int b = 0; b + 1 < blocks; ++b) {
    phi.block(n + b * m, n + (b + 1) * m, m, m) = MatrixXd::Identity(m, m);
  }
  phi.block(n + (blocks - 1) * m, 0, m, n) = -K;
  return phi.eigenvalues().cwiseAbs().maxCoeff();
}

// The smallest delay that leaves the sampled loop unstable, to 1 µs (bisection from 0, stable,
// to 0.2 s).
double CriticalDelay(const LinearModel& plant, const MatrixXd& K, double T) {
  double stable = 0, unstable = 0.2;
  if (DelayedLoopRadius(plant, K, T, unstable) < 1) return unstable;
  while (unstable - stable > 1e-6) {
    const double mid = 0.5 * (stable + unstable);
    (DelayedLoopRadius(plant, K, T, mid) < 1 ? stable : unstable) = mid;
  }
  return unstable;
}

TEST_P(RobotDiscreteHinfTest, ToleratesMoreDelayThanTheContinuousGainSampled) {
  // The continuous gain applied once a period (what the hinf module ran before) against the
  // discrete design at the same factor of each problem's γ_opt: the discrete one keeps its
  // fastest pole near the continuous loop's, and its sampled loop tolerates more delay between
  // measurement and command, and more than the model's sensor latency.
  // At 1.1 γ_opt, near the optimum where the gains are high and sampling matters most.
  const double factor = 1.1;
  const Result<GammaSearch, SolveError> continuous_search =
      RobotOptimalGamma(plant_, Q_, R_, push_N_);
  const Result<GammaSearch, SolveError> discrete_search =
      RobotDiscreteOptimalGamma(plant_, Q_, R_, push_N_, period_s_);
  ASSERT_TRUE(Succeeded(continuous_search));
  ASSERT_TRUE(Succeeded(discrete_search));
  const Result<MatrixXd, SolveError> kc =
      RobotHinf(plant_, Q_, R_, push_N_, factor * continuous_search->gamma_opt);
  const Result<MatrixXd, SolveError> kd =
      RobotDiscreteHinf(plant_, Q_, R_, push_N_, factor * discrete_search->gamma_opt, period_s_);
  ASSERT_TRUE(Succeeded(kc));
  ASSERT_TRUE(Succeeded(kd));
  EXPECT_LT(DelayedLoopRadius(plant_, *kd, period_s_, 0), 1);
  EXPECT_NEAR(DelayedLoopRadius(plant_, *kd, period_s_, 0),
              SampledStateFeedback(plant_, *kd, period_s_).value().max_abs_z, 1e-12);
  const double continuous_delay = CriticalDelay(plant_, *kc, period_s_);
  const double discrete_delay = CriticalDelay(plant_, *kd, period_s_);
  const auto fastest = [&](const MatrixXd& K) {
    return SampledStateFeedback(plant_, K, period_s_).value().s.front().real();
  };
  const double continuous_fastest = (plant_.A - plant_.B * *kc).eigenvalues().real().minCoeff();
  std::printf(
      "%s at %g Hz: fastest pole continuous %.4g, sampled continuous gain %.4g, discrete design "
      "%.4g 1/s; unstable from a delay of %.4g ms (continuous gain) and %.4g ms (discrete)\n",
      GetParam(), 1 / period_s_, continuous_fastest, fastest(*kc), fastest(*kd),
      1e3 * continuous_delay, 1e3 * discrete_delay);
  EXPECT_GT(discrete_delay, continuous_delay);
  EXPECT_GT(discrete_delay, model_.sensors.latency_s);
  EXPECT_LT(std::abs(fastest(*kd) / continuous_fastest - 1), 0.05);
}

INSTANTIATE_TEST_SUITE_P(Robots, RobotDiscreteHinfTest,
                         ::testing::Values("courier.xml", "tabletop.xml"),
                         [](const ::testing::TestParamInfo<const char*>& param) {
                           const std::string name = param.param;
                           return name.substr(0, name.find('.'));
                         });

}  // namespace
}  // namespace upright::design
