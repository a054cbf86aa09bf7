// <dispersions>: Monte Carlo spreads, one <spread> per scenario parameter, normal or uniform, in
// the parameter's file units.
#include "scenario_dispersions.hpp"

#include <array>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "upright/runner/scenario/scenario_parameter.hpp"

namespace upright::runner::internal {
namespace {

constexpr std::array<std::string_view, 2> kKindNames = {"normal", "uniform"};
constexpr std::array<SpreadKind, 2> kKinds = {SpreadKind::kNormal, SpreadKind::kUniform};

// The same parameter however its path is written: the first of a repeatable element may be
// written without its index ("timeline/push.peak_N" is "timeline/push[1].peak_N").
std::string SameParameterKey(const std::string& param) {
  const std::size_t dot = param.rfind('.');
  if (dot == std::string::npos) return param;
  const std::string element = param.substr(0, dot);
  const bool repeatable = element.rfind("timeline/", 0) == 0 || element == "ground/friction";
  if (!repeatable || element.find('[') != std::string::npos) return param;
  return element + "[1]" + param.substr(dot);
}

// An attribute the other kind takes: reported when given, so a spread never silently ignores it.
void RefuseOther(model::XmlElement& spread, const ReadContext& context, std::string_view attribute,
                 const char* kind) {
  if (!spread.Has(attribute)) return;
  const std::optional<std::string> text = spread.String(attribute, model::Presence::kOptional);
  context.FieldError(spread, attribute, text.value_or(""),
                     std::string("only with kind=\"") + kind + "\"");
}

// One <spread>; nullopt when it is wrong (already reported).
std::optional<Dispersion> ReadSpread(model::XmlElement spread, const ReadContext& context,
                                     const Scenario& scenario, bool check_against_scenario,
                                     std::optional<std::string>* param_out) {
  Dispersion d;
  d.line = spread.line();
  bool ok = true;
  const std::optional<std::string> param = spread.String("param", model::Presence::kRequired);
  *param_out = param;
  ok = ok && param.has_value();
  d.param = param.value_or("");
  const std::optional<std::size_t> kind =
      spread.Choice("kind", kKindNames, model::Presence::kRequired);
  ok = ok && kind.has_value();
  if (kind) d.kind = kKinds[*kind];

  bool mean_given = false;
  if (!kind) {
    // Which attributes belong is unknown: take them as asked for, so only the kind is reported.
    for (const std::string_view attribute : {"sd", "mean", "lo", "hi"}) spread.Has(attribute);
  }
  if (kind && d.kind == SpreadKind::kNormal) {
    d.sd = RequiredNumber(spread, "sd", &ok);
    if (ok && !(d.sd > 0)) {
      context.FieldError(spread, "sd", Num(d.sd), "must be > 0");
      ok = false;
    }
    mean_given = spread.Has("mean");
    d.mean = OptionalNumber(spread, "mean", 0, &ok);
    RefuseOther(spread, context, "lo", "uniform");
    RefuseOther(spread, context, "hi", "uniform");
  } else if (kind) {
    bool ends_ok = true;
    d.lo = RequiredNumber(spread, "lo", &ends_ok);
    d.hi = RequiredNumber(spread, "hi", &ends_ok);
    if (ends_ok && !(d.lo < d.hi)) {
      context.FieldError(spread, "hi", Num(d.hi), "must be > lo = " + Num(d.lo));
      ends_ok = false;
    }
    ok = ok && ends_ok;
    RefuseOther(spread, context, "sd", "normal");
    RefuseOther(spread, context, "mean", "normal");
  }

  if (param && check_against_scenario) {
    const Result<double> nominal = GetScenarioParameter(scenario, d.param);
    if (!nominal) {
      context.FieldError(spread, "param", Quote(d.param), nominal.error());
      return std::nullopt;
    }
    d.nominal = *nominal;
    if (!mean_given) d.mean = d.nominal;
    if (!ok) return std::nullopt;
    // The centre of the spread must be a value the parameter takes, or most draws would be
    // redrawn and the sweep would not sample what the file says.
    const double centre = d.kind == SpreadKind::kNormal ? d.mean : 0.5 * (d.lo + d.hi);
    Scenario trial = scenario;
    if (const Status set = SetScenarioParameter(&trial, d.param, centre); !set) {
      if (d.kind == SpreadKind::kNormal) {
        context.FieldError(spread, "mean", Num(d.mean),
                           "not a value the parameter takes (" + set.error() + ")");
      } else {
        context.FieldError(spread, "lo", Num(d.lo) + ", hi = " + Num(d.hi),
                           "the midpoint is not a value the parameter takes (" + set.error() + ")");
      }
      return std::nullopt;
    }
  }
  if (!ok) return std::nullopt;
  return d;
}

}  // namespace

void ReadDispersions(model::XmlElement root, ReadContext& context, Scenario* scenario) {
  std::optional<model::XmlElement> dispersions =
      root.Child("dispersions", model::Presence::kOptional);
  if (!dispersions) return;
  const bool check_against_scenario = context.model != nullptr && !context.doc->HasErrors();
  const std::vector<model::XmlElement> spreads = dispersions->Children("spread");
  if (spreads.empty()) {
    context.Error(*dispersions,
                  "empty (expected at least one <spread param=\"...\" kind=\"normal\" sd=\"...\"/> "
                  "or <spread param=\"...\" kind=\"uniform\" lo=\"...\" hi=\"...\"/>)");
    return;
  }
  std::map<std::string, int> first_line;  // same-parameter key → line of its first spread
  for (model::XmlElement spread : spreads) {
    std::optional<std::string> param;
    std::optional<Dispersion> d =
        ReadSpread(spread, context, *scenario, check_against_scenario, &param);
    if (param) {
      const auto [it, inserted] = first_line.emplace(SameParameterKey(*param), spread.line());
      if (!inserted) {
        context.FieldError(spread, "param", Quote(*param),
                           "given twice (first on line " + std::to_string(it->second) + ")");
        continue;
      }
    }
    if (d) scenario->dispersions.push_back(std::move(*d));
  }
}

}  // namespace upright::runner::internal
