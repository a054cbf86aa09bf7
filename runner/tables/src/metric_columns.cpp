#include "upright/runner/metric_columns.hpp"

#include <array>

#include "upright/runner/played_run.hpp"
#include "upright/runner/text_format.hpp"

namespace upright::runner {
namespace {

constexpr std::array<MetricColumn, 18> kColumns = {{
    {"fall_time_s", "fall time (s)", &RunMetrics::fall_time_s, false},
    {"max_tilt_deg", "max tilt (deg)", &RunMetrics::max_tilt_deg, true},
    {"max_drift_m", "max drift (m)", &RunMetrics::max_drift_m, true},
    {"tilt_settle_s", "tilt settle (s)", &RunMetrics::tilt_settle_s, true},
    {"drift_settle_s", "drift settle (s)", &RunMetrics::drift_settle_s, true},
    {"tilt_rebound_deg", "tilt rebound (deg)", &RunMetrics::tilt_rebound_deg, true},
    {"tilt_rebound_pct", "tilt rebound (% of peak)", &RunMetrics::tilt_rebound_pct, true},
    {"rms_tilt_deg", "RMS tilt (deg)", &RunMetrics::rms_tilt_deg, true},
    {"iae_tilt_deg_s", "IAE tilt (deg·s)", &RunMetrics::iae_tilt_deg_s, true},
    {"effort_Nm2s", "effort (N²m²s)", &RunMetrics::effort_Nm2s, true},
    {"peak_torque_Nm", "peak torque (N·m)", &RunMetrics::peak_torque_Nm, true},
    {"peak_current_A", "peak current (A)", &RunMetrics::peak_current_A, true},
    {"saturation_pct", "saturation (% of steps)", &RunMetrics::saturation_pct, true},
    {"command_limit_pct", "command at limit (% of steps)", &RunMetrics::command_limit_pct, true},
    {"max_slip_ratio", "max slip ratio", &RunMetrics::max_slip_ratio, true},
    {"slip_time_s", "slip time (s)", &RunMetrics::slip_time_s, true},
    {"energy_J", "energy (J)", &RunMetrics::energy_J, true},
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
    if (played) AppendNumber(csv, metrics.*column.field);
  }
  *csv += ',';
  AppendCsvField(csv, metrics.message);
}

}  // namespace upright::runner
