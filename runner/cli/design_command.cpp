// `upright design MODEL`: the linear model and the built-in controllers' gains, closed-loop
// poles, push norms and margins, with a status per controller, as readable text or as one JSON
// object (--json).
#include <Eigen/Dense>
#include <array>
#include <cmath>
#include <complex>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <numbers>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "commands.hpp"
#include "design_folder.hpp"
#include "gains_header.hpp"
#include "log.hpp"
#include "upright/base/number_text.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "upright/runner/common/atomic_file.hpp"
#include "upright/runner/common/json_text.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/report/report.hpp"
#include "upright_version.hpp"

namespace upright::cli {
namespace {

using design::ControllerReport;
using design::DesignSet;
using design::DesignStatus;
using runner::JsonText;

constexpr const char* kInputNames[] = {"left", "right"};

// Each controller's report with its heading in the text.
struct Named {
  const char* title;
  const ControllerReport* report;
};

std::array<Named, 4> Controllers(const DesignSet& d) {
  return {{{"LQR", &d.lqr},
           {"H-infinity state feedback", &d.hinf},
           {"LQG (LQR on a Kalman estimate from the model's sensors)", &d.lqg},
           {"PID cascade (tilt PD inside speed PI, yaw-rate PI)", &d.pid}}};
}

// A figure of the text output: 4 significant digits, "inf" for an unbounded margin.
std::string Figure(double v) { return SignificantText(v, 4); }

// Why a controller is not usable, in a phrase; "ok" when it is.
std::string Verdict(const ControllerReport& c) {
  switch (c.status()) {
    case DesignStatus::kOk:
      return "ok";
    case DesignStatus::kUnstableSampled:
      return "designed, but UNSTABLE as the module samples it at " +
             Figure(1 / c.sampled.period_s) + " Hz with the sensors' latency (max |z| " +
             Figure(c.sampled.max_abs_z) +
             " >= 1): the continuous figures below do not hold for the loop the module runs";
    case DesignStatus::kFailed:
      return "FAILED: " + c.message;
    case DesignStatus::kUnsupported:
      return "not offered: " + c.message;
  }
  return c.message;
}

// The warning when the delay margin is below the delay the figures leave out; "" otherwise.
std::string DelayWarning(const ControllerReport& c, double latency_s, double rate_hz) {
  if (!c.delay_margin_short()) return "";
  std::string what = "sensors latency_s " + Figure(latency_s) + " s";
  if (!c.sampled.analysed())
    what += ", plus half a period of the hold at " + Figure(rate_hz) + " Hz";
  return "delay margin " + Figure(c.loop.margins.delay_s) + " s is below the " +
         Figure(c.unanalysed_delay_s) + " s of delay these figures leave out (" + what +
         "): the loop as the module runs it is likely unstable";
}

// A matrix as row-major nested arrays.
void WriteMatrix(JsonText& j, std::string_view key, const Eigen::MatrixXd& m) {
  j.BeginArray(key);
  for (Eigen::Index i = 0; i < m.rows(); ++i) {
    j.BeginArray();
    for (Eigen::Index k = 0; k < m.cols(); ++k) j.Number({}, m(i, k));
    j.EndArray();
  }
  j.EndArray();
}

// Complex numbers as [re, im] pairs.
void WritePoles(JsonText& j, std::string_view key, const std::vector<std::complex<double>>& poles) {
  j.BeginArray(key);
  for (const auto& p : poles) {
    j.BeginArray();
    j.Number({}, p.real());
    j.Number({}, p.imag());
    j.EndArray();
  }
  j.EndArray();
}

void WriteMargins(JsonText& j, const design::LoopMargins& m, std::string_view key = "margins") {
  j.BeginObject(key);
  j.Number("gain_low", m.gain_low);
  j.Number("gain_high", m.gain_high);
  j.Number("phase_deg", m.phase_deg);
  j.Number("disk_alpha", m.disk_alpha);
  j.Number("disk_gain_low", m.disk_gain_low);
  j.Number("disk_gain_high", m.disk_gain_high);
  j.Number("disk_phase_deg", m.disk_phase_deg);
  j.Number("delay_s", m.delay_s);
  j.EndObject();
}

// The sampled loop with the latency: its poles and, when it is stable, its margins (the delay
// margin beyond the latency).
void WriteSampled(JsonText& j, const design::SampledPoles& poles,
                  const design::SampledMargins& margins) {
  if (!poles.analysed()) return;
  j.BeginObject("sampled");
  j.Number("rate_hz", 1 / poles.period_s);
  j.Number("max_abs_z", poles.max_abs_z);
  WritePoles(j, "poles", poles.s);
  if (margins.analysed()) {
    j.Number("latency_s", margins.latency_s);
    WriteMargins(j, margins.worst_wheel, "margins");
    WriteMargins(j, margins.both_wheels, "margins_both_wheels");
  }
  j.EndObject();
}

void WriteController(JsonText& j, const ControllerReport& c) {
  const DesignStatus status = c.status();
  j.String("status", design::ToString(status));
  j.Bool("ok", status == DesignStatus::kOk);
  j.String("message", status == DesignStatus::kOk ? c.message : Verdict(c));
  WriteMatrix(j, "K", c.K);
  WritePoles(j, "poles", c.loop.poles);
  j.Number("push_norm", c.loop.push_norm);
  WriteMargins(j, c.loop.margins);
  WriteMargins(j, c.loop.both_wheels, "margins_both_wheels");
  WriteSampled(j, c.sampled, c.sampled_margins);
  j.Number("unanalysed_delay_s", c.unanalysed_delay_s);
  j.Bool("delay_margin_short", c.delay_margin_short());
}

// The robot's limits, the weights' maxima drawn from them and the design push.
void WriteLimits(JsonText& j, const DesignSet& d) {
  const double deg = 180 / std::numbers::pi;
  j.BeginObject("limits");
  j.Number("ground_contact_tilt_deg", d.limits.ground_contact.smallest_rad() * deg);
  j.Number("ground_contact_forward_deg", d.limits.ground_contact.forward_rad * deg);
  j.Number("ground_contact_backward_deg", d.limits.ground_contact.backward_rad * deg);
  j.Number("input_limit", d.limits.input_limit);
  j.Number("current_limit_A", d.limits.current_limit_A);
  j.EndObject();
  j.BeginObject("weights");
  j.Number("max_tilt_deg", d.request.weights.max_tilt_deg);
  j.Number("max_input_fraction", d.request.weights.max_input_fraction);
  j.Number("max_input", d.request.weights.max_input_fraction * d.limits.input_limit);
  j.EndObject();
  j.BeginObject("design_push");
  j.Number("impulse_Ns", d.design_push.impulse_Ns);
  j.Number("duration_s", d.design_push.duration_s);
  j.Number("peak_N", d.design_push.peak_N());
  j.Number("height_m", d.plant.push_height_m);
  j.EndObject();
}

const char* SourceName(design::GammaSource source) {
  switch (source) {
    case design::GammaSource::kRule:
      return "rule";
    case design::GammaSource::kFactor:
      return "factor";
    case design::GammaSource::kGiven:
      return "given";
  }
  return "rule";
}

// Where γ came from and the trade-off over γ (the LQR row's factor and γ are null: infinite).
void WriteGammaChoice(JsonText& j, const design::HinfReport& h) {
  const double deg = 180 / std::numbers::pi;
  j.Number("gamma_factor", h.gamma_opt > 0 ? h.gamma / h.gamma_opt : NAN);
  j.String("gamma_source", SourceName(h.source));
  if (h.source == design::GammaSource::kRule) j.Bool("gamma_limits_met", h.choice.limits_met);
  j.BeginArray("gamma_table");
  for (const design::GammaPoint& p : h.trade_off) {
    j.BeginObject();
    j.Number("gamma_factor", p.factor);
    j.Number("gamma", p.gamma);
    j.Bool("lqr", std::isinf(p.factor));
    j.Bool("ok", p.ok);
    j.Number("gain_norm", p.ok ? p.gain_norm : NAN);
    j.Number("push_norm", p.ok ? p.push_norm : NAN);
    j.Number("push_peak_tilt_deg", p.ok ? p.peaks.tilt_rad * deg : NAN);
    j.Number("push_peak_current_A", p.ok ? p.peaks.current_A : NAN);
    j.Bool("within_limits", p.within_limits);
    j.EndObject();
  }
  j.EndArray();
}

std::string Json(const model::RobotModel& model, const DesignSet& d) {
  JsonText j;
  j.BeginObject();
  j.String("robot", model.name);
  j.String("input", d.plant.input == design::InputKind::kTorque ? "torque" : "voltage");
  j.Number("rate_hz", d.request.rate_hz);
  j.Number("latency_s", model.sensors.latency_s);
  j.BeginArray("states");
  for (int i = 0; i < design::kStates; ++i) j.String({}, design::StateName(i));
  j.EndArray();
  WriteMatrix(j, "A", d.plant.A);
  WriteMatrix(j, "B", d.plant.B);
  WriteMatrix(j, "E", d.plant.E);
  j.Number("push_height_m", d.plant.push_height_m);
  j.Number("push_scale_N", d.performance.push_scale_N);
  j.Number("fall_rate_1_s", d.plant.fall_rate_1_s);
  j.Number("equilibrium_pitch_rad", d.plant.equilibrium_pitch_rad);
  WriteMatrix(j, "Q", d.performance.Q);
  WriteMatrix(j, "R", d.performance.R);
  WriteLimits(j, d);

  j.BeginObject("lqr");
  WriteController(j, d.lqr);
  WriteMatrix(j, "K_discrete", d.lqr.K_discrete);
  j.EndObject();

  j.BeginObject("hinf");
  WriteController(j, d.hinf);
  j.Number("gamma", d.hinf.gamma);
  j.Number("gamma_opt", d.hinf.gamma_opt);
  j.Number("norm", d.hinf.loop.push_norm);
  WriteMatrix(j, "K_discrete", d.hinf.K_discrete);
  j.Number("gamma_discrete", d.hinf.gamma_discrete);
  j.Number("gamma_opt_discrete", d.hinf.gamma_opt_discrete);
  j.Number("norm_discrete", d.hinf.norm_discrete);
  WriteGammaChoice(j, d.hinf);
  j.EndObject();

  j.BeginObject("lqg");
  WriteController(j, d.lqg);
  WriteMatrix(j, "K_discrete", d.lqg.K_discrete);
  WriteMatrix(j, "C", d.lqg.sensors.C);
  WriteMatrix(j, "D", d.lqg.sensors.D);
  WriteMatrix(j, "L_discrete", d.lqg.L_discrete);
  WriteMatrix(j, "Ad", d.lqg.Ad);
  WriteMatrix(j, "Bd", d.lqg.Bd);
  j.Number("estimator_fastest_1_s", d.lqg.estimator_fastest_1_s);
  j.EndObject();

  j.BeginObject("lqr_delay_aware");
  j.Bool("ok", d.lqr_delay_aware.ok);
  j.String("message", d.lqr_delay_aware.message);
  WriteMatrix(j, "K", d.lqr_delay_aware.K);
  j.Integer("memory", d.lqr_delay_aware.memory);
  WriteSampled(j, d.lqr_delay_aware.sampled, d.lqr_delay_aware.sampled_margins);
  j.EndObject();

  j.BeginObject("pid");
  WriteController(j, d.pid);
  const design::PidGains& g = d.pid.gains;
  j.BeginObject("gains");
  j.Number("tilt_kp_Nm_per_rad", g.tilt_kp_Nm_per_rad);
  j.Number("tilt_kd_Nm_s_per_rad", g.tilt_kd_Nm_s_per_rad);
  j.Number("speed_kp_rad_per_m_s", g.speed_kp_rad_per_m_s);
  j.Number("speed_ki_rad_per_m", g.speed_ki_rad_per_m);
  j.Number("yaw_kp_Nm_s_per_rad", g.yaw_kp_Nm_s_per_rad);
  j.Number("yaw_ki_Nm_per_rad", g.yaw_ki_Nm_per_rad);
  j.Number("max_tilt_ref_rad", g.max_tilt_ref_rad);
  j.EndObject();
  // Where the rule placed the poles: the request's pid_poles, and what they came to in rad/s
  // ("poles" is the closed loop's, as for every controller).
  const design::PidPoles& poles = d.request.pid_poles;
  j.BeginObject("pole_choices");
  j.Number("tilt_pole_factor", poles.tilt_pole_factor);
  j.Number("tilt_damping", poles.tilt_damping);
  j.Number("speed_pole_factor", poles.speed_pole_factor);
  j.Number("speed_damping", poles.speed_damping);
  j.Number("yaw_pole_factor", poles.yaw_pole_factor);
  j.Number("tilt_bandwidth_rad_s", g.tilt_bandwidth_rad_s);
  j.Number("speed_bandwidth_rad_s", g.speed_bandwidth_rad_s);
  j.Number("yaw_bandwidth_rad_s", g.yaw_bandwidth_rad_s);
  j.EndObject();
  j.EndObject();
  j.EndObject();
  return j.text();
}

void PrintMatrix(const char* title, const Eigen::MatrixXd& m, bool state_columns) {
  std::printf("%s\n", title);
  if (state_columns) {
    std::printf("  %16s", "");
    for (int j = 0; j < m.cols(); ++j) std::printf(" %15s", design::StateName(j));
    std::printf("\n");
  }
  for (int i = 0; i < m.rows(); ++i) {
    std::printf("  %16s", state_columns ? (i < 2 ? kInputNames[i] : "") : design::StateName(i));
    for (int j = 0; j < m.cols(); ++j) std::printf(" %15s", SignificantText(m(i, j), 6).c_str());
    std::printf("\n");
  }
}

// Poles in 1/s, a conjugate pair once as re±imi.
void PrintPoles(const std::vector<std::complex<double>>& poles) {
  for (const auto& p : poles) {
    if (p.imag() < 0) continue;
    std::printf(" %s", Figure(p.real()).c_str());
    if (p.imag() != 0) std::printf("±%si", Figure(p.imag()).c_str());
  }
  std::printf("\n");
}

// Margins as one line: the common gain range, phase and delay, and the disk margin with what it
// guarantees; `delay_what` says what the delay margin is measured from.
std::string MarginsLine(const design::LoopMargins& m, const char* disk_what,
                        const char* delay_what) {
  return "gain " + Figure(m.gain_low) + ".." + Figure(m.gain_high) + ", phase " +
         Figure(m.phase_deg) + " deg, delay " + Figure(m.delay_s) + " s" + delay_what + "; " +
         disk_what + "disk alpha " + Figure(m.disk_alpha) + " (gain " + Figure(m.disk_gain_low) +
         ".." + Figure(m.disk_gain_high) + ", phase " + Figure(m.disk_phase_deg) + " deg)";
}

// Both wheels at once beside the loop-at-a-time figures, and what a lower gain margin of 0 means.
void PrintBothWheels(const design::LoopMargins& worst, const design::LoopMargins& both) {
  std::printf("input margins (both wheels at once): %s\n",
              MarginsLine(both, "multi-loop ", "").c_str());
  if (worst.gain_low == 0 && both.gain_low > 0) {
    std::printf(
        "note: the worst wheel's lower gain margin is 0 because either wheel alone can balance "
        "the robot (the other at zero gain); both wheels together must keep a gain above %s\n",
        Figure(both.gain_low).c_str());
  }
}

// The sampled loop's margins (stable loops only): the delay margin beyond the latency.
void PrintSampledMargins(const design::SampledMargins& m) {
  if (!m.analysed()) return;
  std::printf("sampled margins (worst wheel): %s\n",
              MarginsLine(m.worst_wheel, "", " beyond the latency").c_str());
  std::printf("sampled margins (both wheels at once): %s\n",
              MarginsLine(m.both_wheels, "multi-loop ", " beyond the latency").c_str());
}

// The sampled loop's heading line and poles.
void PrintSampledPoles(const design::SampledPoles& sampled, double latency_s) {
  std::printf(
      "sampled as the module runs it, at %s Hz with the sensors' %s s latency: max |z| %s (%s); "
      "poles (1/s, log z / T):",
      SignificantText(1 / sampled.period_s, 6).c_str(), Figure(latency_s).c_str(),
      Figure(sampled.max_abs_z).c_str(), sampled.max_abs_z < 1 ? "stable" : "UNSTABLE");
  PrintPoles(sampled.s);
}

void PrintController(const char* title, const ControllerReport& c, double latency_s,
                     double rate_hz) {
  std::printf("\n== %s: %s\n", title, Verdict(c).c_str());
  if (c.K.norm() > 0) PrintMatrix("gain K (u = -K x), N·m or V per state unit", c.K, true);
  if (c.K_discrete.norm() > 0) {
    const std::string heading = "gain the module applies at " + Figure(rate_hz) +
                              " Hz (u_k = -K x_k, zero-order hold; --export-c writes it)";
    PrintMatrix(heading.c_str(), c.K_discrete, true);
  }
  if (!c.loop.poles.empty()) {
    std::printf("closed-loop poles (1/s):");
    PrintPoles(c.loop.poles);
    std::printf("push norm ||T_zw||inf: %s\n", Figure(c.loop.push_norm).c_str());
    const design::LoopMargins& m = c.loop.margins;
    std::printf(
        "input margins (worst wheel): gain %s..%s, phase %s deg, disk alpha %s "
        "(gain %s..%s, phase %s deg), delay %s s\n",
        Figure(m.gain_low).c_str(), Figure(m.gain_high).c_str(), Figure(m.phase_deg).c_str(),
        Figure(m.disk_alpha).c_str(), Figure(m.disk_gain_low).c_str(),
        Figure(m.disk_gain_high).c_str(), Figure(m.disk_phase_deg).c_str(),
        Figure(m.delay_s).c_str());
    PrintBothWheels(m, c.loop.both_wheels);
    const std::string warning = DelayWarning(c, latency_s, rate_hz);
    if (!warning.empty()) std::printf("warning: %s\n", warning.c_str());
  }
  if (c.sampled.analysed()) {
    PrintSampledPoles(c.sampled, latency_s);
    PrintSampledMargins(c.sampled_margins);
  }
}

// The delay-aware LQR: the gain on the state and the module's past commands, and its loop.
void PrintDelayAware(const design::DelayAwareLqrReport& r, double latency_s) {
  std::printf(
      "\n== LQR on the delay-augmented model (lqr module, latency_compensation = true): %s\n",
      r.ok ? "ok" : ("FAILED: " + r.message).c_str());
  if (!r.ok) return;
  std::printf("gain on the state and on each wheel's last %d command(s), oldest first:\n",
              r.memory);
  for (int i = 0; i < r.K.rows(); ++i) {
    std::printf("  %16s", kInputNames[i]);
    for (int k = 0; k < r.K.cols(); ++k) {
      std::printf(" %s", SignificantText(r.K(i, k), 6).c_str());
    }
    std::printf("\n");
  }
  if (r.sampled.analysed()) {
    PrintSampledPoles(r.sampled, latency_s);
    PrintSampledMargins(r.sampled_margins);
  }
}

// The robot's limits, the weights' maxima drawn from them, and the design push.
void PrintLimits(const DesignSet& d, bool tilt_given) {
  const double deg = 180 / std::numbers::pi;
  const design::GroundContactTilt& contact = d.limits.ground_contact;
  const bool torque = d.plant.input == design::InputKind::kTorque;
  const char* unit = torque ? "N·m" : "V";
  std::printf(
      "limits: the chassis outline meets the ground at %s deg of tilt (forward %s, back %s); "
      "%s %s %s per wheel; current limit %s A\n",
      Figure(contact.smallest_rad() * deg).c_str(), Figure(contact.forward_rad * deg).c_str(),
      Figure(contact.backward_rad * deg).c_str(), torque ? "stall torque" : "supply",
      Figure(d.limits.input_limit).c_str(), unit, Figure(d.limits.current_limit_A).c_str());
  const design::DesignWeights& w = d.request.weights;
  const std::string tilt_why = tilt_given ? "as given" : "a fifth of the ground-contact tilt";
  std::printf("weights: max tilt %s deg (%s), max input %s %s (%s of the %s)\n",
              Figure(w.max_tilt_deg).c_str(), tilt_why.c_str(),
              Figure(w.max_input_fraction * d.limits.input_limit).c_str(), unit,
              Figure(w.max_input_fraction).c_str(), torque ? "stall torque" : "supply");
  std::printf(
      "design push: %s N·s at %s m above the axle, a %s s half-sine peaking at %s N (the push "
      "scale for 1 s, over two fall time constants)\n",
      Figure(d.design_push.impulse_Ns).c_str(), SignificantText(d.plant.push_height_m, 3).c_str(),
      Figure(d.design_push.duration_s).c_str(), Figure(d.design_push.peak_N()).c_str());
}

// How γ was chosen, the hinf module's discrete design, and the trade-off table over γ / γ_opt of
// that design.
void PrintGamma(const DesignSet& d, double rate_hz) {
  const design::HinfReport& h = d.hinf;
  if (!(h.gamma_opt > 0)) return;
  const double deg = 180 / std::numbers::pi;
  std::string why;
  switch (h.source) {
    case design::GammaSource::kGiven:
      why = "as given (--gamma)";
      break;
    case design::GammaSource::kFactor:
      why = "as given (--gamma-factor)";
      break;
    case design::GammaSource::kRule:
      why = h.choice.limits_met
                ? "the smallest factor whose design at the module's rate keeps the design push "
                  "within the ground-contact tilt and the current limit on the linear model"
                : "NO factor up to " + Figure(design::kGammaFactorHighest) +
                      " keeps the design push within the ground-contact tilt and the current "
                      "limit on the linear model at the module's rate; the highest is used";
      break;
  }
  if (h.gamma > 0) {
    std::printf("gamma %s = %s x gamma_opt %s: %s\n", SignificantText(h.gamma, 5).c_str(),
                SignificantText(h.gamma / h.gamma_opt, 3).c_str(),
                SignificantText(h.gamma_opt, 5).c_str(), why.c_str());
  }
  if (h.gamma_opt_discrete > 0 && h.gamma_discrete > 0) {
    std::printf(
        "the hinf module's design, discrete at %s Hz: gamma %s = %s x its gamma_opt %s, "
        "sampled push norm %s\n",
        SignificantText(rate_hz, 6).c_str(), SignificantText(h.gamma_discrete, 5).c_str(),
        SignificantText(h.gamma_discrete / h.gamma_opt_discrete, 3).c_str(),
        SignificantText(h.gamma_opt_discrete, 5).c_str(), Figure(h.norm_discrete).c_str());
  }
  if (h.trade_off.empty()) return;
  std::printf(
      "gamma trade-off of the module's design at %s Hz, the design push on the sampled loop:\n",
      SignificantText(rate_hz, 6).c_str());
  std::printf("  %15s %10s %10s %16s %17s  %s\n", "gamma/gamma_opt", "||K||", "push norm",
              "peak tilt (deg)", "peak current (A)", "within limits");
  for (const design::GammaPoint& p : h.trade_off) {
    const std::string factor = std::isinf(p.factor) ? "inf (LQR)" : Figure(p.factor);
    if (!p.ok) {
      std::printf("  %15s %10s\n", factor.c_str(), "not designed");
      continue;
    }
    std::printf("  %15s %10s %10s %16s %17s  %s\n", factor.c_str(), Figure(p.gain_norm).c_str(),
                Figure(p.push_norm).c_str(), Figure(p.peaks.tilt_rad * deg).c_str(),
                Figure(p.peaks.current_A).c_str(), p.within_limits ? "yes" : "no");
  }
}

void PrintText(const model::RobotModel& model, const DesignSet& d, bool tilt_given) {
  const design::LinearModel& p = d.plant;
  std::printf("robot '%s': linearised about upright (%s input, controllers at %s Hz)\n",
              model.name.c_str(),
              p.input == design::InputKind::kTorque ? "wheel torque" : "voltage",
              SignificantText(d.request.rate_hz, 6).c_str());
  std::printf(
      "lumped body %s kg, COM %s m above the axle; falls at %s 1/s "
      "(time constant %s s)\n",
      SignificantText(p.body.mass_kg, 3).c_str(), SignificantText(p.body.com_height_m, 3).c_str(),
      Figure(p.fall_rate_1_s).c_str(), SignificantText(1 / p.fall_rate_1_s, 3).c_str());
  PrintMatrix("A", p.A, false);
  PrintMatrix("B [left, right]", p.B, false);
  std::printf("performance: push of %s N at %s m above the axle → z = [Q½ x; R½ u]\n",
              Figure(d.performance.push_scale_N).c_str(),
              SignificantText(p.push_height_m, 3).c_str());
  PrintLimits(d, tilt_given);
  const double latency_s = model.sensors.latency_s;
  const double rate_hz = d.request.rate_hz;
  const auto controllers = Controllers(d);
  PrintController(controllers[0].title, d.lqr, latency_s, rate_hz);
  PrintController(controllers[1].title, d.hinf, latency_s, rate_hz);
  PrintGamma(d, rate_hz);
  PrintController(controllers[2].title, d.lqg, latency_s, rate_hz);
  const double nyquist_1_s = std::numbers::pi * d.request.rate_hz;
  if (d.lqg.ok && d.lqg.estimator_fastest_1_s > nyquist_1_s) {
    std::printf(
        "note: the continuous estimator reaches %s 1/s, beyond the %s 1/s Nyquist rate "
        "of %s Hz: the lqg module's sampled filter (same noise) is slower, so read these "
        "LQG figures as those of its continuous limit\n",
        Figure(d.lqg.estimator_fastest_1_s).c_str(), Figure(nyquist_1_s).c_str(),
        SignificantText(d.request.rate_hz, 6).c_str());
  }
  PrintDelayAware(d.lqr_delay_aware, latency_s);
  PrintController(controllers[3].title, d.pid, latency_s, rate_hz);
  const design::PidGains& g = d.pid.gains;
  if (d.pid.ok) {
    std::printf(
        "tilt kp %s N·m/rad, kd %s N·m·s/rad; speed kp %s rad/(m/s), ki %s rad/m; "
        "yaw kp %s N·m·s/rad, ki %s N·m/rad\n",
        Figure(g.tilt_kp_Nm_per_rad).c_str(), Figure(g.tilt_kd_Nm_s_per_rad).c_str(),
        Figure(g.speed_kp_rad_per_m_s).c_str(), Figure(g.speed_ki_rad_per_m).c_str(),
        Figure(g.yaw_kp_Nm_s_per_rad).c_str(), Figure(g.yaw_ki_Nm_per_rad).c_str());
    const design::PidPoles& poles = d.request.pid_poles;
    std::printf(
        "poles placed: tilt pair %s rad/s (%s × fall rate), damping %s; speed pair %s rad/s "
        "(%s ×), damping %s; yaw loop %s rad/s (%s ×)\n",
        Figure(g.tilt_bandwidth_rad_s).c_str(), Figure(poles.tilt_pole_factor).c_str(),
        Figure(g.tilt_damping).c_str(), Figure(g.speed_bandwidth_rad_s).c_str(),
        Figure(poles.speed_pole_factor).c_str(), Figure(g.speed_damping).c_str(),
        Figure(g.yaw_bandwidth_rad_s).c_str(), Figure(poles.yaw_pole_factor).c_str());
  }
  std::printf(
      "\nLinear-model figures only: check them on the plant (upright run) and on hardware "
      "with a tether or spotter.\n");
}

// The flag a DesignRequest or DesignWeights field is set by.
constexpr std::pair<const char*, const char*> kFlags[] = {
    {"DesignRequest::gamma_factor", "--gamma-factor"},
    {"DesignWeights::max_drift_m", "--max-drift-m"},
    {"DesignWeights::max_speed_m_s", "--max-speed-m-s"},
    {"DesignWeights::max_tilt_deg", "--max-tilt-deg"},
    {"DesignWeights::max_tilt_rate_deg_s", "--max-tilt-rate-deg-s"},
    {"DesignWeights::max_yaw_deg", "--max-yaw-deg"},
    {"DesignWeights::max_yaw_rate_deg_s", "--max-yaw-rate-deg-s"},
    {"DesignWeights::max_input_fraction", "--max-input-fraction"},
    {"PidPoles::tilt_pole_factor", "--tilt-pole-factor"},
    {"PidPoles::tilt_damping", "--tilt-damping"},
    {"PidPoles::speed_pole_factor", "--speed-pole-factor"},
    {"PidPoles::speed_damping", "--speed-damping"},
    {"PidPoles::yaw_pole_factor", "--yaw-pole-factor"},
};

// "DesignWeights::max_tilt_deg = -1, must be > 0" as the user typed it:
// "--max-tilt-deg = -1: must be > 0". A message about another field stays as it is.
std::string InFlagTerms(const std::string& message) {
  for (const auto& [field, flag] : kFlags) {
    const std::string prefix = std::string(field) + " = ";
    if (message.rfind(prefix, 0) != 0) continue;
    const std::string rest = message.substr(std::string(field).size());
    const auto comma = rest.find(", must");
    if (comma == std::string::npos) return flag + rest;
    return flag + rest.substr(0, comma) + ":" + rest.substr(comma + 1);
  }
  return message;
}

// The request with the typed options in: a value given must be a real one (the request's 0 or -1
// "default" cannot be typed). Otherwise the message, naming the flag.
Result<design::DesignRequest> ResolveFlags(const DesignOptions& o) {
  design::DesignRequest request = o.request;
  // "--rate = inf: must be finite and > 0 (...)": a value that is no finite number is told so.
  const auto refuse = [](const char* flag, double value, const char* rule) {
    return Failure(std::string(flag) + " = " + SignificantText(value, 6) + ": must be " +
                   (std::isfinite(value) ? "" : "finite and ") + rule);
  };
  if (o.rate_hz) {
    if (!(*o.rate_hz > 0) || !std::isfinite(*o.rate_hz)) {
      return refuse("--rate", *o.rate_hz, "> 0 (leave it out for the model's control rate_hz)");
    }
    request.rate_hz = *o.rate_hz;
  }
  if (o.gamma) {
    if (!(*o.gamma > 0) || !std::isfinite(*o.gamma)) {
      return refuse("--gamma", *o.gamma, "> 0 (leave it out for the rule of the design push)");
    }
    request.gamma = *o.gamma;
  }
  if (o.gamma_factor) {
    if (!(*o.gamma_factor > 1) || !std::isfinite(*o.gamma_factor)) {
      return refuse("--gamma-factor", *o.gamma_factor,
                    "> 1 (leave it out for the rule of the design push)");
    }
    request.gamma_factor = *o.gamma_factor;
  }
  if (o.max_tilt_deg) {
    if (!(*o.max_tilt_deg > 0) || !std::isfinite(*o.max_tilt_deg)) {
      return refuse("--max-tilt-deg", *o.max_tilt_deg,
                    "> 0 (leave it out for a fifth of the ground-contact tilt)");
    }
    request.weights.max_tilt_deg = *o.max_tilt_deg;
  }
  if (o.push_height_m) {
    if (!(*o.push_height_m >= 0) || !std::isfinite(*o.push_height_m)) {
      return refuse("--push-height-m", *o.push_height_m, ">= 0 (leave it out for the COM height)");
    }
    request.push_height_m = *o.push_height_m;
  }
  if (o.push_scale_N) {
    if (!(*o.push_scale_N > 0) || !std::isfinite(*o.push_scale_N)) {
      return refuse("--push-scale-N", *o.push_scale_N,
                    "> 0 (leave it out for 10 % of the robot's weight)");
    }
    request.push_scale_N = *o.push_scale_N;
  }
  if (const Status valid = request.Validate(); !valid) return Failure(InFlagTerms(valid.error()));
  return request;
}

// --export-c names a file in a folder that exists (checked before anything is designed).
Status CheckExportPath(const std::string& path) {
  namespace fs = std::filesystem;
  std::error_code error;
  if (fs::is_directory(path, error)) return Failure("--export-c " + path + ": is a folder");
  const fs::path parent = fs::path(path).parent_path();
  if (!parent.empty() && !fs::is_directory(parent, error)) {
    return Failure("--export-c " + path + ": folder " + parent.string() + " does not exist");
  }
  return {};
}

// Writes the usable gains as a C header; the reason when it cannot.
Status ExportGains(const DesignOptions& options, const model::RobotModel& model,
                   const DesignSet& set) {
  const Result<std::string> sha = runner::Sha256OfFile(options.model_path);
  if (!sha) return Failure(sha.error());
  const Result<std::string> header = GainsHeader(
      {.model = &model, .set = &set, .model_path = options.model_path, .model_sha256 = *sha,
       .version = UPRIGHT_VERSION});
  if (!header) return Failure("--export-c " + options.export_c_path + ": " + header.error());
  return runner::WriteFileAtomically(options.export_c_path, *header);
}

// --report names a folder, or a path where one can be made (checked before anything is
// designed).
Status CheckReportDir(const std::string& dir) {
  namespace fs = std::filesystem;
  std::error_code error;
  if (fs::exists(dir, error) && !fs::is_directory(dir, error)) {
    return Failure("--report " + dir + ": is a file, not a folder");
  }
  return {};
}

// Writes the designs' pictures and margins into the folder, then its report.
Status WriteDesignReport(const DesignOptions& options, const model::RobotModel& model,
                         const DesignSet& set) {
  std::error_code error;
  std::filesystem::create_directories(options.report_dir, error);
  if (error) {
    return Failure("--report " + options.report_dir +
                   ": cannot make the folder: " + error.message());
  }
  const Result<std::string> sha = runner::Sha256OfFile(options.model_path);
  if (!sha) return Failure(sha.error());
  if (Status written = WriteDesignFolder(options.report_dir, {.model = &model,
                                                              .set = &set,
                                                              .model_path = options.model_path,
                                                              .model_sha256 = *sha,
                                                              .version = UPRIGHT_VERSION});
      !written) {
    return written;
  }
  const Result<std::string> report = runner::WriteReport(options.report_dir);
  if (!report) return Failure(report.error());
  Log().Info("design report: " + *report);
  return {};
}

}  // namespace

int RunDesign(const DesignOptions& options) {
  const Result<design::DesignRequest> resolved = ResolveFlags(options);
  if (!resolved) {
    Log().Error(resolved.error());
    return kExitBadInput;
  }
  const design::DesignRequest& request = *resolved;
  if (!options.export_c_path.empty()) {
    if (const Status path = CheckExportPath(options.export_c_path); !path) {
      Log().Error(path.error());
      return kExitBadInput;
    }
  }
  if (!options.report_dir.empty()) {
    if (const Status dir = CheckReportDir(options.report_dir); !dir) {
      Log().Error(dir.error());
      return kExitBadInput;
    }
  }
  // A design never steps the physics, so a robot whose rates suit another step still designs.
  const auto loaded = model::LoadModelFile(options.model_path,
                                           model::ModelLoadOptions{.check_default_step = false});
  if (!loaded) {
    for (const auto& e : loaded.error()) Log().Error(e.ToString());
    return kExitBadInput;
  }
  const DesignSet set = design::DesignAll(*loaded, request);
  if (options.json) {
    std::cout << Json(*loaded, set);
  } else {
    PrintText(*loaded, set, options.max_tilt_deg.has_value());
  }
  std::cout.flush();
  std::fflush(stdout);
  if (!options.export_c_path.empty()) {
    if (const Status exported = ExportGains(options, *loaded, set); !exported) {
      Log().Error(exported.error());
      return kExitFailed;
    }
    Log().Info("gains for firmware: " + options.export_c_path);
  }
  if (!options.report_dir.empty()) {
    if (const Status written = WriteDesignReport(options, *loaded, set); !written) {
      Log().Error(written.error());
      return kExitFailed;
    }
  }

  // Each unusable design once more on stderr, then the count a script can act on.
  int offered = 0, usable = 0;
  for (const Named& c : Controllers(set)) {
    const DesignStatus status = c.report->status();
    if (status == DesignStatus::kUnsupported) continue;
    ++offered;
    if (status == DesignStatus::kOk) {
      ++usable;
    } else if (status == DesignStatus::kFailed) {
      Log().Error(options.model_path + ": design failed: " + c.report->message);
    } else {
      Log().Warning(options.model_path + ": " + c.title +
                    ": unstable as the module samples it at " + Figure(set.request.rate_hz) +
                    " Hz with the sensors' latency (max |z| " +
                    Figure(c.report->sampled.max_abs_z) + ")");
    }
  }
  if (usable == offered) return kExitOk;
  Log().Err(usable > 0 ? LogLevel::kWarning : LogLevel::kError,
            options.model_path + ": " + std::to_string(usable) + " of " + std::to_string(offered) +
                " design(s) usable");
  return usable > 0 ? kExitSomeDesignsUnusable : kExitFailed;
}

}  // namespace upright::cli
