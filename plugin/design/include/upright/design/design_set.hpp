// DesignSet: everything `upright design` reports for one robot — the linear model and, for each
// built-in controller (LQR, H-infinity, LQG, PID), its gains, closed-loop poles, push norm and
// margins, or the reason it could not be designed; and whether each design is usable as sampled.
#pragma once

#include <string>
#include <vector>

#include "upright/design/closed_loop.hpp"
#include "upright/design/delayed_loop.hpp"
#include "upright/design/design_push.hpp"
#include "upright/design/discrete_hinf.hpp"
#include "upright/design/gamma_choice.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/lqg_filter.hpp"
#include "upright/design/pid.hpp"
#include "upright/design/robot_limits.hpp"
#include "upright/design/sampled_loop.hpp"
#include "upright/design/synthesis.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::design {

struct DesignRequest {
  InputKind input = InputKind::kTorque;
  double rate_hz = 0;           // controller sample rate; 0 = the model's control rate
  double gamma = 0;             // H-infinity γ; 0 = gamma_factor × γ_opt
  double gamma_factor = 0;      // > 1; 0 = by the rule of ChooseGamma (gamma_choice.hpp)
  double push_height_m = -1;    // < 0: at the lumped COM height
  double push_scale_N = 0;      // w = 1 means this push; 0 = 10 % of the robot's weight
  DesignWeights weights;        // fields left to the robot resolved by WeightsForRobot
  PidPoles pid_poles;           // where the PID rule places its poles (pid.hpp)
  // The first broken rule ("DesignRequest::gamma_factor = 1, must be > 1 (or 0 ...)"); success
  // when there is none.
  Status Validate() const;
};

// What a controller's design came to: made with its sampled loop stable (or not analysed, PID);
// made, but its loop sampled at the control rate unstable; not made; or not offered for this
// input (PID with voltage input).
enum class DesignStatus { kOk, kUnstableSampled, kFailed, kUnsupported };

// "ok", "unstable_sampled", "failed", "unsupported".
const char* ToString(DesignStatus status);

struct ControllerReport {
  bool ok = false;        // designed, with its continuous loop analysed
  bool supported = true;  // false: this controller is not offered for the requested input
  std::string message = "not designed";
  Gain K = Gain::Zero();          // continuous state feedback (LQG: its regulator)
  Gain K_discrete = Gain::Zero();  // at the sample rate, zero-order hold (LQR, H-infinity, LQG)
  LoopAnalysis loop;
  // The loop as the module samples it, with the sensors' latency (LQR and H-infinity with the
  // true state, LQG with its filter); not analysed for PID.
  SampledPoles sampled;
  SampledMargins sampled_margins;
  // The loops the figures come from, for pictures (loop_response.hpp, push_response.hpp): the
  // continuous controller and what it measures, and the sampled loop with the latency broken at
  // the wheel inputs (period 0 when not analysed).
  Measurement measurement;
  LinearController controller;
  BrokenLoop sampled_loop;
  // The delay in the loop the module runs that none of the figures above include: 0 when the
  // sampled loop is analysed (it includes the latency), otherwise the sensors' latency plus half
  // a control period (the hold), s.
  double unanalysed_delay_s = 0;

  DesignStatus status() const;
  // True when the design is made and its delay margin is below unanalysed_delay_s.
  bool delay_margin_short() const { return ok && loop.margins.delay_s < unanalysed_delay_s; }
};

// Where the H-infinity design's γ came from.
enum class GammaSource {
  kRule,    // ChooseGamma: the smallest factor keeping the design push within the robot's limits
  kFactor,  // DesignRequest::gamma_factor × γ_opt
  kGiven,   // DesignRequest::gamma
};

// K and the loop figures are the continuous design's, at gamma; K_discrete, the sampled loop and
// the *_discrete figures are the hinf module's design at the sample rate (discrete_hinf.hpp). Both
// sit at the same γ / γ_opt, each of its own γ_opt: the rule's factor, the one asked for, or a γ
// given for both.
struct HinfReport : ControllerReport {
  double gamma = 0;      // the continuous design's: factor × gamma_opt, or the γ asked for
  double gamma_opt = 0;  // the continuous problem's γ_opt
  // The discrete design's γ (factor × gamma_opt_discrete, or the γ asked for), the discrete
  // problem's γ_opt at the sample rate, and the sampled loop's push norm (< gamma_discrete).
  double gamma_discrete = 0;
  double gamma_opt_discrete = 0;
  double norm_discrete = 0;
  GammaSource source = GammaSource::kRule;
  GammaChoice choice;  // the rule's, on the discrete design, when source is kRule
  // The trade-off over γ of the discrete design at the sample rate (GammaTradeOff), empty when a
  // γ_opt was not found.
  std::vector<GammaPoint> trade_off;
};

struct LqgReport : ControllerReport {
  SensorLinearisation sensors;  // the filter's (DesignLqgFilter: accelerometer row widened)
  Eigen::MatrixXd L;            // continuous Kalman–Bucy gain (for the analysis)
  Eigen::MatrixXd L_discrete;   // discrete measurement-update gain: the lqg module's
  Eigen::MatrixXd Ad, Bd;       // the plant the filter predicts with, at the sample period (ZOH)
  // The fastest continuous estimator pole, max |eig(A − L C)|. Beyond the Nyquist rate
  // π · rate_hz the module's sampled filter cannot follow the continuous one the figures analyse.
  double estimator_fastest_1_s = 0;
};

struct PidReport : ControllerReport {
  PidGains gains;
};

// The robot's limits the defaults and the γ rule draw on.
struct RobotLimits {
  GroundContactTilt ground_contact;  // GroundContact at the plant's equilibrium pitch
  double input_limit = 0;            // InputLimit for the request's input: N·m or V per wheel
  double current_limit_A = 0;        // the drive's
};

// The discrete LQR on the delay-augmented model (RobotDelayedLqr), as the lqr module runs it with
// latency_compensation = true: its gain on the state the sensors report and on the module's own
// past commands, and its sampled loop with the latency.
struct DelayAwareLqrReport {
  bool ok = false;
  std::string message = "not designed";
  Eigen::MatrixXd K;  // 2 × (6 + 2 · memory)
  int memory = 0;     // past commands per wheel the gain reads
  SampledPoles sampled;
  SampledMargins sampled_margins;
  BrokenLoop sampled_loop;  // broken at the wheel inputs, with the latency
};

struct DesignSet {
  LinearModel plant;
  DesignRequest request;  // with defaults resolved (rate, push scale, weights, γ)
  RobotLimits limits;
  DesignPush design_push;  // DesignPushFor(plant, push scale)
  Performance performance;
  ControllerReport lqr;
  HinfReport hinf;
  LqgReport lqg;
  PidReport pid;
  DelayAwareLqrReport lqr_delay_aware;
  bool all_ok() const { return lqr.ok && hinf.ok && lqg.ok && pid.ok; }
};

// Every design for `model`. Weights the robot cannot resolve (WeightsForRobot) fail every
// design with that reason.
DesignSet DesignAll(const model::RobotModel& model, const DesignRequest& request);

}  // namespace upright::design
