#include "upright/runner/tune/tune_writer.hpp"

#include <filesystem>
#include <initializer_list>
#include <string_view>
#include <utility>
#include <vector>

#include "held_out_batch.hpp"
#include "tune_manifest.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/common/atomic_file.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/tables/make_results_folder.hpp"
#include "upright/runner/tables/metric_columns.hpp"
#include "upright/runner/tables/ranking.hpp"
#include "upright/runner/tables/results_writer.hpp"
#include "upright/runner/tune/pareto_writer.hpp"

namespace upright::runner {
namespace {

std::string Number(double value) { return SignificantText(value, 6, NanAs::kEmpty); }

// Appends every piece to *out (one append each, no temporaries).
void Append(std::string* out, std::initializer_list<std::string_view> pieces) {
  for (const std::string_view piece : pieces) out->append(piece);
}

// The objective as read: "1 × max_tilt_deg + 10 × max_drift_m", or a fall's score.
std::string ObjectiveText(const EvaluationScore& score) {
  if (score.objective >= kFallPenalty) {
    return SignificantText(score.objective, 6) + " (" +
           std::to_string(score.runs - score.survived) + " of " + std::to_string(score.runs) +
           " runs did not survive)";
  }
  return SignificantText(score.objective, 6);
}

std::string Percent(double from, double to) {
  if (!(from != 0) || from >= kFallPenalty || to >= kFallPenalty) return "";
  return SignedSignificantText(100 * (to - from) / from, 3) + " %";
}

// "ranking at their best": the tuned settings ranked on the held-out seeds by ranking.md's rule,
// beside the default settings' ranking on the same seeds.
void AppendRankingAtTheirBest(const TuneResult& result, std::string* md) {
  *md += "\n## Ranking at their best\n\n";
  const BatchResult defaults = internal::HeldOutBatch(result, false);
  const BatchResult tuned = internal::HeldOutBatch(result, true);
  if (tuned.runs.empty()) {
    *md +=
        "No held-out seeds (--holdout 0), so no ranking: one on the seeds the search saw would "
        "flatter every tuned setting by the noise it was fitted to.\n";
    return;
  }
  *md += std::string(kTunedFolder) + "/ and " + kDefaultsFolder +
         "/ hold every controller's tuned and default setting played on the held-out seeds, each "
         "with its summary, comparison and ranking. Ranked as ranking.md ranks (survival over "
         "all runs first, then the weighted score relative to the best controller in each "
         "scenario; lower is better): the tuned settings below, the defaults' rank beside. A "
         "score is relative to the others in its own ranking, so compare ranks and survival "
         "across the two, not scores.\n\n";
  const std::vector<ControllerStanding> at_best = RankBatch(tuned);
  const std::vector<ControllerStanding> as_designed = RankBatch(defaults);
  *md +=
      "| rank at their best | controller | survived | score | objective, held-out | rank as "
      "designed | survived | score | objective, held-out |\n"
      "| ---: | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |\n";
  for (const ControllerStanding& best : at_best) {
    const ControllerStanding* before = nullptr;
    for (const ControllerStanding& d : as_designed) {
      if (d.name == best.name) before = &d;
    }
    const ControllerTune* tune = nullptr;
    for (const ControllerTune& t : result.controllers) {
      if (t.controller == best.name) tune = &t;
    }
    const auto objective = [](const TuneEvaluation& e) {
      return e.score.objective >= kFallPenalty ? std::string("falls")
                                               : SignificantText(e.score.objective, 4);
    };
    Append(md, {"| ", std::to_string(best.rank), best.partial ? " (partial)" : "", " | ",
                MarkdownCell(best.name), " | ", std::to_string(best.survived), "/",
                std::to_string(best.runs), " | ", SignificantText(best.score, 3, NanAs::kDash),
                " | ", tune ? objective(tune->held_out[1]) : "", " | "});
    if (before != nullptr) {
      Append(md, {std::to_string(before->rank), before->partial ? " (partial)" : "", " | ",
                  std::to_string(before->survived), "/", std::to_string(before->runs), " | ",
                  SignificantText(before->score, 3, NanAs::kDash), " | ",
                  tune ? objective(tune->held_out[0]) : "", " |\n"});
    } else {
      *md += "— | | | |\n";
    }
  }
}

}  // namespace

const char* const kTunedFolder = "tuned";
const char* const kDefaultsFolder = "defaults";

std::string TuneCsv(const TuneResult& result) {
  std::string csv = "controller,evaluation,stage,settings,objective,feasible,survived,runs";
  for (const MetricBound& bound : result.plan.objective.bounds) {
    csv += ",";
    AppendCsvField(&csv, "worst " + bound.Text());
  }
  for (const MetricColumn& column : MetricColumns()) {
    csv += ",mean_";
    csv += column.name;
  }
  csv += ",failure\n";
  for (const ControllerTune& tune : result.controllers) {
    // The search's evaluations, then the held-out ones numbered as the setting they replay.
    std::vector<std::pair<std::size_t, const TuneEvaluation*>> rows;
    for (std::size_t i = 0; i < tune.evaluations.size(); ++i) {
      rows.emplace_back(i, &tune.evaluations[i]);
    }
    for (std::size_t i = 0; i < tune.held_out.size(); ++i) {
      rows.emplace_back(i == 0 ? 0 : tune.best, &tune.held_out[i]);
    }
    for (const auto& [i, evaluation] : rows) {
      const TuneEvaluation& e = *evaluation;
      AppendCsvField(&csv, tune.controller);
      Append(&csv, {",", std::to_string(i), ",", ToString(e.stage), ","});
      AppendCsvField(&csv, SettingsText(tune, e.values));
      Append(&csv, {",", SignificantText(e.score.objective, 9), ",", CsvBool(e.score.feasible()),
                    ",", std::to_string(e.score.survived), ",", std::to_string(e.score.runs)});
      for (const double worst : e.score.worst) Append(&csv, {",", Number(worst)});
      for (const double mean : e.score.mean_metrics) Append(&csv, {",", Number(mean)});
      csv += ",";
      AppendCsvField(&csv, e.score.failure);
      csv += "\n";
    }
  }
  return csv;
}

std::string TuneMarkdown(const TuneResult& result) {
  const TunePlan& plan = result.plan;
  std::string md = "# Tune\n\n";
  md += "Scenarios:";
  for (const ScenarioInfo& s : result.scenarios) {
    md += " " + s.name + " (" + std::to_string(s.seeds.size()) + " seed(s))";
  }
  md += ". Objective, lower is better: " + plan.objective.Text() +
        ", each metric the mean over the runs; a setting where a run does not survive scores " +
        SignificantText(kFallPenalty, 6) + " × (1 + the share of the runs' time lost).";
  if (!plan.objective.bounds.empty()) {
    md += " Subject to (the worst run):";
    for (const MetricBound& bound : plan.objective.bounds) Append(&md, {" ", bound.Text(), ";"});
  }
  if (plan.holdout_runs > 0) {
    md += " Held-out seeds, never seen by the search:";
    for (std::size_t s = 0; s < result.scenarios.size(); ++s) {
      Append(&md, {" ", result.scenarios[s].name});
      for (const std::uint64_t seed : plan.holdout_seeds[s]) {
        Append(&md, {" ", std::to_string(seed)});
      }
      md += s + 1 < result.scenarios.size() ? ";" : ".";
    }
  }
  md += " Budget: " + std::to_string(plan.evaluations) + " evaluations of " +
        std::to_string(plan.runs_per_evaluation) + " run(s) per controller, search seed " +
        std::to_string(result.seed) +
        // The file's name alone, so the table does not depend on where it lies (the manifest has
        // its path and SHA-256).
        (plan.tune_path.empty() ? ""
                                : ", knobs and objective from " +
                                      std::filesystem::path(plan.tune_path).filename().string()) +
        ".\n";
  md += ParetoSearchedMarkdown(result);
  for (const ControllerTune& tune : result.controllers) {
    md += "\n## " + tune.controller + "\n\n";
    if (!tune.setup_error.empty()) {
      md += "Not tuned: " + tune.setup_error + "\n";
      continue;
    }
    const TuneEvaluation& base = tune.evaluations.front();
    const TuneEvaluation& best = tune.evaluations[tune.best];
    md += "| | objective | survived | feasible |";
    for (const MetricBound& bound : plan.objective.bounds)
      md += " worst " + MarkdownCell(bound.Text()) + " |";
    md += "\n| --- | --- | --- | --- |";
    for (std::size_t b = 0; b < plan.objective.bounds.size(); ++b) md += " --- |";
    md += "\n";
    const auto row = [&](const char* label, const TuneEvaluation& e) {
      Append(&md, {"| ", label, " | ", MarkdownCell(ObjectiveText(e.score)), " | ",
                   std::to_string(e.score.survived), "/", std::to_string(e.score.runs), " | ",
                   e.score.feasible() ? "yes" : "no", " |"});
      for (const double worst : e.score.worst) {
        Append(&md, {" ", SignificantText(worst, 6), " |"});
      }
      md += "\n";
    };
    row("default", base);
    row("tuned", best);
    if (tune.held_out.size() == 2) {
      row("default, held-out seeds", tune.held_out[0]);
      row("tuned, held-out seeds", tune.held_out[1]);
    }
    if (tune.best == 0) {
      md += "\nNo setting searched beat the scenario's own: the tuned setting is the default.\n";
    } else {
      const std::string change = Percent(base.score.objective, best.score.objective);
      md += "\nThe tuned setting is evaluation " + std::to_string(tune.best) + " (" +
            ToString(best.stage) + " stage)" +
            (change.empty() ? "" : "; objective " + change + " against the default") + ".\n";
    }
    md += "\n| setting | range | scale | default | tuned |\n| --- | --- | --- | --- | --- |\n";
    for (std::size_t k = 0; k < tune.knobs.size(); ++k) {
      const Knob& knob = tune.knobs[k];
      md += "| " + MarkdownCell(knob.setting) + " | " + ShortestText(knob.lo) + " – " +
            ShortestText(knob.hi) + " | " + ToString(knob.scale) + " | " +
            (tune.default_text[k].empty() ? "module default" : MarkdownCell(tune.default_text[k])) +
            " | " +
            (best.values.empty() ? std::string("as the default") : ShortestText(best.values[k])) +
            " |\n";
    }
    Append(&md, {"\n", std::to_string(tune.evaluations.size()),
                 " evaluations. Ready to paste into a scenario's <controllers>:\n\n```xml\n",
                 tune.element, "\n```\n"});
    md += ParetoFrontMarkdown(result, tune);
  }
  AppendRankingAtTheirBest(result, &md);
  return md;
}

Status WriteTuneResults(const std::string& dir, const TuneResult& result) {
  if (Status made = MakeResultsFolder(dir); !made) return made;
  const std::filesystem::path root(dir);
  if (Status written = WriteFileAtomically((root / "tune.csv").string(), TuneCsv(result));
      !written) {
    return written;
  }
  if (!result.plan.pareto_metrics.empty()) {
    if (Status written = WriteFileAtomically((root / "pareto.csv").string(), ParetoCsv(result));
        !written) {
      return written;
    }
  }
  if (Status written = WriteFileAtomically((root / "tune.md").string(), TuneMarkdown(result));
      !written) {
    return written;
  }
  // The held-out replays as results folders of their own, so the usual tables and the report
  // read them; without held-out seeds, none (and none left from an earlier tune).
  for (const bool tuned : {false, true}) {
    const std::filesystem::path folder = root / (tuned ? kTunedFolder : kDefaultsFolder);
    const BatchResult batch = internal::HeldOutBatch(result, tuned);
    if (!batch.runs.empty()) {
      if (Status batch_written = WriteResults(folder.string(), batch); !batch_written) {
        return batch_written;
      }
      continue;
    }
    std::error_code error;
    if (std::filesystem::is_regular_file(folder / "summary.csv", error)) {
      std::filesystem::remove_all(folder, error);
      if (error) return Failure(folder.string() + ": cannot remove: " + error.message());
    }
  }
  return WriteFileAtomically((root / "manifest.json").string(), internal::TuneManifestJson(result));
}

}  // namespace upright::runner
