// The design pictures' curves: the loop at one input and the common-mode loop against closed forms
// derived by hand (the spinning body of [SPG2020], a symmetric two-input loop, a sampled
// integrator); on the demo robots, the Nyquist criterion, the margins read off the curves against
// the margin analysis, and the push response against the design push's peaks. SciPy checks the
// same curves in scipy_design_curves_test.py. Sources cited as [Key] are in tests/REFERENCES.md.
#include "upright/design/loop_response.hpp"

#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <numbers>
#include <vector>

#include "demo_robot.hpp"
#include "spinning_body.hpp"
#include "succeeded.hpp"
#include "upright/design/closed_loop.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/push_response.hpp"

namespace upright::design {
namespace {

using Cd = std::complex<double>;
using Eigen::MatrixXd;
constexpr double kPi = std::numbers::pi;

using testing::SpinningBody;

TEST(LoopAtInput, SpinningBodyWithTheOtherLoopClosedIsAnIntegrator) {
  // With loop 2 closed, A − b₂c₂ = [0 a; 0 −1], and c₁ (sI − A + b₂c₂)⁻¹ b₁ = [1 a] [1/s; 0] = 1/s
  // whatever a (derived by hand; the classic loop-at-a-time picture of this body: each loop alone
  // has an infinite gain margin and 90° of phase).
  for (const double a : {1.0, 10.0}) {
    const StateSpace l1 = LoopAtInput(SpinningBody(a), 0);
    const std::vector<double> omegas = {0.01, 0.5, 3, 100};
    const std::vector<Cd> values = FrequencyResponse(l1, 0, omegas);
    ASSERT_EQ(values.size(), omegas.size());
    for (std::size_t i = 0; i < omegas.size(); ++i) {
      const Cd expected = 1.0 / Cd(0, omegas[i]);
      EXPECT_LT(std::abs(values[i] - expected), 1e-12 * std::abs(expected)) << omegas[i];
    }
  }
}

// L = [p q; q p], p = 1/(s + 1), q = 2/(s + 3): states for p from each input and for q across.
BrokenLoop SymmetricPair() {
  BrokenLoop l;
  l.A = Eigen::Vector4d(-1, -1, -3, -3).asDiagonal();
  l.B = (MatrixXd(4, 2) << 1, 0, 0, 1, 1, 0, 0, 1).finished();
  l.C = (MatrixXd(2, 4) << 1, 0, 0, 2, 0, 1, 2, 0).finished();
  return l;
}

TEST(CommonModeLoop, OfASymmetricPairIsTheSumOfItsTerms) {
  // In the basis [1 1; 1 −1]/√2 the loop [p q; q p] is diag(p + q, p − q): the common mode alone
  // is p + q, whatever the differential loop does (derived by hand).
  const StateSpace common = CommonModeLoop(SymmetricPair());
  const std::vector<double> omegas = {0.1, 1, 7};
  const std::vector<Cd> values = FrequencyResponse(common, 0, omegas);
  for (std::size_t i = 0; i < omegas.size(); ++i) {
    const Cd s(0, omegas[i]);
    const Cd expected = 1.0 / (s + 1.0) + 2.0 / (s + 3.0);
    EXPECT_LT(std::abs(values[i] - expected), 1e-13) << omegas[i];
  }
  // And the loop at one input: p with the other loop closed, p − q² / (1 + p) (derived by hand).
  const std::vector<Cd> one = FrequencyResponse(LoopAtInput(SymmetricPair(), 0), 0, omegas);
  for (std::size_t i = 0; i < omegas.size(); ++i) {
    const Cd s(0, omegas[i]);
    const Cd p = 1.0 / (s + 1.0), q = 2.0 / (s + 3.0);
    EXPECT_LT(std::abs(one[i] - (p - q * q / (1.0 + p))), 1e-13) << omegas[i];
  }
}

TEST(FrequencyResponse, SampledIntegratorOnTheUnitCircle) {
  // x_{k+1} = x_k + T v, u = −x: L(z) = T / (z − 1). On z = e^{jωT}, z − 1 = 2j sin(ωT/2) e^{jωT/2},
  // so |L| = T / (2 sin(ωT/2)) and ∠L = −90° − ωT/2 (derived by hand).
  const double period_s = 0.01;
  StateSpace integrator{MatrixXd::Ones(1, 1), MatrixXd::Constant(1, 1, period_s),
                        MatrixXd::Ones(1, 1), MatrixXd::Zero(1, 1)};
  const std::vector<double> omegas = {0.3, 10, 200, 300};
  const std::vector<Cd> values = FrequencyResponse(integrator, period_s, omegas);
  const std::vector<double> phase = UnwrappedPhaseDeg(values);
  for (std::size_t i = 0; i < omegas.size(); ++i) {
    const double half = omegas[i] * period_s / 2;
    EXPECT_NEAR(std::abs(values[i]), period_s / (2 * std::sin(half)), 1e-12 / std::sin(half));
    EXPECT_NEAR(phase[i], -90 - half * 180 / kPi, 1e-9) << omegas[i];
  }
  // On a pole (ω = 0: z = 1) the value is NaN, not a huge number.
  const std::vector<Cd> at_pole = FrequencyResponse(integrator, period_s, {0.0});
  EXPECT_TRUE(std::isnan(at_pole[0].real()));
}

TEST(FrequencyResponse, APureGainAndBadSizes) {
  const StateSpace gain{MatrixXd(0, 0), MatrixXd(0, 1), MatrixXd(1, 0), MatrixXd::Constant(1, 1, 3)};
  EXPECT_EQ(FrequencyResponse(gain, 0, {1, 2}), (std::vector<Cd>{3, 3}));
  const StateSpace broken{MatrixXd::Identity(2, 2), MatrixXd::Ones(3, 1), MatrixXd::Ones(1, 2),
                          MatrixXd::Zero(1, 1)};
  const std::vector<Cd> values = FrequencyResponse(broken, 0, {1});
  EXPECT_TRUE(std::isnan(values[0].real()));
  EXPECT_EQ(LoopAtInput(SpinningBody(1), 2).A.size(), 0);
  BrokenLoop one_input;
  one_input.A = MatrixXd::Zero(1, 1);
  one_input.B = MatrixXd::Ones(1, 1);
  one_input.C = MatrixXd::Ones(1, 1);
  EXPECT_EQ(CommonModeLoop(one_input).A.size(), 0);
}

TEST(LogFrequencies, EvenInLogFromEndToEnd) {
  const std::vector<double> omegas = LogFrequencies(0.1, 1000, 5);
  ASSERT_EQ(omegas.size(), 21u);
  EXPECT_EQ(omegas.front(), 0.1);
  EXPECT_EQ(omegas.back(), 1000);
  for (std::size_t i = 1; i < omegas.size(); ++i) {
    EXPECT_NEAR(std::log10(omegas[i] / omegas[i - 1]), 0.2, 1e-12);
  }
  // A range that is not a whole number of steps still ends at hi.
  const std::vector<double> odd = LogFrequencies(1, 50, 2);
  EXPECT_EQ(odd.back(), 50);
  EXPECT_EQ(odd.size(), 5u);  // ⌈1.699 × 2⌉ = 4 intervals
  EXPECT_TRUE(LogFrequencies(0, 10, 5).empty());
  EXPECT_TRUE(LogFrequencies(10, 10, 5).empty());
  EXPECT_TRUE(LogFrequencies(1, 10, 0).empty());
}

TEST(UnwrappedPhaseDeg, FollowsTurnsAndRestartsAfterAGap) {
  // e^{−jθ} for θ from 0 to 3.5 turns: −θ in degrees, not folded into (−180, 180].
  std::vector<Cd> values;
  for (int k = 0; k <= 70; ++k) values.push_back(std::polar(2.0, -k * 0.05 * 2 * kPi));
  const std::vector<double> phase = UnwrappedPhaseDeg(values);
  for (int k = 0; k <= 70; ++k) EXPECT_NEAR(phase[k], -k * 0.05 * 360, 1e-9) << k;
  const std::vector<double> gap =
      UnwrappedPhaseDeg({Cd(-1, 0), Cd(std::nan(""), 0), Cd(0, -1)});
  EXPECT_EQ(gap[0], -180);
  EXPECT_TRUE(std::isnan(gap[1]));
  EXPECT_EQ(gap[2], -90);
  // The first value's phase is read as a lag: +90° shows as −270°.
  EXPECT_EQ(UnwrappedPhaseDeg({Cd(0, 1), Cd(1, 1)}), (std::vector<double>{-270, -315}));
}

// The robot's loops: each controller's, continuous, as the design made it.
struct RobotLoops {
  DesignSet set;
  std::vector<const ControllerReport*> reports;
};

RobotLoops Robot(const char* file) {
  RobotLoops r;
  r.set = DesignAll(Demo(file), {});
  r.reports = {&r.set.lqr, &r.set.hinf, &r.set.lqg, &r.set.pid};
  return r;
}

// Poles within 1e-6 of the largest pole's size of the origin: states that only integrate (the
// robot's position, with the other wheel's loop closed, is a double one).
int PolesAtOrigin(const StateSpace& loop) {
  const Eigen::VectorXcd poles = loop.A.eigenvalues();
  int at_origin = 0;
  for (const Cd& p : poles) at_origin += std::abs(p) <= 1e-6 * poles.cwiseAbs().maxCoeff();
  return at_origin;
}

// The net counter-clockwise turns of 1 + L(s) about the origin as s runs up the imaginary axis,
// passing each pole at the origin to its right on a small half-circle (where L, large, turns by
// −180° a pole) and closing at infinity (L strictly proper: no turn there); from a dense grid of
// L(jω) for ω in [1e-3, 1e6] rad/s and its mirror image.
double Encirclements(const StateSpace& loop) {
  const std::vector<double> omegas = LogFrequencies(1e-3, 1e6, 2000);
  const std::vector<Cd> values = FrequencyResponse(loop, 0, omegas);
  double turned = 0;
  // From ω = −1e6 up to −1e-3 (the mirror image), then from +1e-3 up to +1e6.
  for (std::size_t i = values.size() - 1; i > 0; --i) {
    turned += std::arg((1.0 + std::conj(values[i - 1])) / (1.0 + std::conj(values[i])));
  }
  // Across the origin: the half-circles turn by −180° a pole; the step is that, to whole turns.
  const double across = std::arg((1.0 + values.front()) / (1.0 + std::conj(values.front())));
  const double indent = -kPi * PolesAtOrigin(loop);
  turned += across + 2 * kPi * std::round((indent - across) / (2 * kPi));
  for (std::size_t i = 1; i < values.size(); ++i) {
    turned += std::arg((1.0 + values[i]) / (1.0 + values[i - 1]));
  }
  return turned / (2 * kPi);
}

TEST(RobotLoops, NyquistCriterionHoldsForEveryDesign) {
  // A closed loop is stable exactly when 1 + L(jω) circles the origin counter-clockwise once for
  // each open-loop pole in the right half-plane (the Nyquist criterion; Franklin, Powell and
  // Emami-Naeini, Feedback Control of Dynamic Systems, the Nyquist stability criterion; from
  // memory). Every design here is stable, so the turns must equal the loop's unstable poles.
  for (const char* file : {"courier.xml", "tabletop.xml"}) {
    const RobotLoops r = Robot(file);
    for (const ControllerReport* report : r.reports) {
      ASSERT_TRUE(report->ok) << file << ": " << report->message;
      const BrokenLoop open = LoopAtWheels(r.set.plant, report->measurement, report->controller);
      for (const StateSpace& loop : {LoopAtInput(open, 0), CommonModeLoop(open)}) {
        // Unstable: in the right half-plane and not at the origin (whose poles the contour
        // passes on their right).
        const Eigen::VectorXcd poles = loop.A.eigenvalues();
        int unstable = 0;
        for (const Cd& p : poles) {
          unstable += p.real() > 0 && std::abs(p) > 1e-6 * poles.cwiseAbs().maxCoeff();
        }
        EXPECT_NEAR(Encirclements(loop), unstable, 0.02) << file << " " << report->message;
      }
    }
  }
}

TEST(RobotLoops, PhaseAtTheGainCrossoverIsThePhaseMargin) {
  // The margin analysis solves for its crossovers exactly; the curve read at that frequency must
  // show |L| = 1 and a phase 180° − margin away from −180° (the definition of the phase margin).
  const RobotLoops r = Robot("courier.xml");
  for (const ControllerReport* report : r.reports) {
    const LoopMargins& left = report->loop.channel_margins.at(0);
    if (!std::isfinite(left.phase_rad_s)) continue;
    const BrokenLoop open = LoopAtWheels(r.set.plant, report->measurement, report->controller);
    const Cd l = FrequencyResponse(LoopAtInput(open, 0), 0, {left.phase_rad_s})[0];
    EXPECT_NEAR(std::abs(l), 1, 1e-6) << report->message;
    EXPECT_NEAR(180 - std::abs(std::arg(l)) * 180 / kPi, left.phase_deg, 1e-6);
  }
}

TEST(RobotLoops, BothWheelsMarginsAreTheWorseOfTheTwoModes) {
  // On a robot symmetric left to right a gain or phase on both wheels at once acts on the common
  // (balance) and differential (heading) loops apart: the both-wheels margins are the worse of
  // the two loops' own (derived by hand from det(I + kL) = (1 + k L_c)(1 + k L_d)).
  const RobotLoops r = Robot("courier.xml");
  Eigen::Matrix2d T;
  T << 1, 1, 1, -1;
  T /= std::sqrt(2.0);
  for (const ControllerReport* report : {&r.set.lqr, static_cast<const ControllerReport*>(&r.set.hinf)}) {
    const BrokenLoop open = LoopAtWheels(r.set.plant, report->measurement, report->controller);
    const AnalysisResult<LoopMargins> common = SisoMargins(CommonModeLoop(open));
    const AnalysisResult<LoopMargins> differential =
        SisoMargins(LoopAtInput(BrokenLoop{open.A, open.B * T, T * open.C}, 1));
    ASSERT_TRUE(common.has_value() && differential.has_value());
    const LoopMargins& both = report->loop.both_wheels;
    // Equal to a relative `tolerance`, or both infinite.
    const auto same = [](double a, double b, double tolerance) {
      return a == b || std::abs(a - b) <= tolerance * std::abs(b);
    };
    EXPECT_PRED3(same, std::min(common->gain_high, differential->gain_high), both.gain_high, 1e-6);
    EXPECT_PRED3(same, std::max(common->gain_low, differential->gain_low), both.gain_low, 1e-6);
    EXPECT_PRED3(same, std::min(common->phase_deg, differential->phase_deg), both.phase_deg, 1e-5);
    EXPECT_PRED3(same, std::min(common->delay_s, differential->delay_s), both.delay_s, 1e-5);
  }
}

TEST(PushResponse, PeaksAgreeWithTheDesignPushsPeaks) {
  // The same loop and push as LinearPushPeaks (which samples 200 times a push, this 20): the
  // largest tilt and current agree to what the coarser sampling can miss at a smooth peak.
  for (const char* file : {"courier.xml", "tabletop.xml"}) {
    const model::RobotModel robot = Demo(file);
    const DesignSet set = DesignAll(robot, {});
    const CurrentMap current = MotorCurrent(robot, set.plant.input);
    const Result<PushPeaks> peaks = LinearPushPeaks(set.plant, set.lqr.K, current, set.design_push);
    ASSERT_TRUE(Succeeded(peaks));
    const Result<PushResponse> response = ResponseToPush(
        PushedLoop(set.plant, set.lqr.measurement, set.lqr.controller), current, set.design_push);
    ASSERT_TRUE(Succeeded(response));
    double tilt = 0, amps = 0;
    for (std::size_t k = 0; k < response->time_s.size(); ++k) {
      tilt = std::max(tilt, std::abs(response->pitch_rad[k]));
      amps = std::max({amps, std::abs(response->current_left_A[k]),
                       std::abs(response->current_right_A[k])});
    }
    EXPECT_NEAR(tilt, peaks->tilt_rad, 0.01 * peaks->tilt_rad) << file;
    EXPECT_LE(tilt, peaks->tilt_rad * (1 + 1e-9)) << file;
    EXPECT_NEAR(amps, peaks->current_A, 0.01 * peaks->current_A) << file;
    // Starts at rest, the push a half-sine that ends at its duration, and the loop settles.
    EXPECT_EQ(response->pitch_rad.front(), 0);
    EXPECT_NEAR(response->push_N[10], set.design_push.peak_N(), 1e-9 * set.design_push.peak_N());
    EXPECT_EQ(response->push_N[20], 0);
    EXPECT_NEAR(response->time_s[20], set.design_push.duration_s, 1e-12);
    EXPECT_LT(std::abs(response->pitch_rad.back()), 1e-3 * tilt) << file;
  }
}

TEST(PushResponse, RefusesAnUnstableLoopAndBadSizes) {
  const model::RobotModel robot = Demo("courier.xml");
  const DesignSet set = DesignAll(robot, {});
  const CurrentMap current = MotorCurrent(robot, set.plant.input);
  // No controller: the robot falls.
  const Result<PushResponse> open = ResponseToPush(
      PushedLoop(set.plant, FullState(), StateFeedback(Gain::Zero())), current, set.design_push);
  ASSERT_FALSE(open.has_value());
  EXPECT_NE(open.error().find("unstable"), std::string::npos) << open.error();
  EXPECT_FALSE(ResponseToPush(StateSpace{}, current, set.design_push).has_value());
  const StateSpace pushed = PushedLoop(set.plant, set.lqr.measurement, set.lqr.controller);
  EXPECT_FALSE(ResponseToPush(pushed, current, DesignPush{0, 1}).has_value());
}

}  // namespace
}  // namespace upright::design
