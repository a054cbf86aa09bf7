// The text of an envelope's files: an EnvelopeResult in; envelope.csv, envelope.md,
// envelope_map.csv and manifest.json as strings out. The same result always gives the same bytes
// (the manifest aside, which records wall time and jobs).
#pragma once

#include <string>

#include "upright/runner/envelope/envelope.hpp"

namespace upright::runner::internal {

// One row per controller: scenario, controller, baseline, parameter, unit, lo, hi, tol,
// direction, survived_value, first_failing_value, probes, seeds, outcome, message.
std::string EnvelopeCsv(const EnvelopeResult& result);

// The table, what its value means, the caution, and each controller's survival map as text.
std::string EnvelopeMarkdown(const EnvelopeResult& result);

// One row per controller and grid point: scenario, controller, parameter, value, parameter2,
// value2, survived (0/1), seeds_survived (empty where the point could not run), seeds.
std::string EnvelopeMapCsv(const EnvelopeResult& result);

// Tool version, jobs, wall time, the scenario and model files with their SHA-256, the plan, and
// every probe made.
std::string EnvelopeManifestJson(const EnvelopeResult& result);

// `value` with the decimals that show a step of resolution / 2 (3 → "212", 0.02 → "0.309"); NaN
// as "—", for Markdown.
std::string AtResolution(double value, double resolution);

}  // namespace upright::runner::internal
