#include "ranking_table.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/tables/ranking.hpp"

namespace upright::runner::internal {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The score of a controller in one scenario: for each figure below, its mean over its played runs
// divided by the smallest positive mean any controller reached there (so the best gets 1.0, a
// controller with 0 gets 0), averaged with these weights. A figure no controller has a positive
// mean for is left out. A run's missing settling time (it never settled, or fell) counts as
// twice the longest settling time any run of the scenario reached; a scenario where no run
// settled leaves that figure out. Lower scores are better.
struct RankingWeight {
  const char* label;
  double RunMetrics::*field;
  double weight;
  bool settle;
};

constexpr std::array<RankingWeight, 9> kRankingWeights = {{
    {"max tilt", &RunMetrics::max_tilt_deg, 2.0, false},
    {"max drift", &RunMetrics::max_drift_m, 1.0, false},
    {"tilt settle", &RunMetrics::tilt_settle_s, 1.0, true},
    {"RMS tilt", &RunMetrics::rms_tilt_deg, 1.0, false},
    {"drift settle", &RunMetrics::drift_settle_s, 0.5, true},
    {"effort", &RunMetrics::effort_Nm2s, 0.5, false},
    {"peak current", &RunMetrics::peak_current_A, 0.5, false},
    {"saturation", &RunMetrics::saturation_pct, 0.5, false},
    {"energy", &RunMetrics::energy_J, 0.5, false},
}};

// Unsettled runs count as this many times the scenario's longest settling time.
constexpr double kUnsettledFactor = 2.0;

// Higher survival first, then lower score (a missing score last), then name.
bool RanksBefore(double survival_a, double score_a, const std::string& name_a, double survival_b,
                 double score_b, const std::string& name_b) {
  if (survival_a != survival_b) return survival_a > survival_b;
  const double key_a = std::isnan(score_a) ? std::numeric_limits<double>::infinity() : score_a;
  const double key_b = std::isnan(score_b) ? std::numeric_limits<double>::infinity() : score_b;
  if (key_a != key_b) return key_a < key_b;
  return name_a < name_b;
}

// The mean of one figure for one controller, with unsettled runs replaced by `unsettled_value`
// when the figure is a settling time; *skipped (when given) receives how many runs it left out.
double RankingMean(const ControllerGroup& controller, const RankingWeight& weight,
                   double unsettled_value, int* skipped = nullptr) {
  double sum = 0;
  int count = 0;
  for (const RunResult* run : controller.runs) {
    if (!WasPlayed(*run)) continue;
    double value = run->metrics.*weight.field;
    if (std::isnan(value) && weight.settle) value = unsettled_value;
    if (std::isnan(value)) continue;
    sum += value;
    ++count;
  }
  if (skipped != nullptr) *skipped = controller.size() - count;
  return count > 0 ? sum / count : kNaN;
}

// Each controller's score in `scenario`, in its controller order (see RankingWeight), and in
// `skipped` the empty values each one's score left out.
std::vector<double> ScenarioScores(const ScenarioGroup& scenario, std::vector<int>* skipped) {
  const std::size_t n = scenario.controllers.size();
  skipped->assign(n, 0);
  std::vector<int> figure_skipped(n, 0);
  std::vector<double> weighted_sum(n, 0), weight_sum(n, 0);
  for (const RankingWeight& weight : kRankingWeights) {
    double unsettled_value = kNaN;
    if (weight.settle) {
      double longest = kNaN;
      for (const ControllerGroup& controller : scenario.controllers) {
        for (const RunResult* run : controller.runs) {
          const double value = run->metrics.*weight.field;
          if (WasPlayed(*run) && !std::isnan(value) && !(value <= longest)) longest = value;
        }
      }
      if (std::isnan(longest)) continue;
      unsettled_value = kUnsettledFactor * longest;
    }
    std::vector<double> means(n);
    double best = kNaN;
    for (std::size_t i = 0; i < n; ++i) {
      means[i] = RankingMean(scenario.controllers[i], weight, unsettled_value, &figure_skipped[i]);
      if (means[i] > 0 && !(means[i] >= best)) best = means[i];
    }
    if (std::isnan(best)) continue;
    for (std::size_t i = 0; i < n; ++i) {
      if (std::isnan(means[i])) continue;
      weighted_sum[i] += weight.weight * means[i] / best;
      weight_sum[i] += weight.weight;
      (*skipped)[i] += figure_skipped[i];
    }
  }
  std::vector<double> scores(n, kNaN);
  for (std::size_t i = 0; i < n; ++i) {
    if (weight_sum[i] > 0) scores[i] = weighted_sum[i] / weight_sum[i];
  }
  return scores;
}

std::string WeightsText() {
  std::string text;
  for (std::size_t i = 0; i < kRankingWeights.size(); ++i) {
    if (i > 0) text += ", ";
    text += kRankingWeights[i].label;
    text += ' ';
    text += SignificantText(kRankingWeights[i].weight, 6);
  }
  return text;
}

}  // namespace

std::vector<RankedController> RankControllers(const std::vector<ScenarioGroup>& groups) {
  std::vector<RankedController> ranked;
  for (std::size_t s = 0; s < groups.size(); ++s) {
    const ScenarioGroup& scenario = groups[s];
    std::vector<int> skipped;
    const std::vector<double> scores = ScenarioScores(scenario, &skipped);
    std::vector<std::size_t> order(scenario.controllers.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
      const ControllerGroup& ca = scenario.controllers[a];
      const ControllerGroup& cb = scenario.controllers[b];
      return RanksBefore(ca.SurvivalRate(), scores[a], ca.name, cb.SurvivalRate(), scores[b],
                         cb.name);
    });
    for (std::size_t position = 0; position < order.size(); ++position) {
      const std::size_t i = order[position];
      const ControllerGroup& controller = scenario.controllers[i];
      auto entry = std::find_if(ranked.begin(), ranked.end(), [&](const RankedController& r) {
        return r.name == controller.name;
      });
      if (entry == ranked.end()) {
        RankedController fresh;
        fresh.name = controller.name;
        fresh.scenario_scores.assign(groups.size(), kNaN);
        fresh.scenario_ranks.assign(groups.size(), 0);
        ranked.push_back(std::move(fresh));
        entry = ranked.end() - 1;
      }
      entry->runs += controller.size();
      entry->survived += controller.survived;
      entry->scenario_scores[s] = scores[i];
      if (!std::isnan(scores[i])) entry->values_skipped += skipped[i];
      entry->scenario_ranks[s] = static_cast<int>(position) + 1;
    }
  }
  int most_scored = 0;
  for (RankedController& entry : ranked) {
    entry.survival_rate = static_cast<double>(entry.survived) / entry.runs;
    double sum = 0;
    for (double score : entry.scenario_scores) {
      if (std::isnan(score)) continue;
      sum += score;
      ++entry.scenarios_scored;
    }
    entry.score = entry.scenarios_scored > 0 ? sum / entry.scenarios_scored : kNaN;
    most_scored = std::max(most_scored, entry.scenarios_scored);
  }
  for (RankedController& entry : ranked) entry.partial = entry.scenarios_scored < most_scored;
  std::sort(ranked.begin(), ranked.end(), [](const RankedController& a, const RankedController& b) {
    if (a.partial != b.partial) return !a.partial;
    return RanksBefore(a.survival_rate, a.score, a.name, b.survival_rate, b.score, b.name);
  });
  return ranked;
}

std::string RankingCsv(const std::vector<ScenarioGroup>& groups) {
  std::string csv =
      "rank,controller,survival_rate,survived,runs,score,scenarios_scored,partial,values_skipped";
  for (const ScenarioGroup& scenario : groups) {
    csv += ',';
    AppendCsvField(&csv, "rank_" + scenario.name);
  }
  csv += '\n';
  const std::vector<RankedController> ranked = RankControllers(groups);
  for (std::size_t i = 0; i < ranked.size(); ++i) {
    const RankedController& entry = ranked[i];
    csv += std::to_string(i + 1);
    csv += ',';
    AppendCsvField(&csv, entry.name);
    csv += ',';
    AppendSignificant(&csv, entry.survival_rate, 6, NanAs::kEmpty);
    csv += ',' + std::to_string(entry.survived) + ',' + std::to_string(entry.runs) + ',';
    AppendSignificant(&csv, entry.score, 6, NanAs::kEmpty);
    csv += ',' + std::to_string(entry.scenarios_scored) + ',' + CsvBool(entry.partial) + ',' +
           std::to_string(entry.values_skipped);
    for (int rank : entry.scenario_ranks) {
      csv += ',';
      if (rank > 0) csv += std::to_string(rank);
    }
    csv += '\n';
  }
  return csv;
}

std::string RankingMarkdown(const std::vector<ScenarioGroup>& groups) {
  const std::vector<RankedController> ranked = RankControllers(groups);
  int most_scored = 0;
  for (const RankedController& entry : ranked) {
    most_scored = std::max(most_scored, entry.scenarios_scored);
  }
  std::string md = "# Ranking\n\n";
  md +=
      "Controllers are matched by name across scenarios and ordered by survival rate over all "
      "their runs (higher first; a run not played counts as not survived), then by score (lower "
      "first), then by name.\n";
  md +=
      "Score: in each scenario, each figure's mean over a controller's played runs is divided by "
      "the smallest positive mean any controller reached there (the best gets 1.0), and the "
      "ratios are averaged with weights " +
      WeightsText() + ".\n";
  md +=
      "A run that did not settle counts as twice the longest settling time of any run in that "
      "scenario; any other empty value (a run not played, a figure that does not apply) is left "
      "out of the mean, and \"values skipped\" counts them. The overall score is the mean over "
      "the scenarios the controller was scored in.\n";
  md += "A controller scored on fewer scenarios than the most any controller was scored on (here " +
        std::to_string(most_scored) +
        ") is partial: it is ranked apart, after every controller scored on that many, whatever "
        "its survival and score, since its figures come from fewer situations.\n";
  md +=
      "The rank in each scenario follows the same rule within that scenario; — : not run "
      "there.\n\n";
  md += "| rank | controller | survived | score | scenarios scored | values skipped |";
  for (const ScenarioGroup& scenario : groups) AppendMarkdownCell(&md, MarkdownCell(scenario.name));
  md += "\n|---:|---|---:|---:|---:|---:|";
  for (std::size_t i = 0; i < groups.size(); ++i) md += "---:|";
  md += '\n';
  for (std::size_t i = 0; i < ranked.size(); ++i) {
    const RankedController& entry = ranked[i];
    md += "| " + std::to_string(i + 1) + " | " + MarkdownCell(entry.name) + " | " +
          std::to_string(entry.survived) + "/" + std::to_string(entry.runs) + " | " +
          ReadableText(entry.score, NanAs::kDash) + " | " + std::to_string(entry.scenarios_scored) +
          " of " + std::to_string(most_scored) + (entry.partial ? " (partial, ranked apart)" : "") +
          " | " + std::to_string(entry.values_skipped) + " |";
    for (int rank : entry.scenario_ranks) {
      AppendMarkdownCell(&md, rank > 0 ? std::to_string(rank) : std::string("—"));
    }
    md += '\n';
  }
  return md;
}

}  // namespace upright::runner::internal

namespace upright::runner {

std::vector<ControllerStanding> RankBatch(const BatchResult& batch) {
  const std::vector<internal::ScenarioGroup> groups = internal::GroupBatch(batch);
  std::vector<ControllerStanding> standings;
  for (const internal::RankedController& c : internal::RankControllers(groups)) {
    standings.push_back(
        {c.name, static_cast<int>(standings.size()) + 1, c.runs, c.survived, c.score, c.partial});
  }
  return standings;
}

}  // namespace upright::runner
