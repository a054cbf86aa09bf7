// Results folder of an envelope: an EnvelopeResult in; envelope.csv (one row per controller),
// envelope.md (the table, the survival maps as text) and, with a map, envelope_map.csv (one row
// per controller and grid point), then manifest.json, each written atomically.
#pragma once

#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/runner/envelope/envelope.hpp"

namespace upright::runner {

// Writes the files into `dir`, creating it and its parents; manifest.json last, so its presence
// means the folder is complete. Every file but the manifest depends only on the result's
// contents, never on timing or job count. On failure, a message naming the path.
Status WriteEnvelopeResults(const std::string& dir, const EnvelopeResult& result);

// The names of the files WriteEnvelopeResults writes for `result`, for messages and tests.
std::vector<std::string> EnvelopeFileNames(const EnvelopeResult& result);

// One line for a terminal: "survives up to 212 N; fails at 215 N" and the like, values shown to
// the tolerance's resolution.
std::string EnvelopeOutcomeText(const ControllerEnvelope& envelope, const EnvelopePlan& plan);

}  // namespace upright::runner
