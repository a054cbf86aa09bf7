#include "gains_header.hpp"

#include <Eigen/Dense>
#include <cctype>
#include <cmath>
#include <string_view>

#include "upright/base/number_text.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/weights.hpp"

namespace upright::cli {
namespace {

using design::DesignStatus;

// A double as a C literal that reads back to the same double: the shortest exact form, with ".0"
// where it would otherwise be an integer literal.
std::string CDouble(double v) {
  std::string text = ShortestText(v);
  if (text.find_first_of(".e") == std::string::npos) text += ".0";
  return text;
}

class HeaderText {
 public:
  explicit HeaderText(std::string prefix) : prefix_(std::move(prefix)) {}

  void Line(std::string_view text = {}) {
    out_ += text;
    out_ += '\n';
  }
  // A comment, its words wrapped at 100 columns.
  void Comment(std::string_view text) {
    std::string line = "/*";
    std::size_t start = 0;
    while (start < text.size()) {
      std::size_t end = text.find(' ', start);
      if (end == std::string_view::npos) end = text.size();
      const std::string_view word = text.substr(start, end - start);
      if (line.size() + 1 + word.size() > 97) {
        Line(line);
        line = " *";
      }
      line += " ";
      line += word;
      start = end + 1;
    }
    Line(line + " */");
  }
  void Scalar(std::string_view name, double value, std::string_view what) {
    Check(value, name);
    Comment(what);
    Line("static const double " + prefix_ + std::string(name) + " " + Unused() + "= " +
         CDouble(value) + ";");
  }
  // A matrix as a row-major array [rows][cols].
  void Matrix(std::string_view name, const Eigen::MatrixXd& m, std::string_view what) {
    Comment(what);
    Line("static const double " + prefix_ + std::string(name) + "[" + std::to_string(m.rows()) +
         "][" + std::to_string(m.cols()) + "] " + Unused() + "= {");
    for (Eigen::Index r = 0; r < m.rows(); ++r) {
      std::string row = "    {";
      for (Eigen::Index c = 0; c < m.cols(); ++c) {
        Check(m(r, c), name);
        row += (c ? ", " : "") + CDouble(m(r, c));
      }
      Line(row + (r + 1 < m.rows() ? "}," : "}"));
    }
    Line("};");
  }
  std::string_view prefix() const { return prefix_; }
  std::string Upper() const {
    std::string upper;
    for (const char c : prefix_) upper += static_cast<char>(std::toupper(c));
    return upper;
  }
  // The attribute that keeps a C compiler quiet about the gains a firmware does not use.
  std::string Unused() const { return Upper() + "GAINS_UNUSED "; }
  const std::string& failure() const { return failure_; }
  const std::string& text() const { return out_; }

 private:
  void Check(double value, std::string_view name) {
    if (!std::isfinite(value) && failure_.empty()) {
      failure_ = std::string(name) + " holds " + ShortestText(value) + ": a C header needs finite "
                 "numbers";
    }
  }

  std::string prefix_;
  std::string out_;
  std::string failure_;
};

bool Usable(const design::ControllerReport& c) { return c.status() == DesignStatus::kOk; }

void WriteOpening(const GainsHeaderSource& s, HeaderText* h) {
  const design::DesignSet& d = *s.set;
  const bool torque = d.plant.input == design::InputKind::kTorque;
  h->Line("/*");
  h->Line(" * Controller gains for firmware, written by `upright design --export-c` (upright " +
          s.version + ").");
  h->Line(" * Robot \"" + s.model->name + "\" from " + s.model_path);
  h->Line(" *   model file SHA-256 " + s.model_sha256);
  h->Line(" * Designed at " + ShortestText(d.request.rate_hz) + " Hz (period " +
          ShortestText(1 / d.request.rate_hz) + " s), as the built-in modules run at that rate.");
  h->Line(" *");
  h->Line(" * State x[6], about upright at rest (conventions: x forward, z up, right-handed):");
  h->Line(" *   0 x_m              axle-midpoint position along the heading, m, + forward");
  h->Line(" *   1 xdot_m_s         its speed, m/s");
  h->Line(" *   2 pitch_rad        pitch minus " + std::string(h->prefix()) +
          "equilibrium_pitch_rad, rad, + leaning forward");
  h->Line(" *   3 pitch_rate_rad_s pitch rate, rad/s");
  h->Line(" *   4 yaw_rad          heading, rad, + turning left");
  h->Line(" *   5 yaw_rate_rad_s   yaw rate, rad/s");
  h->Line(std::string(" * Input u[2] = [left, right] wheel ") +
          (torque ? "torque, N*m, + drives forward" : "motor terminal voltage, V, + drives forward") +
          ".");
  h->Line(" * State feedback: u = u_ss - K (x - x_ss), computed once a period and held until the");
  h->Line(" * next (zero-order hold); x_ss is the reference's steady motion and u_ss the input that");
  h->Line(" * holds it (zero standing still on level ground). Clamp u to +-" +
          std::string(h->prefix()) + "input_limit.");
  h->Line(" *");
  h->Line(" * Simulation design only: validate on hardware with a tether or spotter, at low speed");
  h->Line(" * first, within local rules; qualified people judge.");
  h->Line(" */");
}

void WriteCommon(const GainsHeaderSource& s, HeaderText* h) {
  const design::DesignSet& d = *s.set;
  const std::string upper = h->Upper();
  h->Line("#if defined(__GNUC__)");
  h->Line("#define " + upper + "GAINS_UNUSED __attribute__((unused))");
  h->Line("#else");
  h->Line("#define " + upper + "GAINS_UNUSED");
  h->Line("#endif");
  h->Line("#define " + upper + "RATE_HZ " + CDouble(d.request.rate_hz));
  h->Line("#define " + upper + "PERIOD_S " + CDouble(1 / d.request.rate_hz));
  h->Line("#define " + upper + "STATES 6");
  h->Line("#define " + upper + "INPUTS 2");
  h->Line();
  h->Scalar("equilibrium_pitch_rad", d.plant.equilibrium_pitch_rad,
            "pitch at which the centre of mass stands over the axle, rad");
  const bool torque = d.plant.input == design::InputKind::kTorque;
  h->Scalar("input_limit", design::InputLimit(*s.model, d.plant.input),
            torque ? "largest wheel torque, N*m: the stall torque at the wheel"
                   : "largest terminal voltage, V: the supply");
}

void WriteStateFeedback(const design::DesignSet& d, HeaderText* h) {
  if (Usable(d.lqr)) {
    h->Line();
    h->Matrix("lqr_K", d.lqr.K_discrete,
              "LQR, discrete at the rate (zero-order hold): the lqr module's K");
  }
  if (Usable(d.hinf)) {
    h->Line();
    h->Matrix("hinf_K", d.hinf.K_discrete,
              "H-infinity state feedback, discrete at the rate (zero-order hold) at gamma = " +
                  ShortestText(d.hinf.gamma_discrete) + " (the discrete gamma_opt " +
                  ShortestText(d.hinf.gamma_opt_discrete) + "): the hinf module's K");
  }
}

void WriteLqg(const design::LqgReport& lqg, HeaderText* h) {
  if (!Usable(lqg)) return;
  h->Line();
  h->Comment(
      "LQG: the lqr gain on a Kalman estimate. Measurements y[5]: y0 = mean encoder angle - a0, "
      "rad, where a0 is the first sample's mean encoder angle plus its accelerometer pitch (so "
      "y0 = x/r - pitch); y1 = gyro pitch rate, rad/s; y2 = encoder heading r (phi_right - "
      "phi_left) / track minus its first value, rad; y3 = gyro yaw rate, rad/s; y4 = accelerometer "
      "f_x / g + sin(equilibrium_pitch_rad). The first sample starts the estimate (pitch from the "
      "accelerometer, rates from gyro and encoders, x and yaw zero). Each period, with u the command held since the last: "
      "p = Ad x + Bd u; x = p + L (y - C p - D u); then the state feedback above on x.");
  h->Matrix("lqg_K", lqg.K_discrete, "LQG regulator (the discrete LQR)");
  h->Matrix("lqg_Ad", lqg.Ad, "LQG prediction: the plant over one period");
  h->Matrix("lqg_Bd", lqg.Bd, "LQG prediction: the held input over one period");
  h->Matrix("lqg_C", lqg.sensors.C, "LQG measurement model y = C x + D u");
  h->Matrix("lqg_D", lqg.sensors.D, "LQG measurement model, input feedthrough");
  h->Matrix("lqg_L", lqg.L_discrete, "LQG measurement-update gain (steady state)");
}

void WritePid(const design::PidReport& pid, HeaderText* h) {
  if (!Usable(pid)) return;
  const design::PidGains& g = pid.gains;
  h->Line();
  h->Comment(
      "PID cascade, integrators summed once a period: theta_ref = speed_kp e_v + speed_ki "
      "integral(e_v), clamped to +-max_tilt_ref; tau_sum = tilt_kp (theta - theta_ref) + tilt_kd "
      "theta_dot; tau_diff = yaw_kp e_r + yaw_ki integral(e_r) (right minus left); tau_left = "
      "(tau_sum - tau_diff) / 2, tau_right = (tau_sum + tau_diff) / 2");
  h->Scalar("pid_tilt_kp_Nm_per_rad", g.tilt_kp_Nm_per_rad, "N*m per rad");
  h->Scalar("pid_tilt_kd_Nm_s_per_rad", g.tilt_kd_Nm_s_per_rad, "N*m s per rad");
  h->Scalar("pid_speed_kp_rad_per_m_s", g.speed_kp_rad_per_m_s, "rad per m/s");
  h->Scalar("pid_speed_ki_rad_per_m", g.speed_ki_rad_per_m, "rad per m");
  h->Scalar("pid_yaw_kp_Nm_s_per_rad", g.yaw_kp_Nm_s_per_rad, "N*m s per rad");
  h->Scalar("pid_yaw_ki_Nm_per_rad", g.yaw_ki_Nm_per_rad, "N*m per rad");
  h->Scalar("pid_max_tilt_ref_rad", g.max_tilt_ref_rad, "rad");
}

void WriteLeftOut(const design::DesignSet& d, HeaderText* h) {
  const std::pair<const char*, const design::ControllerReport*> all[] = {
      {"lqr", &d.lqr}, {"hinf", &d.hinf}, {"lqg", &d.lqg}, {"pid", &d.pid}};
  for (const auto& [name, report] : all) {
    if (Usable(*report)) continue;
    const std::string why = report->status() == DesignStatus::kUnstableSampled
                                ? "unstable as the module samples it"
                                : report->message;
    h->Comment(std::string("Not written: ") + name + " (" + design::ToString(report->status()) +
               ": " + why + ")");
  }
}

}  // namespace

std::string IdentifierPrefix(const std::string& name) {
  std::string out;
  for (const unsigned char c : name) {
    out += std::isalnum(c) ? static_cast<char>(std::tolower(c)) : '_';
  }
  if (out.empty() || std::isdigit(static_cast<unsigned char>(out[0]))) out = "robot_" + out;
  return out + "_";
}

Result<std::string> GainsHeader(const GainsHeaderSource& source) {
  const design::DesignSet& d = *source.set;
  if (!Usable(d.lqr) && !Usable(d.hinf) && !Usable(d.lqg) && !Usable(d.pid)) {
    return Failure("no design is usable, so there are no gains to write");
  }
  HeaderText h(IdentifierPrefix(source.model->name));
  WriteOpening(source, &h);
  const std::string guard = h.Upper() + "GAINS_H";
  h.Line("#ifndef " + guard);
  h.Line("#define " + guard);
  h.Line();
  WriteCommon(source, &h);
  WriteStateFeedback(d, &h);
  WriteLqg(d.lqg, &h);
  WritePid(d.pid, &h);
  h.Line();
  WriteLeftOut(d, &h);
  h.Line("#endif  /* " + guard + " */");
  if (!h.failure().empty()) return Failure(h.failure());
  return h.text();
}

}  // namespace upright::cli
