#include "upright/runner/tune/pareto.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "upright/runner/tables/metric_columns.hpp"

namespace upright::runner {
namespace {

// The columns a Pareto tune accepts: the lower-is-better figures compare judges. The others
// (fall_time_s, end_time_s) say nothing of a setting on which every run survives.
std::string AcceptedNames() {
  std::string names;
  for (const MetricColumn& column : MetricColumns()) {
    if (column.compared) names += (names.empty() ? "" : ", ") + std::string(column.name);
  }
  return names;
}

std::size_t ColumnIndex(const std::string& name) {
  const auto columns = MetricColumns();
  for (std::size_t c = 0; c < columns.size(); ++c) {
    if (name == columns[c].name && columns[c].compared) return c;
  }
  return columns.size();
}

}  // namespace

Status ValidateParetoMetrics(const std::vector<std::string>& metrics) {
  if (metrics.empty()) return {};
  std::string given;
  for (const std::string& metric : metrics) given += (given.empty() ? "" : ",") + metric;
  const std::string field = "TuneOptions::pareto_metrics (--pareto) = " + given + ": ";
  if (metrics.size() != 2) {
    return Failure(field + "give two metrics, as METRIC,METRIC (accepted: " + AcceptedNames() +
                   ")");
  }
  for (const std::string& metric : metrics) {
    if (ColumnIndex(metric) == MetricColumns().size()) {
      return Failure(field + metric +
                     " is no metric a front can trade (both are minimised; accepted: " +
                     AcceptedNames() + ")");
    }
  }
  if (metrics[0] == metrics[1]) return Failure(field + "the two metrics must differ");
  return {};
}

std::array<std::size_t, 2> ParetoColumns(const std::vector<std::string>& metrics) {
  return {ColumnIndex(metrics.at(0)), ColumnIndex(metrics.at(1))};
}

bool ParetoScore::Eligible() const {
  return out == 0 && std::isfinite(first) && std::isfinite(second) &&
         std::all_of(constraints.begin(), constraints.end(), [](double c) { return c <= 0; });
}

ParetoScore ParetoScoreOf(const EvaluationScore& score, const std::array<std::size_t, 2>& columns) {
  ParetoScore point;
  point.first = score.mean_metrics.at(columns[0]);
  point.second = score.mean_metrics.at(columns[1]);
  point.constraints = score.violation;
  if (score.runs == 0 || score.survived < score.runs) {
    point.out = std::max(1.0, score.objective / kFallPenalty);
  } else if (!std::isfinite(point.first) || !std::isfinite(point.second)) {
    point.out = 1;
  }
  return point;
}

bool Dominates(const ParetoScore& a, const ParetoScore& b) {
  return a.first <= b.first && a.second <= b.second && (a.first < b.first || a.second < b.second);
}

std::vector<std::size_t> NonDominated(std::span<const ParetoScore> points) {
  std::vector<std::size_t> order;
  for (std::size_t i = 0; i < points.size(); ++i) {
    if (points[i].Eligible()) order.push_back(i);
  }
  // By the first figure, then the second, then the index: a sweep keeps each point whose second
  // figure is below every one kept before it (an equal second is dominated or a duplicate).
  std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    if (points[a].first != points[b].first) return points[a].first < points[b].first;
    if (points[a].second != points[b].second) return points[a].second < points[b].second;
    return a < b;
  });
  std::vector<std::size_t> front;
  double lowest_second = std::numeric_limits<double>::infinity();
  for (const std::size_t i : order) {
    if (points[i].second < lowest_second) {
      front.push_back(i);
      lowest_second = points[i].second;
    }
  }
  return front;
}

}  // namespace upright::runner
