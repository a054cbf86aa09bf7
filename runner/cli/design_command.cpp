// `upright design MODEL`: the linear model and the built-in controllers' gains, closed-loop
// poles, push norms and margins, as readable text or as one JSON object (--json).
#include <cmath>
#include <complex>
#include <cstdio>
#include <iostream>
#include <string>
#include <vector>

#include "commands.hpp"
#include "json_writer.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"

namespace upright::cli {
namespace {

using design::ControllerReport;
using design::DesignSet;

constexpr const char* kInputNames[] = {"left", "right"};

void WriteMargins(JsonWriter& j, const design::LoopMargins& m) {
  j.BeginObject("margins");
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

void WriteController(JsonWriter& j, const ControllerReport& c) {
  j.Bool("ok", c.ok);
  j.String("message", c.message);
  j.Matrix("K", c.K);
  j.ComplexList("poles", c.loop.poles);
  j.Number("push_norm", c.loop.push_norm);
  WriteMargins(j, c.loop.margins);
  if (c.sampled.analysed()) {
    j.BeginObject("sampled");
    j.Number("rate_hz", 1 / c.sampled.period_s);
    j.Number("max_abs_z", c.sampled.max_abs_z);
    j.ComplexList("poles", c.sampled.s);
    j.EndObject();
  }
}

std::string Json(const RobotModel& model, const DesignSet& d) {
  JsonWriter j;
  j.BeginObject();
  j.String("robot", model.name);
  j.String("input", d.plant.input == design::InputKind::kTorque ? "torque" : "voltage");
  j.Number("rate_hz", d.request.rate_hz);
  j.BeginArray("states");
  for (int i = 0; i < design::kStates; ++i) j.String({}, design::StateName(i));
  j.EndArray();
  j.Matrix("A", d.plant.A);
  j.Matrix("B", d.plant.B);
  j.Matrix("E", d.plant.E);
  j.Number("push_height_m", d.plant.push_height_m);
  j.Number("push_scale_N", d.performance.push_scale_N);
  j.Number("fall_rate_1_s", d.plant.fall_rate_1_s);
  j.Number("equilibrium_pitch_rad", d.plant.equilibrium_pitch_rad);
  j.Matrix("Q", d.performance.Q);
  j.Matrix("R", d.performance.R);

  j.BeginObject("lqr");
  WriteController(j, d.lqr);
  j.Matrix("K_discrete", d.lqr.K_discrete);
  j.EndObject();

  j.BeginObject("hinf");
  WriteController(j, d.hinf);
  j.Number("gamma", d.hinf.gamma);
  j.Number("gamma_opt", d.hinf.gamma_opt);
  j.Number("norm", d.hinf.loop.push_norm);
  j.EndObject();

  j.BeginObject("lqg");
  WriteController(j, d.lqg);
  j.Matrix("K_discrete", d.lqg.K_discrete);
  j.Matrix("C", d.lqg.sensors.C);
  j.Matrix("D", d.lqg.sensors.D);
  j.Matrix("L_discrete", d.lqg.L_discrete);
  j.Number("estimator_fastest_1_s", d.lqg.estimator_fastest_1_s);
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
  j.EndObject();
  j.EndObject();
  return j.text() + "\n";
}

std::string Figure(double v, const char* format = "%.4g") {
  if (std::isinf(v)) return v > 0 ? "inf" : "-inf";
  if (std::isnan(v)) return "-";
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, format, v);
  return buffer;
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
    for (int j = 0; j < m.cols(); ++j) std::printf(" %15.6g", m(i, j));
    std::printf("\n");
  }
}

// Poles in 1/s, a conjugate pair once as re±imi.
void PrintPoles(const std::vector<std::complex<double>>& poles) {
  for (const auto& p : poles) {
    if (p.imag() < 0) continue;
    std::printf(p.imag() == 0 ? " %.4g" : " %.4g±%.4gi", p.real(), p.imag());
  }
  std::printf("\n");
}

void PrintController(const char* title, const ControllerReport& c) {
  std::printf("\n== %s: %s\n", title, c.ok ? "ok" : ("FAILED: " + c.message).c_str());
  if (c.K.norm() > 0) PrintMatrix("gain K (u = -K x), N·m or V per state unit", c.K, true);
  if (!c.loop.poles.empty()) {
    std::printf("closed-loop poles (1/s):");
    PrintPoles(c.loop.poles);
    std::printf("push norm ||T_zw||inf: %s\n", Figure(c.loop.push_norm).c_str());
    const design::LoopMargins& m = c.loop.margins;
    std::printf("input margins (worst wheel): gain %s..%s, phase %s deg, disk alpha %s "
                "(gain %s..%s, phase %s deg), delay %s s\n",
                Figure(m.gain_low).c_str(), Figure(m.gain_high).c_str(),
                Figure(m.phase_deg).c_str(), Figure(m.disk_alpha).c_str(),
                Figure(m.disk_gain_low).c_str(), Figure(m.disk_gain_high).c_str(),
                Figure(m.disk_phase_deg).c_str(), Figure(m.delay_s).c_str());
  }
  if (c.sampled.analysed()) {
    std::printf("sampled as the module runs it, at %g Hz: max |z| %.4g (%s); poles (1/s, log z / T):",
                1 / c.sampled.period_s, c.sampled.max_abs_z,
                c.sampled.max_abs_z < 1 ? "stable" : "UNSTABLE");
    PrintPoles(c.sampled.s);
  }
}

void PrintText(const RobotModel& model, const DesignSet& d) {
  const design::LinearModel& p = d.plant;
  std::printf("robot '%s': linearised about upright (%s input, controllers at %g Hz)\n",
              model.name.c_str(), p.input == design::InputKind::kTorque ? "wheel torque" : "voltage",
              d.request.rate_hz);
  std::printf("lumped body %.3g kg, COM %.3g m above the axle; falls at %.4g 1/s "
              "(time constant %.3g s)\n",
              p.body.mass_kg, p.body.com_height_m, p.fall_rate_1_s, 1 / p.fall_rate_1_s);
  PrintMatrix("A", p.A, false);
  PrintMatrix("B [left, right]", p.B, false);
  std::printf("performance: push of %.4g N at %.3g m above the axle → z = [Q½ x; R½ u]\n",
              d.performance.push_scale_N, p.push_height_m);
  PrintController("LQR", d.lqr);
  PrintController("H-infinity state feedback", d.hinf);
  if (d.hinf.gamma_opt > 0) {
    std::printf("gamma %.5g = %.3g x gamma_opt %.5g\n", d.hinf.gamma,
                d.hinf.gamma / d.hinf.gamma_opt, d.hinf.gamma_opt);
  }
  PrintController("LQG (LQR on a Kalman estimate from the model's sensors)", d.lqg);
  const double nyquist_1_s = kPi * d.request.rate_hz;
  if (d.lqg.ok && d.lqg.estimator_fastest_1_s > nyquist_1_s) {
    std::printf("note: the continuous estimator reaches %.4g 1/s, beyond the %.4g 1/s Nyquist rate "
                "of %g Hz: the lqg module's sampled filter (same noise) is slower, so read these "
                "LQG figures as those of its continuous limit\n",
                d.lqg.estimator_fastest_1_s, nyquist_1_s, d.request.rate_hz);
  }
  PrintController("PID cascade (tilt PD inside speed PI, yaw-rate PI)", d.pid);
  const design::PidGains& g = d.pid.gains;
  if (d.pid.ok) {
    std::printf("tilt kp %.4g N·m/rad, kd %.4g N·m·s/rad; speed kp %.4g rad/(m/s), ki %.4g rad/m; "
                "yaw kp %.4g N·m·s/rad, ki %.4g N·m/rad\n",
                g.tilt_kp_Nm_per_rad, g.tilt_kd_Nm_s_per_rad, g.speed_kp_rad_per_m_s,
                g.speed_ki_rad_per_m, g.yaw_kp_Nm_s_per_rad, g.yaw_ki_Nm_per_rad);
  }
  std::printf("\nLinear-model figures only: check them on the plant (upright run) and on hardware "
              "with a tether or spotter.\n");
}

}  // namespace

int RunDesign(const DesignOptions& options) {
  const ModelLoadResult loaded = LoadModelFile(options.model_path);
  if (!loaded.ok()) {
    for (const auto& e : loaded.errors) std::cerr << e.ToString() << "\n";
    return kExitBadInput;
  }
  std::string error;
  if (!options.request.IsValid(&error)) {
    std::cerr << error << "\n";
    return kExitBadInput;
  }
  const DesignSet set = design::DesignAll(loaded.model, options.request);
  if (options.json) {
    std::cout << Json(loaded.model, set);
  } else {
    PrintText(loaded.model, set);
  }
  if (!set.all_ok()) {
    for (const auto* c : {&set.lqr, static_cast<const ControllerReport*>(&set.hinf),
                          static_cast<const ControllerReport*>(&set.lqg),
                          static_cast<const ControllerReport*>(&set.pid)}) {
      if (!c->ok) std::cerr << options.model_path << ": design failed: " << c->message << "\n";
    }
    return kExitFailed;
  }
  return kExitOk;
}

}  // namespace upright::cli
