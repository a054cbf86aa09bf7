#include "upright/runner/tables/metric_columns.hpp"

#include <array>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/tables/played_run.hpp"

namespace upright::runner {
namespace {

// Floors: values a practitioner accepts as "no difference" for robots from 1 kg to 50 kg (common
// practice): below the resolution of a MEMS tilt estimate (0.1 deg), a wheel encoder's centimetre,
// a few 100 Hz control periods for settling, one control period of wheel spin, a small hobby
// motor's current ripple (0.1 A); a rebound within 5 % of its peak, the tight end of the usual
// overshoot specifications; 0.1 % of the steps for the shares of time at a limit.
constexpr std::array<MetricColumn, 18> kColumns = {{
    {"fall_time_s", "fall time (s)", &RunMetrics::fall_time_s, false},
    {"max_tilt_deg", "max tilt (deg)", &RunMetrics::max_tilt_deg, true, 0.1, "deg"},
    {"max_drift_m", "max drift (m)", &RunMetrics::max_drift_m, true, 0.01, "m"},
    {"tilt_settle_s", "tilt settle (s)", &RunMetrics::tilt_settle_s, true, 0.05, "s"},
    {"drift_settle_s", "drift settle (s)", &RunMetrics::drift_settle_s, true, 0.05, "s"},
    {"tilt_rebound_deg", "tilt rebound (deg)", &RunMetrics::tilt_rebound_deg, true, 0.1, "deg"},
    {"tilt_rebound_pct", "tilt rebound (% of peak)", &RunMetrics::tilt_rebound_pct, true, 5, "%"},
    {"rms_tilt_deg", "RMS tilt (deg)", &RunMetrics::rms_tilt_deg, true, 0.1, "deg"},
    {"iae_tilt_deg_s", "IAE tilt (deg·s)", &RunMetrics::iae_tilt_deg_s, true, 0.1, "deg·s"},
    {"effort_Nm2s", "effort (N²m²s)", &RunMetrics::effort_Nm2s, true, 1e-4, "N²m²s"},
    {"peak_torque_Nm", "peak torque (N·m)", &RunMetrics::peak_torque_Nm, true, 0.01, "N·m"},
    {"peak_current_A", "peak current (A)", &RunMetrics::peak_current_A, true, 0.1, "A"},
    {"saturation_pct", "saturation (% of steps)", &RunMetrics::saturation_pct, true, 0.1, "%"},
    {"command_limit_pct", "command at limit (% of steps)", &RunMetrics::command_limit_pct, true,
     0.1, "%"},
    {"max_slip_ratio", "max slip ratio", &RunMetrics::max_slip_ratio, true, 0.01, ""},
    {"slip_time_s", "slip time (s)", &RunMetrics::slip_time_s, true, 0.01, "s"},
    {"energy_J", "energy (J)", &RunMetrics::energy_J, true, 0.1, "J"},
    {"end_time_s", "end time (s)", &RunMetrics::end_time_s, false},
}};

}  // namespace

std::span<const MetricColumn> MetricColumns() { return kColumns; }

void AppendOutcomeHeader(std::string* csv) {
  *csv += ",status,survived";
  for (const MetricColumn& column : kColumns) {
    *csv += ',';
    *csv += column.name;
  }
  *csv += ",message";
}

void AppendOutcomeCells(std::string* csv, const RunResult& run) {
  const RunMetrics& metrics = run.metrics;
  const bool played = WasPlayed(run);
  *csv += ',';
  *csv += ToString(metrics.status);
  *csv += ',';
  *csv += CsvBool(metrics.status == RunStatus::kOk);
  for (const MetricColumn& column : kColumns) {
    *csv += ',';
    if (played) AppendSignificant(csv, metrics.*column.field, 6, NanAs::kEmpty);
  }
  *csv += ',';
  AppendCsvField(csv, metrics.message);
}

}  // namespace upright::runner
