// A small JSON (RFC 8259) reader for the manifests of results folders: text in, a tree of values
// out. Objects keep their members in file order; numbers keep their text as well as their value.
#pragma once

#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "upright/base/result.hpp"

namespace upright::runner::report {

enum class JsonKind { kNull, kBool, kNumber, kString, kArray, kObject };

struct JsonValue {
  JsonKind kind = JsonKind::kNull;
  bool boolean = false;
  double number = 0;
  std::string text;              // a string's value (UTF-8), or a number as written
  std::vector<JsonValue> items;  // an array's elements
  std::vector<std::pair<std::string, JsonValue>> members;  // an object's members, in order

  // The member named `key` of an object; nullptr when this is not an object or has none.
  const JsonValue* Find(std::string_view key) const;
  // A member's string value, or `fallback` when it is absent or not a string.
  std::string StringOr(std::string_view key, std::string_view fallback) const;
};

// Parses one JSON document (surrounding white space allowed). Fails
// ("<path>:<line>: <what> (expected ...)") on malformed text or nesting deeper than 64.
Result<JsonValue> ParseJson(std::string_view text, const std::string& path);

}  // namespace upright::runner::report
