#include "design_folder.hpp"

#include <algorithm>
#include <cmath>
#include <complex>
#include <filesystem>
#include <numbers>
#include <vector>

#include "upright/base/number_text.hpp"
#include "upright/design/closed_loop.hpp"
#include "upright/design/loop_response.hpp"
#include "upright/design/push_response.hpp"
#include "upright/model/model_file.hpp"
#include "upright/runner/common/atomic_file.hpp"
#include "upright/runner/common/json_text.hpp"
#include "upright/runner/common/sha256.hpp"
#include "upright/runner/common/text_format.hpp"

namespace upright::cli {
namespace {

using design::ControllerReport;
using design::DesignSet;
namespace fs = std::filesystem;

constexpr int kPointsPerDecade = 50;
constexpr double kDeg = 180 / std::numbers::pi;

struct NamedReport {
  const char* name;
  const ControllerReport* report;
};

std::vector<NamedReport> Reports(const DesignSet& set) {
  return {{"lqr", &set.lqr}, {"hinf", &set.hinf}, {"lqg", &set.lqg}, {"pid", &set.pid}};
}

// Whole decades around the loop's action: from below a twentieth of the fall rate to above both
// fifty times it and the Nyquist frequency of the controller's rate.
std::vector<double> Frequencies(const DesignSet& set) {
  const double fall = set.plant.fall_rate_1_s > 0 ? set.plant.fall_rate_1_s : 1.0;
  const double nyquist = std::numbers::pi * set.request.rate_hz;
  const double lo = std::pow(10.0, std::floor(std::log10(fall / 20)));
  const double hi = std::pow(10.0, std::ceil(std::log10(std::max(50 * fall, nyquist))));
  return design::LogFrequencies(lo, hi, kPointsPerDecade);
}

void AppendNumber(std::string* csv, double value) {
  *csv += ',';
  AppendSignificant(csv, value, 6, NanAs::kEmpty);
}

void AppendCurve(std::string* csv, const char* controller, const char* loop, const char* model,
                 const design::StateSpace& siso, double period_s,
                 const std::vector<double>& omegas) {
  std::vector<double> kept = omegas;
  if (period_s > 0) {
    std::erase_if(kept, [&](double w) { return w * period_s >= std::numbers::pi; });
  }
  const std::vector<std::complex<double>> values = design::FrequencyResponse(siso, period_s, kept);
  const std::vector<double> phase = design::UnwrappedPhaseDeg(values);
  for (std::size_t i = 0; i < kept.size(); ++i) {
    *csv += controller;
    *csv += ',';
    *csv += loop;
    *csv += ',';
    *csv += model;
    AppendNumber(csv, kept[i]);
    AppendNumber(csv, 20 * std::log10(std::abs(values[i])));
    AppendNumber(csv, phase[i]);
    AppendNumber(csv, values[i].real());
    AppendNumber(csv, values[i].imag());
    *csv += '\n';
  }
}

std::string LoopResponseCsv(const DesignSet& set) {
  std::string csv = "controller,loop,model,omega_rad_s,magnitude_db,phase_deg,real,imag\n";
  const std::vector<double> omegas = Frequencies(set);
  for (const auto& [name, report] : Reports(set)) {
    if (!report->ok) continue;
    const design::BrokenLoop open =
        design::LoopAtWheels(set.plant, report->measurement, report->controller);
    AppendCurve(&csv, name, "one_wheel", "continuous", design::LoopAtInput(open, 0), 0, omegas);
    AppendCurve(&csv, name, "both_wheels", "continuous", design::CommonModeLoop(open), 0, omegas);
    const design::BrokenLoop& sampled = report->sampled_loop;
    if (!sampled.sampled()) continue;
    AppendCurve(&csv, name, "one_wheel", "sampled", design::LoopAtInput(sampled, 0),
                sampled.period_s, omegas);
    AppendCurve(&csv, name, "both_wheels", "sampled", design::CommonModeLoop(sampled),
                sampled.period_s, omegas);
  }
  return csv;
}

Result<std::string> PushResponseCsv(const model::RobotModel& model, const DesignSet& set) {
  std::string csv =
      "controller,time_s,push_N,pitch_deg,position_m,current_left_A,current_right_A\n";
  const design::CurrentMap current = design::MotorCurrent(model, set.plant.input);
  for (const auto& [name, report] : Reports(set)) {
    if (!report->ok) continue;
    const Result<design::PushResponse> r = design::ResponseToPush(
        design::PushedLoop(set.plant, report->measurement, report->controller), current,
        set.design_push);
    if (!r) return Failure(std::string(name) + ": " + r.error());
    for (std::size_t k = 0; k < r->time_s.size(); ++k) {
      csv += name;
      AppendNumber(&csv, r->time_s[k]);
      AppendNumber(&csv, r->push_N[k]);
      AppendNumber(&csv, r->pitch_rad[k] * kDeg);
      AppendNumber(&csv, r->position_m[k]);
      AppendNumber(&csv, r->current_left_A[k]);
      AppendNumber(&csv, r->current_right_A[k]);
      csv += '\n';
    }
  }
  return csv;
}

void AppendMarginsRow(std::string* csv, const char* controller, const ControllerReport& report,
                      const char* loop, const char* model, const design::LoopMargins* m) {
  *csv += controller;
  *csv += ',';
  *csv += design::ToString(report.status());
  *csv += ',';
  runner::AppendCsvField(csv, report.ok ? "" : report.message);
  *csv += ',';
  *csv += loop;
  *csv += ',';
  *csv += model;
  const double nan = std::nan("");
  AppendNumber(csv, m ? m->gain_low : nan);
  AppendNumber(csv, m ? m->gain_high : nan);
  AppendNumber(csv, m ? m->phase_deg : nan);
  AppendNumber(csv, m ? m->phase_rad_s : nan);
  AppendNumber(csv, m ? m->delay_s * 1e3 : nan);
  AppendNumber(csv, m ? m->disk_alpha : nan);
  *csv += '\n';
}

std::string MarginsCsv(const DesignSet& set) {
  std::string csv =
      "controller,status,reason,loop,model,gain_low,gain_high,phase_deg,crossover_rad_s,"
      "delay_ms,disk_alpha\n";
  for (const auto& [name, report] : Reports(set)) {
    if (!report->supported) continue;
    if (!report->ok) {
      AppendMarginsRow(&csv, name, *report, "", "", nullptr);
      continue;
    }
    AppendMarginsRow(&csv, name, *report, "one_wheel", "continuous", &report->loop.margins);
    AppendMarginsRow(&csv, name, *report, "both_wheels", "continuous", &report->loop.both_wheels);
    if (report->sampled_margins.analysed()) {
      AppendMarginsRow(&csv, name, *report, "one_wheel", "sampled",
                       &report->sampled_margins.worst_wheel);
      AppendMarginsRow(&csv, name, *report, "both_wheels", "sampled",
                       &report->sampled_margins.both_wheels);
    }
  }
  return csv;
}

std::string Manifest(const DesignFolderSource& source) {
  const DesignSet& set = *source.set;
  runner::JsonText j;
  j.BeginObject();
  j.String("tool_version", source.version);
  j.String("command", "design");
  j.BeginObject("model");
  j.String("name", source.model->name);
  j.String("path", source.model_path);
  j.String("sha256", source.model_sha256);
  j.EndObject();
  j.String("input", set.plant.input == design::InputKind::kTorque ? "torque" : "voltage");
  j.Number("rate_hz", set.request.rate_hz);
  j.Number("latency_s", source.model->sensors.latency_s);
  j.Number("fall_rate_1_s", set.plant.fall_rate_1_s);
  j.BeginObject("design_push");
  j.Number("impulse_Ns", set.design_push.impulse_Ns);
  j.Number("duration_s", set.design_push.duration_s);
  j.Number("peak_N", set.design_push.peak_N());
  j.Number("height_m", set.plant.push_height_m);
  j.EndObject();
  j.Number("ground_contact_forward_deg", set.limits.ground_contact.forward_rad * kDeg);
  j.Number("ground_contact_backward_deg", set.limits.ground_contact.backward_rad * kDeg);
  j.Number("current_limit_A", set.limits.current_limit_A);
  j.EndObject();
  return j.text();
}

}  // namespace

Status WriteDesignFolder(const std::string& dir, const DesignFolderSource& source) {
  const Result<std::string> pushes = PushResponseCsv(*source.model, *source.set);
  if (!pushes) return Failure("design pictures: " + pushes.error());
  const std::pair<const char*, std::string> files[] = {
      {"margins.csv", MarginsCsv(*source.set)},
      {"loop_response.csv", LoopResponseCsv(*source.set)},
      {"push_response.csv", *pushes},
      {"manifest.json", Manifest(source)},
  };
  for (const auto& [name, text] : files) {
    if (Status written = runner::WriteFileAtomically((fs::path(dir) / name).string(), text);
        !written) {
      return written;
    }
  }
  return {};
}

Status WriteDefaultDesignFolder(const std::string& model_path, const std::string& dir,
                                const std::string& version) {
  const auto loaded =
      model::LoadModelFile(model_path, model::ModelLoadOptions{.check_default_step = false});
  if (!loaded) {
    std::string why;
    for (const auto& e : loaded.error()) why += (why.empty() ? "" : "; ") + e.ToString();
    return Failure(why);
  }
  const Result<std::string> sha = runner::Sha256OfFile(model_path);
  if (!sha) return Failure(sha.error());
  std::error_code error;
  fs::create_directories(dir, error);
  if (error) return Failure(dir + ": cannot make the folder: " + error.message());
  const DesignSet set = design::DesignAll(*loaded, {});
  return WriteDesignFolder(dir, {.model = &*loaded,
                                 .set = &set,
                                 .model_path = model_path,
                                 .model_sha256 = *sha,
                                 .version = version});
}

}  // namespace upright::cli
