#include "upright/runner/tune/objective.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "upright/base/number_text.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/played_run.hpp"

namespace upright::runner {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The column called `name`, or null.
const MetricColumn* Column(const std::string& name) {
  for (const MetricColumn& column : MetricColumns()) {
    if (name == column.name) return &column;
  }
  return nullptr;
}

std::string ColumnNames() {
  std::string names;
  for (const MetricColumn& column : MetricColumns()) {
    names += (names.empty() ? "" : ", ") + std::string(column.name);
  }
  return names;
}

}  // namespace

std::string MetricBound::Text() const {
  return metric + (kind == Kind::kAtMost ? " <= " : " >= ") + ShortestText(limit);
}

Status Objective::Validate() const {
  if (terms.empty()) return Failure("the objective has no term (give at least one <term>)");
  for (const ObjectiveTerm& term : terms) {
    if (!Column(term.metric)) {
      return Failure("term metric = " + term.metric +
                     ": no such metric (metrics: " + ColumnNames() + ")");
    }
    if (!(std::isfinite(term.weight) && term.weight > 0)) {
      return Failure("term " + term.metric + ": weight = " + ShortestText(term.weight) +
                     ", must be > 0 and finite");
    }
  }
  for (const MetricBound& bound : bounds) {
    if (!Column(bound.metric)) {
      return Failure("bound metric = " + bound.metric +
                     ": no such metric (metrics: " + ColumnNames() + ")");
    }
    if (!std::isfinite(bound.limit)) {
      return Failure("bound " + bound.metric + ": the limit must be finite");
    }
  }
  return {};
}

std::string Objective::Text() const {
  std::string text;
  for (const ObjectiveTerm& term : terms) {
    text += (text.empty() ? "" : " + ") + ShortestText(term.weight) + " × " + term.metric;
  }
  return text;
}

Objective DefaultObjective() {
  Objective objective;
  objective.terms = {{"max_tilt_deg", 1}, {"max_drift_m", 10}};
  return objective;
}

bool EvaluationScore::feasible() const {
  return std::all_of(violation.begin(), violation.end(), [](double v) { return v <= 0; });
}

EvaluationScore ScoreRuns(const Objective& objective, std::span<const RunResult> runs,
                          std::span<const double> durations_s) {
  EvaluationScore score;
  score.runs = static_cast<int>(runs.size());
  const auto columns = MetricColumns();
  score.mean_metrics.assign(columns.size(), kNaN);
  std::vector<double> sums(columns.size(), 0);
  std::vector<int> counts(columns.size(), 0);
  double lost = 0;  // Σ of the share of each run's time lost
  for (std::size_t i = 0; i < runs.size(); ++i) {
    const RunResult& run = runs[i];
    if (run.metrics.status == RunStatus::kOk) {
      ++score.survived;
    } else {
      const double end = run.metrics.end_time_s;
      lost += std::isfinite(end) ? std::clamp(1 - end / durations_s[i], 0.0, 1.0) : 1.0;
      if (score.failure.empty()) {
        score.failure = run.scenario + " seed " + std::to_string(run.seed) + ": " +
                        ToString(run.metrics.status) + ": " + run.metrics.message;
      }
    }
    if (!WasPlayed(run)) continue;
    for (std::size_t c = 0; c < columns.size(); ++c) {
      const double value = run.metrics.*columns[c].field;
      if (std::isnan(value)) continue;
      sums[c] += value;
      ++counts[c];
    }
  }
  for (std::size_t c = 0; c < columns.size(); ++c) {
    if (counts[c] > 0) score.mean_metrics[c] = sums[c] / counts[c];
  }
  const auto index_of = [&](const std::string& metric) {
    for (std::size_t c = 0; c < columns.size(); ++c) {
      if (metric == columns[c].name) return c;
    }
    return columns.size();
  };
  if (score.survived < score.runs || runs.empty()) {
    score.objective =
        kFallPenalty * (1 + (runs.empty() ? 1 : lost / static_cast<double>(runs.size())));
  } else {
    double sum = 0;
    for (const ObjectiveTerm& term : objective.terms) {
      const std::size_t c = index_of(term.metric);
      // Every run survived; a figure undefined on one of them (a settling time never reached)
      // makes the term undefined.
      const double mean =
          c < columns.size() && counts[c] == score.runs ? score.mean_metrics[c] : kNaN;
      sum += term.weight * mean;
    }
    score.objective = std::isfinite(sum) ? std::min(sum, kFallPenalty) : kFallPenalty;
  }
  for (const MetricBound& bound : objective.bounds) {
    const std::size_t c = index_of(bound.metric);
    double worst = kNaN;
    for (const RunResult& run : runs) {
      if (c >= columns.size() || !WasPlayed(run)) continue;
      const double value = run.metrics.*columns[c].field;
      if (std::isnan(value)) continue;
      if (std::isnan(worst)) {
        worst = value;
      } else {
        worst = bound.kind == MetricBound::Kind::kAtMost ? std::max(worst, value)
                                                         : std::min(worst, value);
      }
    }
    score.worst.push_back(worst);
    const double miss =
        bound.kind == MetricBound::Kind::kAtMost ? worst - bound.limit : bound.limit - worst;
    score.violation.push_back(std::isnan(miss) ? kFallPenalty : miss);
  }
  return score;
}

}  // namespace upright::runner
