#include "upright/runner/tune/pareto_writer.hpp"

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tune/pareto.hpp"

namespace upright::runner {
namespace {

// The two metrics' columns.
const MetricColumn& Column(const TuneResult& result, int m) {
  return MetricColumns()[ParetoColumns(result.plan.pareto_metrics)[static_cast<std::size_t>(m)]];
}

}  // namespace

std::string ParetoCsv(const TuneResult& result) {
  const std::vector<std::string>& metrics = result.plan.pareto_metrics;
  if (metrics.empty()) return "";
  const std::array<std::size_t, 2> columns = ParetoColumns(metrics);
  std::string csv =
      "controller,mean_" + metrics[0] + ",mean_" + metrics[1] + ",evaluation,settings\n";
  for (const ControllerTune& tune : result.controllers) {
    for (const std::size_t i : tune.pareto) {
      const TuneEvaluation& e = tune.evaluations[i];
      AppendCsvField(&csv, tune.controller);
      csv += ",";
      csv += SignificantText(e.score.mean_metrics[columns[0]], 6, NanAs::kEmpty);
      csv += ",";
      csv += SignificantText(e.score.mean_metrics[columns[1]], 6, NanAs::kEmpty);
      csv += ",";
      csv += std::to_string(i);
      csv += ",";
      AppendCsvField(&csv, SettingsText(tune, e.values));
      csv += "\n";
    }
  }
  return csv;
}

std::string ParetoSearchedMarkdown(const TuneResult& result) {
  if (result.plan.pareto_metrics.empty()) return "";
  const std::string a = result.plan.pareto_metrics[0], b = result.plan.pareto_metrics[1];
  return "\nSearched: each controller's Pareto front of mean " + a + " against mean " + b +
         " (both lower is better), with the same start and budget: the rest of the budget goes "
         "to local polishes of weighted trade-offs between them, from " +
         a + " alone to " + b +
         " alone. A setting is on the front when every run survives, it meets the bounds and no "
         "other such setting is as good on both and better on one (the default setting "
         "included). The objective still ranks the tuned setting below. Every front is in "
         "pareto.csv.\n";
}

std::string ParetoFrontMarkdown(const TuneResult& result, const ControllerTune& tune) {
  if (result.plan.pareto_metrics.empty()) return "";
  const std::array<std::size_t, 2> columns = ParetoColumns(result.plan.pareto_metrics);
  std::string md = "\n### Pareto front: " + result.plan.pareto_metrics[0] + " against " +
                   result.plan.pareto_metrics[1] + "\n\n";
  if (tune.pareto.empty()) {
    return md + "No setting evaluated survived every run within the bounds: no front.\n";
  }
  md += "| evaluation | stage | mean " + MarkdownCell(Column(result, 0).label) + " | mean " +
        MarkdownCell(Column(result, 1).label) + " | objective | settings |\n";
  md += "| ---: | --- | ---: | ---: | ---: | --- |\n";
  for (const std::size_t i : tune.pareto) {
    const TuneEvaluation& e = tune.evaluations[i];
    md += "| " + std::to_string(i) + " | " + ToString(e.stage) + " | " +
          SignificantText(e.score.mean_metrics[columns[0]], 6) + " | " +
          SignificantText(e.score.mean_metrics[columns[1]], 6) + " | " +
          SignificantText(e.score.objective, 6) + " | " +
          MarkdownCell(SettingsText(tune, e.values)) + " |\n";
  }
  return md;
}

}  // namespace upright::runner
