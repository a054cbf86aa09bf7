// sweep.csv: one row per sample × controller, sample by sample — the sampled values, the status
// and every figure summary.csv has, in its column order.
#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/sweep/sweep_writer.hpp"
#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {

std::string SweepCsv(const SweepResult& result) {
  std::string csv = "sample,controller,noise_seed";
  for (const Dispersion& d : result.dispersions) {
    csv += ',';
    AppendCsvField(&csv, d.param);
  }
  AppendOutcomeHeader(&csv);
  csv += '\n';
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
        // The shortest exact form, so a sample can be replayed from sweep.csv exactly.
        AppendShortest(&csv, value, NanAs::kEmpty);
      }
      AppendOutcomeCells(&csv, run);
      csv += '\n';
    }
  }
  return csv;
}

}  // namespace upright::runner
