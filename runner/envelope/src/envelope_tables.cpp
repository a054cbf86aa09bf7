#include "envelope_tables.hpp"

#include <algorithm>
#include <cmath>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/json_text.hpp"
#include "upright/runner/common/text_format.hpp"
#include "upright/runner/envelope/envelope_writer.hpp"
#include "upright/runner/tables/scenario_info_json.hpp"

namespace upright::runner::internal {
namespace {

// A plan value for reading: up to 4 significant digits, no trailing zeros ("0.35", "1240").
std::string Short(double value) { return SignificantText(value, 4); }

std::string WithUnit(const std::string& text, const std::string& unit) {
  return unit.empty() ? text : text + " " + unit;
}

// "(N)" after a column title, or nothing for a pure number.
std::string UnitSuffix(const std::string& unit) { return unit.empty() ? "" : " (" + unit + ")"; }

void AppendRow(std::string* out, std::initializer_list<std::string> fields) {
  bool first = true;
  for (const std::string& field : fields) {
    if (!first) out->push_back(',');
    first = false;
    AppendCsvField(out, field);
  }
  out->push_back('\n');
}

const char* OutcomeCode(const ControllerEnvelope& e) {
  return e.setup_error.empty() ? ToString(e.bisect.outcome) : "setup_failed";
}

// What went wrong, for the message column: the setup error, or the failure that decided.
std::string Message(const ControllerEnvelope& e) {
  if (!e.setup_error.empty()) return e.setup_error;
  if (e.bisect.outcome == BisectOutcome::kBracketed) return e.failure;
  if (e.bisect.outcome == BisectOutcome::kFailsAtBothEnds && !e.probes.empty()) {
    return e.probes.front().failure;
  }
  return "";
}

std::string SeedList(const std::vector<std::uint64_t>& seeds) {
  std::string text;
  for (std::size_t i = 0; i < seeds.size(); ++i) {
    text += (i == 0 ? "" : ", ") + std::to_string(seeds[i]);
  }
  return text;
}

char MapSymbol(const MapPoint& p) {
  if (p.setup_failed) return '!';
  if (p.seeds_survived == p.seeds) return '#';
  return p.seeds_survived > 0 ? '+' : '.';
}

// One controller's map as text: rows along param2 from hi (top) to lo, columns along param from
// lo (left) to hi, an axis line below.
std::string MapText(const ControllerMap& map, const EnvelopePlan& plan) {
  const ParameterAxis& a1 = plan.axis;
  const ParameterAxis& a2 = *plan.axis2;
  const std::size_t grid = static_cast<std::size_t>(plan.grid);
  std::vector<std::string> labels(grid);
  std::size_t width = 0;
  for (std::size_t i2 = 0; i2 < grid; ++i2) {
    labels[i2] = Short(map.points[i2 * grid].value2);
    width = std::max(width, labels[i2].size());
  }
  std::string text = a2.path + UnitSuffix(a2.unit) + ", rows\n";
  for (std::size_t r = 0; r < grid; ++r) {
    const std::size_t i2 = grid - 1 - r;
    text += std::string(width - labels[i2].size(), ' ') + labels[i2] + " |";
    for (std::size_t i1 = 0; i1 < grid; ++i1) {
      text += ' ';
      text += MapSymbol(map.points[i2 * grid + i1]);
    }
    text += '\n';
  }
  text += std::string(width + 1, ' ') + '+' + std::string(2 * grid, '-') + '\n';
  text += std::string(width + 3, ' ') + Short(a1.lo) + " … " + Short(a1.hi) + ": " + a1.path +
          UnitSuffix(a1.unit) + ", columns\n";
  return text;
}

}  // namespace

std::string AtResolution(double value, double resolution) {
  // One display unit at most half the resolution, so the ends of a final bracket (more than
  // tol / 2 apart once it has been halved) never print alike.
  const int decimals =
      std::clamp(static_cast<int>(std::ceil(-std::log10(resolution / 2) - 1e-9)), 0, 12);
  return FixedText(value, decimals, NanAs::kDash);
}

std::string EnvelopeCsv(const EnvelopeResult& result) {
  const EnvelopePlan& plan = result.plan;
  std::string csv =
      "scenario,controller,baseline,parameter,unit,lo,hi,tol,direction,survived_value,"
      "first_failing_value,probes,seeds,outcome,message\n";
  for (const ControllerEnvelope& e : result.controllers) {
    AppendRow(
        &csv,
        {result.scenario.name, e.controller, CsvBool(e.baseline), plan.axis.path, plan.axis.unit,
         ShortestText(plan.axis.lo, NanAs::kEmpty), ShortestText(plan.axis.hi, NanAs::kEmpty),
         ShortestText(plan.tol, NanAs::kEmpty), ToString(e.bisect.direction),
         ShortestText(e.bisect.survived_value, NanAs::kEmpty),
         ShortestText(e.bisect.first_failing_value, NanAs::kEmpty), std::to_string(e.bisect.probes),
         std::to_string(plan.seeds.size()), OutcomeCode(e), Message(e)});
  }
  return csv;
}

std::string EnvelopeMapCsv(const EnvelopeResult& result) {
  const EnvelopePlan& plan = result.plan;
  std::string csv =
      "scenario,controller,parameter,value,parameter2,value2,survived,seeds_survived,seeds\n";
  if (!plan.axis2) return csv;
  for (const ControllerMap& map : result.maps) {
    for (const MapPoint& p : map.points) {
      AppendRow(&csv,
                {result.scenario.name, map.controller, plan.axis.path,
                 ShortestText(p.value, NanAs::kEmpty), plan.axis2->path,
                 ShortestText(p.value2, NanAs::kEmpty), CsvBool(p.survived()),
                 p.setup_failed ? "" : std::to_string(p.seeds_survived), std::to_string(p.seeds)});
    }
  }
  return csv;
}

std::string EnvelopeMarkdown(const EnvelopeResult& result) {
  const EnvelopePlan& plan = result.plan;
  const ParameterAxis& a = plan.axis;
  std::string md = "# Survival envelope: " + MarkdownCell(result.scenario.name) + "\n\n";
  md += "`" + a.path + "`" + UnitSuffix(a.unit) + " from " + Short(a.lo) + " to " + Short(a.hi) +
        ", bisected to " + Short(plan.tol) + "; the scenario's own value is " +
        Short(a.scenario_value) + ". " + (plan.seeds.size() == 1 ? "Seed " : "Seeds ") +
        SeedList(plan.seeds) + ": a value counts as survived only when every seed survives it.\n\n";

  md += "| controller | survived" + UnitSuffix(a.unit) + " | first failing" + UnitSuffix(a.unit) +
        " | harder | probes | outcome |\n| --- | --- | --- | --- | --- | --- |\n";
  for (const ControllerEnvelope& e : result.controllers) {
    md += "|";
    AppendMarkdownCell(&md, MarkdownCell(e.controller + (e.baseline ? " (baseline)" : "")));
    AppendMarkdownCell(&md, AtResolution(e.bisect.survived_value, plan.tol));
    AppendMarkdownCell(&md, AtResolution(e.bisect.first_failing_value, plan.tol));
    const bool known = e.setup_error.empty() && e.bisect.direction != HarderDirection::kUnknown;
    AppendMarkdownCell(&md, known ? ToString(e.bisect.direction) : "—");
    AppendMarkdownCell(&md, std::to_string(e.bisect.probes));
    std::string outcome = EnvelopeOutcomeText(e, plan);
    const std::string message = Message(e);
    if (e.setup_error.empty() && !message.empty()) outcome += " — " + message;
    AppendMarkdownCell(&md, MarkdownCell(outcome));
    md += "\n";
  }
  md +=
      "\nSurvived: the hardest value every seed survived (the largest when the parameter gets "
      "harder upward, the smallest when downward); the limit lies between it and the first "
      "failing value, if survival is monotone in the parameter — a response that is not (failure "
      "only inside the range, survival that comes and goes) is not detected.\n\n"
      "> **Caution.** This envelope comes from the simulated robot only and never certifies a "
      "real one. Validate on hardware with a tether or spotter, at low speed first, within local "
      "rules.\n";

  if (plan.axis2) {
    const ParameterAxis& b = *plan.axis2;
    md += "\n## Survival map: `" + a.path + "` × `" + b.path + "`\n\n";
    md += "A " + std::to_string(plan.grid) + " × " + std::to_string(plan.grid) + " grid; `" +
          b.path + "` from " + Short(b.hi) + " (top row) to " + Short(b.lo) + ", `" + a.path +
          "` from " + Short(a.lo) + " (left) to " + Short(a.hi) +
          ". `#` every seed survived, `+` some seeds survived, `.` no seed survived, `!` could "
          "not run.\n";
    for (const ControllerMap& map : result.maps) {
      md += "\n### " + MarkdownCell(map.controller) + "\n\n";
      if (!map.setup_error.empty()) md += "Some points could not run: " + map.setup_error + "\n\n";
      md += "```text\n" + MapText(map, plan) + "```\n";
    }
  }
  return md;
}

std::string EnvelopeManifestJson(const EnvelopeResult& result) {
  const EnvelopePlan& plan = result.plan;
  JsonText json;
  json.BeginObject();
  json.String("tool_version", result.tool_version);
  json.String("command", "envelope");
  json.Integer("jobs", result.jobs);
  json.Unsigned("runs", result.runs);
  json.Number("wall_s", result.wall_s);
  json.BeginObject("scenario");
  AppendScenarioInfoFields(&json, result.scenario);
  json.EndObject();
  json.BeginArray("seeds");
  for (std::uint64_t seed : plan.seeds) json.Unsigned({}, seed);
  json.EndArray();
  const auto axis = [&](std::string_view key, const ParameterAxis& a) {
    json.BeginObject(key);
    json.String("path", a.path);
    json.String("unit", a.unit);
    json.Number("scenario_value", a.scenario_value);
    json.Number("lo", a.lo);
    json.Number("hi", a.hi);
    json.EndObject();
  };
  axis("parameter", plan.axis);
  json.Number("tol", plan.tol);
  if (plan.axis2) {
    axis("parameter2", *plan.axis2);
    json.Integer("grid", plan.grid);
  }
  json.BeginArray("controllers");
  for (const ControllerEnvelope& e : result.controllers) {
    json.BeginObject();
    json.String("name", e.controller);
    json.String("outcome", OutcomeCode(e));
    json.BeginArray("probes");
    for (const ProbeRecord& p : e.probes) {
      json.BeginObject();
      json.Number("value", p.value);
      json.Integer("seeds_survived", p.seeds_survived);
      json.Integer("seeds", p.seeds);
      json.EndObject();
    }
    json.EndArray();
    json.EndObject();
  }
  json.EndArray();
  json.EndObject();
  return json.text();
}

}  // namespace upright::runner::internal

namespace upright::runner {

std::string EnvelopeOutcomeText(const ControllerEnvelope& e, const EnvelopePlan& plan) {
  const ParameterAxis& a = plan.axis;
  if (!e.setup_error.empty()) return "could not run: " + e.setup_error;
  const auto value = [&](double v) { return internal::AtResolution(v, plan.tol); };
  switch (e.bisect.outcome) {
    case BisectOutcome::kBracketed: {
      const bool upward = e.bisect.direction == HarderDirection::kUpward;
      return std::string("survives ") + (upward ? "up to " : "down to ") +
             internal::WithUnit(value(e.bisect.survived_value), a.unit) + "; fails at " +
             internal::WithUnit(value(e.bisect.first_failing_value), a.unit);
    }
    case BisectOutcome::kSurvivesWholeRange:
      return "survives the whole range, " + internal::Short(a.lo) + " to " +
             internal::WithUnit(internal::Short(a.hi), a.unit);
    case BisectOutcome::kFailsAtBothEnds:
      return "fails at both ends, " + internal::Short(a.lo) + " and " +
             internal::WithUnit(internal::Short(a.hi), a.unit);
  }
  return "";
}

}  // namespace upright::runner
