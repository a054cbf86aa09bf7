// Controller synthesis against published worked examples and closed forms, and the designs of the
// demo robots against the properties the theory guarantees. Sources cited as [Key] are listed in
// tests/REFERENCES.md.
#include "upright/design/synthesis.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/design/closed_loop.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/conventions.hpp"
#include "upright/sim/plant.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

MatrixXd M(std::initializer_list<std::initializer_list<double>> rows) {
  MatrixXd m(rows.size(), rows.begin()->size());
  int i = 0;
  for (const auto& row : rows) {
    int j = 0;
    for (double v : row) m(i, j++) = v;
    ++i;
  }
  return m;
}

// Cart-pole of the University of Michigan Control Tutorials, inverted pendulum state-space
// example [CTMS-pendulum] (M = 0.5, m = 0.2, b = 0.1, I = 0.006, g = 9.8, l = 0.3), built from its
// parameters with the tutorial's formulas (p = I(M + m) + M m l²) rather than from its rounded
// table.
constexpr double kCartM = 0.5, kPoleM = 0.2, kFriction = 0.1, kPoleI = 0.006, kCartG = 9.8,
                 kPoleL = 0.3;
constexpr double kP = kPoleI * (kCartM + kPoleM) + kCartM * kPoleM * kPoleL * kPoleL;
MatrixXd CartPoleA() {
  const double ml2 = kPoleM * kPoleL * kPoleL;
  return M(
      {{0, 1, 0, 0},
       {0, -(kPoleI + ml2) * kFriction / kP, kPoleM * kPoleM * kCartG * kPoleL * kPoleL / kP, 0},
       {0, 0, 0, 1},
       {0, -kPoleM * kPoleL * kFriction / kP, kPoleM * kCartG * kPoleL * (kCartM + kPoleM) / kP,
        0}});
}
MatrixXd CartPoleB() {
  return M({{0}, {(kPoleI + kPoleM * kPoleL * kPoleL) / kP}, {0}, {kPoleM * kPoleL / kP}});
}

TEST(Synthesis, CartPoleModelMatchesTheTutorialTable) {
  // A = [0 1 0 0; 0 −0.1818 2.6727 0; 0 0 0 1; 0 −0.4545 31.1818 0], B = [0; 1.8182; 0; 4.5455]
  // ([CTMS-pendulum]; checked numerically), to the tutorial's 4 printed decimals.
  const MatrixXd table_a =
      M({{0, 1, 0, 0}, {0, -0.1818, 2.6727, 0}, {0, 0, 0, 1}, {0, -0.4545, 31.1818, 0}});
  const MatrixXd table_b = M({{0}, {1.8182}, {0}, {4.5455}});
  EXPECT_LT((CartPoleA() - table_a).cwiseAbs().maxCoeff(), 1e-4);
  EXPECT_LT((CartPoleB() - table_b).cwiseAbs().maxCoeff(), 1e-4);
}

TEST(Synthesis, LqrGainMatchesTheCartPoleTutorialWithHeavyPositionWeight) {
  // Q = diag(5000, 0, 100, 0), R = 1 → K = [−70.7107 −37.8345 105.5298 20.9238]
  // ([CTMS-pendulum]; checked numerically), to the tutorial's 4 printed decimals.
  const Result<Eigen::MatrixXd, SolveError> k =
      LqrGain(CartPoleA(), CartPoleB(),
              M({{5000, 0, 0, 0}, {0, 0, 0, 0}, {0, 0, 100, 0}, {0, 0, 0, 0}}), M({{1}}));
  ASSERT_TRUE(Succeeded(k));
  const double expected[] = {-70.7107, -37.8345, 105.5298, 20.9238};
  for (int j = 0; j < 4; ++j) EXPECT_NEAR((*k)(0, j), expected[j], 1e-4);
}

TEST(Synthesis, LqrGainMatchesTheCartPoleTutorialWithUnitWeights) {
  // Q = diag(1, 0, 1, 0), R = 1 → K = [−1.0000 −1.6567 18.6854 3.4594] ([CTMS-pendulum], from
  // memory; checked numerically), to 4 decimals.
  const Result<Eigen::MatrixXd, SolveError> k =
      LqrGain(CartPoleA(), CartPoleB(), M({{1, 0, 0, 0}, {0, 0, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 0}}),
              M({{1}}));
  ASSERT_TRUE(Succeeded(k));
  const double expected[] = {-1.0000, -1.6567, 18.6854, 3.4594};
  for (int j = 0; j < 4; ++j) EXPECT_NEAR((*k)(0, j), expected[j], 1e-4);
}

TEST(Synthesis, ScalarLqrHasTheClosedFormGain) {
  // ẋ = x + u, q = r = 1: 2x − x² + 1 = 0 → K = x = 1 + √2, closed-loop pole −√2 (closed form,
  // derived by hand).
  const Result<Eigen::MatrixXd, SolveError> k = LqrGain(M({{1}}), M({{1}}), M({{1}}), M({{1}}));
  ASSERT_TRUE(Succeeded(k));
  EXPECT_NEAR((*k)(0, 0), 1 + std::sqrt(2.0), 1e-12);
}

// Closed-loop H-infinity norm of the scalar example: ẋ = (a − K) x + w, z = [x; −K x].
double ScalarLoopNorm(double a, double k) {
  return HinfNorm({M({{a - k}}), M({{1}}), M({{1}, {-k}}), M({{0}, {0}})}).value().norm;
}

TEST(Synthesis, ScalarHinfGainMatchesTheClosedForm) {
  // ẋ = a x + w + u, z = [x; u]: the H-infinity Riccati equation [DGKF1989] is
  // (1 − γ⁻²) X² − 2a X − 1 = 0, so X = (a + √(a² + 1 − γ⁻²)) / (1 − γ⁻²), F = −X. a = 1, γ = 2:
  // X = 3.0971675407, ‖T_zw‖∞ = 1.5519045913; a = −1, γ = 2: X = 0.4305008740,
  // ‖T_zw‖∞ = 0.7610824268 (closed form, derived by hand; checked numerically with SciPy and
  // SLICOT SB02OD).
  struct Case {
    double a, x, norm;
  };
  for (const Case c : {Case{1, 3.0971675407, 1.5519045913}, Case{-1, 0.4305008740, 0.7610824268}}) {
    const Result<Eigen::MatrixXd, SolveError> k =
        HinfGain(M({{c.a}}), M({{1}}), M({{1}}), M({{1}}), M({{1}}), 2.0);
    ASSERT_TRUE(Succeeded(k));
    EXPECT_NEAR((*k)(0, 0), c.x, 1e-9) << "a = " << c.a;
    EXPECT_NEAR(ScalarLoopNorm(c.a, (*k)(0, 0)), c.norm, 1e-9) << "a = " << c.a;
  }
}

TEST(Synthesis, GammaIterationFindsTheScalarOptimum) {
  // For a < 0, γ_opt = 1/√(1 + a²), where the root above turns complex (a = −1: 0.70710678); for
  // a ≥ 0, X ≥ 0 needs 1 − γ⁻² > 0, so γ_opt = 1, approached but not attained (derived by hand;
  // checked numerically). Bisection to a relative gap of 1e-6.
  const Result<GammaSearch, SolveError> stable =
      OptimalGamma(M({{-1}}), M({{1}}), M({{1}}), M({{1}}), M({{1}}), 2.0, 1e-6);
  ASSERT_TRUE(Succeeded(stable));
  EXPECT_NEAR(stable->gamma_opt, 1 / std::sqrt(2.0), 1e-5);
  const Result<GammaSearch, SolveError> unstable =
      OptimalGamma(M({{1}}), M({{1}}), M({{1}}), M({{1}}), M({{1}}), 2.0, 1e-6);
  ASSERT_TRUE(Succeeded(unstable));
  EXPECT_NEAR(unstable->gamma_opt, 1.0, 1e-4);
  EXPECT_GE(unstable->gamma_opt, 1.0);
}

TEST(Synthesis, GammaIterationChecksItsLowerBound) {
  // With b1 = 1e-9 in ẋ = −x + b1 w + u, γ_opt = b1/√2 (the closed form above scales with b1),
  // far below the search's lower end, 1e-6 × the upper bound 2: the search must say that the
  // lower end is feasible rather than return it as γ_opt.
  const SolveError e =
      FailureOf(OptimalGamma(M({{-1}}), M({{1e-9}}), M({{1}}), M({{1}}), M({{1}}), 2.0));
  EXPECT_EQ(e.reason, SolveFailure::kInvalidInput);
  EXPECT_NE(e.message.find("the lower bound gamma = 2e-06 (1e-06 x the upper bound) is feasible"),
            std::string::npos)
      << e.message;
  // Just above that end, the same search finds it: b1 = 1e-5 gives γ_opt = 7.0711e-6 ≥ 2e-6.
  const Result<GammaSearch, SolveError> small =
      OptimalGamma(M({{-1}}), M({{1e-5}}), M({{1}}), M({{1}}), M({{1}}), 2.0, 1e-6);
  ASSERT_TRUE(Succeeded(small));
  EXPECT_NEAR(small->gamma_opt, 1e-5 / std::sqrt(2.0), 1e-5 * 1e-5);
}

TEST(Synthesis, KalmanBucyGainOfAFirstOrderSystem) {
  // ẋ = −x + w, y = x + v, Q = R = 1: −2P − P² + 1 = 0 → P = L = √2 − 1 (closed form, derived
  // by hand).
  MatrixXd P;
  const Result<Eigen::MatrixXd, SolveError> l =
      KalmanBucyGain(M({{-1}}), M({{1}}), M({{1}}), M({{1}}), &P);
  ASSERT_TRUE(Succeeded(l));
  EXPECT_NEAR((*l)(0, 0), std::sqrt(2.0) - 1, 1e-12);
  EXPECT_NEAR(P(0, 0), std::sqrt(2.0) - 1, 1e-12);
}

TEST(Synthesis, DiscreteKalmanGainOfARandomWalk) {
  // x⁺ = x + w, y = x + v, Q = R = 1: P² − P − 1 = 0 → P⁻ = (1 + √5)/2 = 1.6180340,
  // K = P/(P + 1) = 0.6180340 (closed form, derived by hand).
  MatrixXd P;
  const Result<Eigen::MatrixXd, SolveError> l =
      DiscreteKalmanGain(M({{1}}), M({{1}}), M({{1}}), M({{1}}), &P);
  ASSERT_TRUE(Succeeded(l));
  EXPECT_NEAR(P(0, 0), (1 + std::sqrt(5.0)) / 2, 1e-9);
  EXPECT_NEAR((*l)(0, 0), (std::sqrt(5.0) - 1) / 2, 1e-9);
}

TEST(Synthesis, DiscreteLqrApproachesTheContinuousGainAsTheRateRises) {
  // Sampling faster, the ZOH discrete LQR with weights scaled by the period tends to the
  // continuous LQR (the discrete cost T Σ ≈ ∫; derived), with an error of first order in T.
  const model::RobotModel model = Demo("courier.xml");
  const LinearModel plant = Linearise(model, InputKind::kTorque);
  const DesignWeights w =
      WeightsForRobot(DesignWeights{}, model, plant.equilibrium_pitch_rad).value();
  const StateMatrix Q = StateWeight(w);
  const Eigen::Matrix2d R = InputWeight(w, model, InputKind::kTorque);
  const Result<Eigen::MatrixXd, SolveError> kc = RobotLqr(plant, Q, R);
  ASSERT_TRUE(Succeeded(kc));
  double error[2];
  for (int k = 0; k < 2; ++k) {
    const double T = 1e-3 / (1 << k);
    const Result<Eigen::MatrixXd, SolveError> kd = RobotDiscreteLqr(plant, Q * T, R * T, T);
    ASSERT_TRUE(Succeeded(kd));
    error[k] = ((*kd) - (*kc)).norm() / (*kc).norm();
  }
  EXPECT_LT(error[0], 0.02);
  EXPECT_NEAR(error[1] / error[0], 0.5, 0.05);
}

TEST(Synthesis, LqgPolesAreTheRegulatorAndEstimatorPolesTogether) {
  // The separation principle: eig(closed loop) = eig(A − BK) ∪ eig(A − LC)
  // (handbook, from memory), here with the robot's sensors and their input feedthrough.
  const DesignSet d = DesignAll(Demo("courier.xml"), DesignRequest{});
  ASSERT_TRUE(d.lqg.ok) << d.lqg.message;
  const MatrixXd a = d.plant.A;
  Eigen::VectorXcd reg = (a - d.plant.B * d.lqg.K).eigenvalues();
  Eigen::VectorXcd est = (a - d.lqg.L * d.lqg.sensors.C).eigenvalues();
  std::vector<std::complex<double>> expected(reg.data(), reg.data() + reg.size());
  expected.insert(expected.end(), est.data(), est.data() + est.size());
  ASSERT_EQ(expected.size(), d.lqg.loop.poles.size());
  // Match each expected pole to the nearest closed-loop pole.
  for (const auto& p : expected) {
    double nearest = 1e300;
    for (const auto& q : d.lqg.loop.poles) nearest = std::min(nearest, std::abs(p - q));
    EXPECT_LT(nearest, 1e-7 * std::max(1.0, std::abs(p))) << p;
  }
}

TEST(Synthesis, ContinuousLqrKeepsItsGuaranteedMargins) {
  // A continuous LQR with R = ρI has |1 + L| ≥ 1 in every channel: gain margin [½, ∞) and phase
  // margin ≥ 60° ([SA1977], from memory). Loop-at-a-time margins must meet them too.
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const DesignSet d = DesignAll(Demo(name), DesignRequest{});
    ASSERT_TRUE(d.lqr.ok) << name << ": " << d.lqr.message;
    const LoopMargins& m = d.lqr.loop.margins;
    EXPECT_LE(m.gain_low, 0.5 + 1e-9) << name;
    EXPECT_TRUE(std::isinf(m.gain_high)) << name << ": " << m.gain_high;
    EXPECT_GE(m.phase_deg, 60 - 1e-6) << name;
  }
}

TEST(Synthesis, DemoRobotsGetEveryDesignWithHinfBelowGamma) {
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const DesignSet d = DesignAll(Demo(name), DesignRequest{});
    EXPECT_TRUE(d.all_ok()) << name << ": lqr " << d.lqr.message << "; hinf " << d.hinf.message
                            << "; lqg " << d.lqg.message << "; pid " << d.pid.message;
    // γ_opt is the best any state feedback achieves, so the LQR loop cannot beat it; the design
    // at the rule's γ must achieve ‖T_zw‖∞ < γ.
    EXPECT_LE(d.hinf.gamma_opt, d.lqr.loop.push_norm * (1 + 1e-4)) << name;
    EXPECT_EQ(d.hinf.source, GammaSource::kRule) << name;
    EXPECT_TRUE(d.hinf.choice.limits_met) << name;
    EXPECT_NEAR(d.hinf.gamma_discrete, d.hinf.choice.gamma, 0) << name;
    EXPECT_LT(d.hinf.loop.push_norm, d.hinf.gamma) << name;
    // The same of the discrete design the hinf module runs: its γ from its own γ_opt, its
    // sampled loop's norm below it and not below γ_opt (no gain does better).
    EXPECT_NEAR(d.hinf.gamma_discrete / d.hinf.gamma_opt_discrete, d.hinf.choice.factor, 1e-12)
        << name;
    EXPECT_LT(d.hinf.norm_discrete, d.hinf.gamma_discrete) << name;
    EXPECT_GT(d.hinf.norm_discrete, d.hinf.gamma_opt_discrete / (1 + 1e-4)) << name;
    for (const auto& p : d.pid.loop.poles) EXPECT_LT(p.real(), 0) << name << " pid pole " << p;
  }
}

TEST(Synthesis, InfeasibleGammaIsReportedWithItsReason) {
  DesignRequest request;
  request.gamma = 1e-3;  // far below γ_opt
  const DesignSet d = DesignAll(Demo("tabletop.xml"), request);
  EXPECT_FALSE(d.hinf.ok);
  EXPECT_NE(d.hinf.message.find("gamma = 0.001"), std::string::npos) << d.hinf.message;
  EXPECT_NE(d.hinf.message.find("gamma_opt"), std::string::npos) << d.hinf.message;
}

TEST(Synthesis, PidCascadePlacesTheClosedLoopPolesItAimedAt) {
  // The rule in pid.cpp: planar poles at the roots of (s² + 2·0.7·ω s + ω²)(s² + 2·0.9·ω_s s +
  // ω_s²), ω = 2λ, ω_s = λ/3; the yaw-rate PI gives s² + ω_y s + ω_y²/4, a double root at
  // −ω_y/2 (derived). The analysed loop (x and ψ left out: the cascade does not read them) must
  // have exactly these six poles.
  const LinearModel plant = Linearise(Demo("courier.xml"), InputKind::kTorque);
  const PidGains g = TunePid(plant, PidPoles{}, 3);
  Measurement meas;
  LinearController ctrl;
  PidAsLinearController(g, &meas, &ctrl);
  const AnalysisResult<LoopAnalysis> analysed =
      AnalyseLoop(plant, meas, ctrl,
                  Performance{StateWeight({.max_tilt_deg = 3}), Eigen::Matrix2d::Identity(), 1});
  ASSERT_TRUE(Succeeded(analysed));
  const LoopAnalysis& loop = *analysed;
  const double lambda = plant.fall_rate_1_s;
  auto pair = [](double w, double z) {
    return std::complex<double>(-z * w, w * std::sqrt(1 - z * z));
  };
  const std::complex<double> expected[] = {pair(2 * lambda, 0.7), std::conj(pair(2 * lambda, 0.7)),
                                           pair(lambda / 3, 0.9), std::conj(pair(lambda / 3, 0.9)),
                                           -lambda / 2,           -lambda / 2};
  ASSERT_EQ(loop.poles.size(), 6u);
  for (const auto& p : expected) {
    double nearest = 1e300;
    for (const auto& q : loop.poles) nearest = std::min(nearest, std::abs(p - q));
    // A double root splits by about √(eps)·|p| under rounding.
    EXPECT_LT(nearest, 1e-6 * std::abs(p)) << p;
  }
  EXPECT_GT(g.tilt_kp_Nm_per_rad, 0);
  EXPECT_GT(g.tilt_kd_Nm_s_per_rad, 0);
}

// Runs a linear controller on the plant at the model's control rate, reading the plant's true
// state through the controller's measurement matrix (forward-Euler controller states), through a
// half-sine push of the design size; returns false (and why) if the robot falls.
struct PlantRun {
  bool survived = false;
  double max_tilt_rad = 0, final_tilt_rad = 0, final_x_m = 0;
};
PlantRun RunOnPlant(const model::RobotModel& model, const DesignSet& d, const Measurement& meas,
                    const LinearController& ctrl, double seconds) {
  sim::PlantOptions options;
  options.drive = sim::DriveMode::kTorque;
  auto built = sim::Plant::Create(model, options);
  EXPECT_TRUE(Succeeded(built));
  const std::unique_ptr<sim::Plant> plant = std::move(built.value());
  sim::Push push;
  push.shape = sim::PushShape::kHalfSine;
  push.start_s = 0.5;
  push.duration_s = 0.2;
  push.peak_N = d.performance.push_scale_N;
  push.height_m = d.plant.push_height_m;
  EXPECT_TRUE(Succeeded(plant->AddPush(push)));
  const long every = std::lround(1 / (model.control_rate_hz * options.dt_s));
  const double period_s = static_cast<double>(every) * options.dt_s;
  Eigen::VectorXd xc = Eigen::VectorXd::Zero(ctrl.states());
  PlantRun run;
  for (long step = 0, n = std::lround(seconds / options.dt_s); step < n; ++step) {
    if (step % every == 0) {
      const sim::TrueState& s = plant->truth();
      StateVector x;
      x << s.x_m, s.forward_speed_m_s, s.pitch_rad - d.plant.equilibrium_pitch_rad,
          s.pitch_rate_rad_s, s.yaw_rad, s.yaw_rate_rad_s;
      const Eigen::VectorXd y = meas.Cy * x;
      const Eigen::VectorXd u = ctrl.Cc * xc + ctrl.Dc * y;
      if (ctrl.states() > 0) xc += period_s * (ctrl.Ac * xc + ctrl.Bc * y);
      plant->SetCommand(u(0), u(1));
    }
    plant->Step();
    run.max_tilt_rad = std::max(run.max_tilt_rad, std::abs(plant->truth().pitch_rad));
    if (plant->contact().chassis_on_ground) return run;
  }
  run.survived = true;
  run.final_tilt_rad = plant->truth().pitch_rad;
  run.final_x_m = plant->truth().x_m;
  return run;
}

TEST(Synthesis, LqrAndPidDesignsBalanceThePhysicsPlantThroughAPush) {
  // The designed gains, read against the plant's true state in the conventions of
  // conventions.hpp, must hold the robot up through a push of the design size and bring it back
  // upright: an end-to-end check of every sign between the linear model and the plant. Motor
  // friction and rolling resistance are left out: without integral action on position they leave
  // a slow creep that would blur the check.
  model::RobotModel model = Demo("courier.xml");
  model.motor.coulomb_friction_Nm = 0;
  model.motor.viscous_friction_Nm_s_per_rad = 0;
  model.wheel.rolling_resistance = 0;
  const DesignSet d = DesignAll(model, DesignRequest{});
  ASSERT_TRUE(d.lqr.ok && d.pid.ok);
  Measurement pid_meas;
  LinearController pid;
  PidAsLinearController(d.pid.gains, &pid_meas, &pid);
  const double deg = std::numbers::pi / 180;
  const PlantRun lqr = RunOnPlant(model, d, FullState(), StateFeedback(d.lqr.K), 8);
  const PlantRun cascade = RunOnPlant(model, d, pid_meas, pid, 8);
  for (const PlantRun& run : {lqr, cascade}) {
    EXPECT_TRUE(run.survived);
    EXPECT_GT(run.max_tilt_rad, 0.2 * deg);              // the push was felt
    EXPECT_LT(std::abs(run.final_tilt_rad), 0.2 * deg);  // and recovered from
  }
  EXPECT_LT(std::abs(lqr.final_x_m), 0.2);  // LQR also holds its position
}

}  // namespace
}  // namespace upright::design
