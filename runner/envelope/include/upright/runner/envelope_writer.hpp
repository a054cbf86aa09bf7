// Results folder of an envelope: an EnvelopeResult in; envelope.csv (one row per controller),
// envelope.md (the table, the survival maps as text) and, with a map, envelope_map.csv (one row
// per controller and grid point), then manifest.json, each written atomically.
#pragma once

#include <string>
#include <vector>

#include "upright/runner/envelope.hpp"

namespace upright::runner {

// Writes the files into `dir`, creating it and its parents; manifest.json last, so its presence
// means the folder is complete. Every file but the manifest depends only on the result's
// contents, never on timing or job count. False and *error (naming the path) on failure.
bool WriteEnvelopeResults(const std::string& dir, const EnvelopeResult& result, std::string* error);

// The names of the files WriteEnvelopeResults writes for `result`, for messages and tests.
std::vector<std::string> EnvelopeFileNames(const EnvelopeResult& result);

// One line for a terminal: "survives up to 212 N; fails at 215 N" and the like, values shown to
// the tolerance's resolution.
std::string EnvelopeOutcomeText(const ControllerEnvelope& envelope, const EnvelopePlan& plan);

}  // namespace upright::runner
