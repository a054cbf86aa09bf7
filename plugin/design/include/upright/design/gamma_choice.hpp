// The H-infinity γ a design sits at by default — the rule that picks it from the robot's limits
// — and the trade-off over γ that `upright design` prints beside it.
#pragma once

#include <vector>

#include "upright/base/result.hpp"
#include "upright/design/closed_loop.hpp"
#include "upright/design/design_push.hpp"
#include "upright/design/discrete_hinf.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/robot_limits.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::design {

// What the design push may reach on the linear loop: the smaller ground-contact tilt (beyond it
// the chassis is on the ground) and the drive's current limit (model::MotorModel::current_limit_A).
struct PushLimits {
  double tilt_rad = 0;
  double current_A = 0;
};
PushLimits PushLimitsOf(const model::RobotModel& model, double equilibrium_pitch_rad);

// The range of γ / γ_opt the rule searches. Near γ_opt the Riccati solution, and with it the
// gain, grows like 1 / (γ − γ_opt); at 10 γ_opt the gain is within 1 % of the LQR's on the demo
// robots.
inline constexpr double kGammaFactorLowest = 1.01;
inline constexpr double kGammaFactorHighest = 10;

struct GammaChoice {
  double factor = 0;        // γ / γ_opt
  double gamma = 0;         // factor × γ_opt
  PushPeaks peaks;          // the design push on the loop at that γ
  bool limits_met = false;  // false: not even kGammaFactorHighest keeps the push within them
};

// The designs the rule and the table look at: with period_s = 0 the continuous central controller
// (RobotHinf) on the continuous loop; with period_s > 0 the discrete one at that period
// (RobotDiscreteHinf, the hinf module's design), its loop sampled as the module runs it
// (SampledPushPeaks, SampledPushNorm), and `gamma_opt` then the discrete problem's.
//
// The rule: the smallest γ from kGammaFactorLowest to kGammaFactorHighest times γ_opt whose
// central H-infinity state feedback keeps the design push (design_push.hpp) within PushLimits on
// the linear model — as robust to the worst push as the robot's chassis and motors allow, and
// no further up the cliff of gains near γ_opt. Found by geometric bisection of γ / γ_opt to 1 %
// (the peaks fall as γ grows); when even the highest factor fails the limits, that factor, with
// limits_met false. `performance` is the design's (weights and push scale), `gamma_opt` its γ_opt.
Result<GammaChoice> ChooseGamma(const LinearModel& plant, const Performance& performance,
                                double gamma_opt, const model::RobotModel& model,
                                double period_s = 0);

// One row of the trade-off: the central H-infinity design at γ = factor × γ_opt, or the LQR
// (factor and γ infinite: the limit of the H-infinity design as γ grows; the discrete LQR when
// period_s > 0).
struct GammaPoint {
  double factor = 0;
  double gamma = 0;
  double gain_norm = 0;  // ‖K‖₂, the largest singular value of K (SI units, N·m or V per unit)
  double push_norm = 0;  // ‖T_zw‖∞ of the loop (analysis.hpp)
  PushPeaks peaks;       // the design push on the linear loop
  bool within_limits = false;
  bool ok = false;  // false: this design or its analysis failed (the figures are not set)
};

// The factors of the table `upright design` prints, before the LQR row.
inline constexpr double kTradeOffFactors[] = {1.01, 1.1, 1.2, 1.5, 2, 3, 5};

// The rows for kTradeOffFactors, then the LQR.
std::vector<GammaPoint> GammaTradeOff(const LinearModel& plant, const Performance& performance,
                                      double gamma_opt, const model::RobotModel& model,
                                      double period_s = 0);

}  // namespace upright::design
