#include "json_reader.hpp"

#include <algorithm>
#include <cstdint>
#include <utility>
#include <vector>

#include "upright/base/number_text.hpp"

namespace upright::runner::internal {
namespace {

using Json = nlohmann::ordered_json;

// The line (from 1) of the byte at `offset` (from 0; the end of the text counts as its last line).
int LineAt(std::string_view text, std::size_t offset) {
  offset = std::min(offset, text.size());
  return 1 + static_cast<int>(std::count(text.begin(), text.begin() + offset, '\n'));
}

// The offset of the bracket that opens the (kMaxJsonDepth + 1)-th container, skipping strings;
// the text up to it is well-formed, since the parser read that far.
std::size_t TooDeepAt(std::string_view text) {
  int depth = 0;
  bool in_string = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (in_string) {
      if (c == '\\') {
        ++i;
      } else if (c == '"') {
        in_string = false;
      }
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > kMaxJsonDepth) return i;
    } else if (c == ']' || c == '}') {
      --depth;
    }
  }
  return text.size();
}

// nlohmann's message without its own prefixes ("[json.exception.parse_error.101] parse error at
// line 1, column 3: "): the path and line go in front instead.
std::string WhatOf(const nlohmann::json::exception& e) {
  std::string what = e.what();
  if (const auto end = what.find("] ");
      what.rfind("[json.exception.", 0) == 0 && end != std::string::npos) {
    what.erase(0, end + 2);
  }
  if (what.rfind("parse error", 0) == 0) {
    if (const auto colon = what.find(": "); colon != std::string::npos) what.erase(0, colon + 2);
  }
  return what;
}

// Builds the document from the parser's events, refusing a container beyond kMaxJsonDepth before
// it is built (the parser stops at the first event refused).
class Builder : public nlohmann::json_sax<Json> {
 public:
  bool null() override { return Put(nullptr); }
  bool boolean(bool value) override { return Put(value); }
  bool number_integer(number_integer_t value) override { return Put(value); }
  bool number_unsigned(number_unsigned_t value) override { return Put(value); }
  bool number_float(number_float_t value, const string_t&) override { return Put(value); }
  bool string(string_t& value) override { return Put(std::move(value)); }
  bool binary(binary_t&) override { return false; }  // JSON text has no binary values
  bool start_object(std::size_t) override { return Open(Json::object()); }
  bool key(string_t& name) override {
    key_ = std::move(name);
    return true;
  }
  bool end_object() override { return Close(); }
  bool start_array(std::size_t) override { return Open(Json::array()); }
  bool end_array() override { return Close(); }
  bool parse_error(std::size_t position, const std::string&,
                   const nlohmann::json::exception& e) override {
    // `position` counts the bytes read, the offending one included.
    error_offset_ = position > 0 ? position - 1 : 0;
    error_ = WhatOf(e);
    return false;
  }

  Json& root() { return root_; }
  bool too_deep() const { return too_deep_; }
  const std::string& error() const { return error_; }
  std::size_t error_offset() const { return error_offset_; }

 private:
  // Puts `value` in the innermost open container (or makes it the document) and returns it.
  Json* Place(Json value) {
    if (open_.empty()) {
      root_ = std::move(value);
      return &root_;
    }
    Json& container = *open_.back();
    if (container.is_array()) {
      container.push_back(std::move(value));
      return &container.back();
    }
    return &(container[key_] = std::move(value));
  }
  bool Put(Json value) {
    Place(std::move(value));
    return true;
  }
  // Only the innermost open container grows, so the pointers to the others stay valid.
  bool Open(Json container) {
    if (open_.size() >= static_cast<std::size_t>(kMaxJsonDepth)) {
      too_deep_ = true;
      return false;
    }
    open_.push_back(Place(std::move(container)));
    return true;
  }
  bool Close() {
    open_.pop_back();
    return true;
  }

  Json root_;
  std::vector<Json*> open_;
  std::string key_;
  bool too_deep_ = false;
  std::string error_;
  std::size_t error_offset_ = 0;
};

}  // namespace

Result<Json> ParseJson(std::string_view text, const std::string& path) {
  Builder builder;
  if (Json::sax_parse(text, &builder)) return std::move(builder.root());
  if (builder.too_deep()) {
    return Failure(path + ":" + std::to_string(LineAt(text, TooDeepAt(text))) +
                   ": nesting deeper than " + std::to_string(kMaxJsonDepth) + " levels");
  }
  return Failure(path + ":" + std::to_string(LineAt(text, builder.error_offset())) + ": " +
                 builder.error());
}

std::string NumberText(const Json& value) {
  if (value.is_number_unsigned()) return std::to_string(value.get<std::uint64_t>());
  if (value.is_number_integer()) return std::to_string(value.get<std::int64_t>());
  if (value.is_number_float()) return ShortestText(value.get<double>());
  return "";
}

}  // namespace upright::runner::internal
