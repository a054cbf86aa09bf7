#include "trace_csv.hpp"

#include <algorithm>
#include <array>
#include <vector>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"

namespace upright::runner::internal {
namespace {

struct TraceColumn {
  const char* name;
  double TraceRow::*field;
};

// In TraceRow's declaration order, named as its fields.
constexpr std::array<TraceColumn, 27> kTraceColumns = {{
    {"time_s", &TraceRow::time_s},
    {"x_m", &TraceRow::x_m},
    {"y_m", &TraceRow::y_m},
    {"pitch_deg", &TraceRow::pitch_deg},
    {"pitch_rate_deg_s", &TraceRow::pitch_rate_deg_s},
    {"yaw_deg", &TraceRow::yaw_deg},
    {"speed_m_s", &TraceRow::speed_m_s},
    {"ref_speed_m_s", &TraceRow::ref_speed_m_s},
    {"ref_yaw_rate_deg_s", &TraceRow::ref_yaw_rate_deg_s},
    {"drift_m", &TraceRow::drift_m},
    {"gyro_y_rad_s", &TraceRow::gyro_y_rad_s},
    {"accel_x_m_s2", &TraceRow::accel_x_m_s2},
    {"encoder_left_rad", &TraceRow::encoder_left_rad},
    {"encoder_right_rad", &TraceRow::encoder_right_rad},
    {"command_left", &TraceRow::command_left},
    {"command_right", &TraceRow::command_right},
    {"voltage_left_V", &TraceRow::voltage_left_V},
    {"voltage_right_V", &TraceRow::voltage_right_V},
    {"current_left_A", &TraceRow::current_left_A},
    {"current_right_A", &TraceRow::current_right_A},
    {"torque_left_Nm", &TraceRow::torque_left_Nm},
    {"torque_right_Nm", &TraceRow::torque_right_Nm},
    {"load_left_N", &TraceRow::load_left_N},
    {"load_right_N", &TraceRow::load_right_N},
    {"slip_left", &TraceRow::slip_left},
    {"slip_right", &TraceRow::slip_right},
    {"payload_x_m", &TraceRow::payload_x_m},
}};

// The linear twin's columns, after the others, in traces of runs that ran it (Trace::has_twin).
constexpr std::array<TraceColumn, 2> kTwinColumns = {{
    {"twin_pitch_deg", &TraceRow::twin_pitch_deg},
    {"twin_x_m", &TraceRow::twin_x_m},
}};

// A struct of doubles only: a field added to TraceRow without a column here fails to compile.
static_assert(sizeof(TraceRow) == (kTraceColumns.size() + kTwinColumns.size()) * sizeof(double),
              "every TraceRow field needs a column in kTraceColumns or kTwinColumns");

}  // namespace

std::string TraceCsv(const Trace& trace) {
  std::string csv;
  // About 10 characters per number: one allocation for the whole trace in the usual case.
  csv.reserve((trace.rows.size() + 1) * (kTraceColumns.size() * 10 + 8));
  const std::size_t twin_columns = trace.has_twin ? kTwinColumns.size() : 0;
  for (const TraceColumn& column : kTraceColumns) {
    csv += column.name;
    csv += ',';
  }
  for (std::size_t c = 0; c < twin_columns; ++c) {
    csv += kTwinColumns[c].name;
    csv += ',';
  }
  csv += "event\n";

  // Marks in time order (stable, so equal times keep their order).
  std::vector<const EventMark*> marks;
  marks.reserve(trace.marks.size());
  for (const EventMark& mark : trace.marks) marks.push_back(&mark);
  std::stable_sort(marks.begin(), marks.end(),
                   [](const EventMark* a, const EventMark* b) { return a->time_s < b->time_s; });

  std::size_t next_mark = 0;
  std::string labels;
  for (std::size_t r = 0; r < trace.rows.size(); ++r) {
    const TraceRow& row = trace.rows[r];
    for (const TraceColumn& column : kTraceColumns) {
      AppendSignificant(&csv, row.*column.field, 6, NanAs::kEmpty);
      csv += ',';
    }
    for (std::size_t c = 0; c < twin_columns; ++c) {
      AppendSignificant(&csv, row.*kTwinColumns[c].field, 6, NanAs::kEmpty);
      csv += ',';
    }
    // A mark goes on the first row at or after its time: never earlier than it happened, and
    // not at all when it comes after the last row (after the run ended).
    labels.clear();
    while (next_mark < marks.size() && marks[next_mark]->time_s <= row.time_s) {
      if (!labels.empty()) labels += "; ";
      labels += marks[next_mark]->label;
      ++next_mark;
    }
    AppendCsvField(&csv, labels);
    csv += '\n';
  }
  return csv;
}

}  // namespace upright::runner::internal
