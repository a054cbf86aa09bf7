// JsonText: the program's one writer of JSON (RFC 8259), indented, for the manifest of every
// results folder (runs, sweeps, envelopes) and `upright design --json` — keys and values in, text
// out. Strings are escaped per RFC 8259 §7; numbers print in their shortest exact form
// (upright::ShortestText, -0 as 0) and non-finite ones as null, since JSON has no NaN or infinity.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

namespace upright::runner {

// Appends `text` as a JSON string: quotes, '"' and '\' escaped, control characters as \b \f \n \r
// \t or \u00XX; every other byte (UTF-8 included) as is.
void AppendJsonString(std::string* out, std::string_view text);

// One JSON document built value by value, in the order written.
class JsonText {
 public:
  // Inside an object every value takes a key; inside an array (or at the top) the key is empty.
  void BeginObject(std::string_view key = {});
  void EndObject();
  void BeginArray(std::string_view key = {});
  void EndArray();
  void String(std::string_view key, std::string_view value);
  void Number(std::string_view key, double value);
  void Integer(std::string_view key, std::int64_t value);
  void Unsigned(std::string_view key, std::uint64_t value);
  void Null(std::string_view key);
  void Bool(std::string_view key, bool value);

  // The document, ending in a newline once the outermost value is closed.
  const std::string& text() const { return out_; }

 private:
  void Key(std::string_view key);  // the separator, the indentation and the key of a value
  void Open(std::string_view key, char bracket);
  void Close(char bracket);

  std::string out_;
  int depth_ = 0;
  bool first_in_container_ = true;
};

}  // namespace upright::runner
