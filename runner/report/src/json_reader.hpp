// The JSON reader of the report, for the manifests of results folders: nlohmann-json's parser
// (strict RFC 8259) under the project's rules — errors as "<path>:<line>: <what>", and nesting
// limited, since a manifest is shallow and a document nested a million deep must not exhaust the
// stack of whatever walks it.
#pragma once

#include <nlohmann/json.hpp>
#include <string>
#include <string_view>

#include "upright/base/result.hpp"

namespace upright::runner::internal {

// Containers open at once that a document may have; the one that opens beyond is refused.
inline constexpr int kMaxJsonDepth = 64;

// Parses one JSON document (surrounding white space allowed); objects keep their members in file
// order. Fails with "<path>:<line>: <what>" on text RFC 8259 does not allow and on nesting deeper
// than kMaxJsonDepth.
Result<nlohmann::ordered_json> ParseJson(std::string_view text, const std::string& path);

// A number as text: integers in their digits, others in the shortest form that reads back as the
// same double (as the program's manifests write them); "" for a value that is no number.
std::string NumberText(const nlohmann::ordered_json& value);

}  // namespace upright::runner::internal
