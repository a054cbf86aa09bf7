#include "trace_reader.hpp"

#include <cmath>

#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner::internal {

Result<TraceSignals> ReadTrace(const std::string& path) {
  const Result<CsvTable> read = ReadCsvFile(path);
  if (!read) return Failure(read.error());
  const CsvTable& table = *read;
  const char* kNeeded[] = {"time_s",         "pitch_deg",       "x_m",       "drift_m",
                           "torque_left_Nm", "torque_right_Nm", "slip_left", "slip_right"};
  int column[8];
  for (int k = 0; k < 8; ++k) {
    column[k] = table.Column(kNeeded[k]);
    if (column[k] < 0) {
      return Failure(path + ": no column " + kNeeded[k] +
                     " (expected a trace written by upright run)");
    }
  }
  TraceSignals trace;
  const int twin_pitch = table.Column("twin_pitch_deg");
  const int twin_x = table.Column("twin_x_m");
  const int event = table.Column("event");
  trace.has_twin = twin_pitch >= 0 && twin_x >= 0;
  const std::size_t n = table.rows.size();
  for (auto* v : {&trace.time_s, &trace.pitch_deg, &trace.x_m, &trace.drift_m, &trace.torque_Nm,
                  &trace.slip}) {
    v->reserve(n);
  }
  for (const auto& row : table.rows) {
    const double t = CsvNumber(row[column[0]]);
    trace.time_s.push_back(t);
    trace.pitch_deg.push_back(CsvNumber(row[column[1]]));
    trace.x_m.push_back(CsvNumber(row[column[2]]));
    trace.drift_m.push_back(CsvNumber(row[column[3]]));
    trace.torque_Nm.push_back(0.5 * (CsvNumber(row[column[4]]) + CsvNumber(row[column[5]])));
    const double left = CsvNumber(row[column[6]]);
    const double right = CsvNumber(row[column[7]]);
    trace.slip.push_back(std::fabs(right) > std::fabs(left) ? right : left);
    if (trace.has_twin) {
      trace.twin_pitch_deg.push_back(CsvNumber(row[twin_pitch]));
      trace.twin_x_m.push_back(CsvNumber(row[twin_x]));
    }
    if (event < 0 || row[event].empty()) continue;
    const std::string& text = row[event];
    std::size_t start = 0;
    while (start <= text.size()) {
      const std::size_t end = text.find("; ", start);
      const std::string label =
          text.substr(start, end == std::string::npos ? std::string::npos : end - start);
      if (!label.empty()) trace.labels.push_back({t, label});
      if (end == std::string::npos) break;
      start = end + 2;
    }
  }
  return trace;
}

}  // namespace upright::runner::internal
