// sweep.csv: one row per sample × controller, sample by sample — the sampled values, the status
// and every figure summary.csv has, in its column order.
#include "exact_number.hpp"
#include "metric_columns.hpp"
#include "text_format.hpp"
#include "upright/runner/sweep_writer.hpp"

namespace upright::runner {

std::string SweepCsv(const SweepResult& result) {
  using internal::AppendCsvField;
  std::string csv = "sample,controller,noise_seed";
  for (const Dispersion& d : result.dispersions) {
    csv += ',';
    AppendCsvField(&csv, d.param);
  }
  csv += ",status,survived";
  for (const internal::MetricColumn& column : internal::MetricColumns()) {
    csv += ',';
    csv += column.name;
  }
  csv += ",message\n";
  for (const SweepSample& sample : result.samples) {
    for (std::size_t c = 0; c < result.controller_count(); ++c) {
      const RunResult& run = result.run(sample.index, c);
      csv += std::to_string(sample.index);
      csv += ',';
      AppendCsvField(&csv, run.controller);
      csv += ',';
      csv += std::to_string(sample.noise_seed);
      for (const double value : sample.values) {
        csv += ',';
        internal::AppendExactNumber(&csv, value);
      }
      csv += ',';
      csv += ToString(run.metrics.status);
      csv += run.metrics.status == RunStatus::kOk ? ",1" : ",0";
      for (const internal::MetricColumn& column : internal::MetricColumns()) {
        csv += ',';
        internal::AppendNumber(&csv, run.metrics.*column.field);
      }
      csv += ',';
      AppendCsvField(&csv, run.metrics.message);
      csv += '\n';
    }
  }
  return csv;
}

}  // namespace upright::runner
