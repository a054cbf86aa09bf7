#include "upright/runner/common/json_text.hpp"

#include <cmath>

#include "upright/base/number_text.hpp"

namespace upright::runner {

void AppendJsonString(std::string* out, std::string_view text) {
  // RFC 8259 §7: quotation mark, reverse solidus and the control characters U+0000–U+001F must be
  // escaped; the two-character forms are used where the RFC defines one.
  static constexpr char kHex[] = "0123456789abcdef";
  out->push_back('"');
  for (char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    switch (c) {
      case '"':
        *out += "\\\"";
        break;
      case '\\':
        *out += "\\\\";
        break;
      case '\b':
        *out += "\\b";
        break;
      case '\f':
        *out += "\\f";
        break;
      case '\n':
        *out += "\\n";
        break;
      case '\r':
        *out += "\\r";
        break;
      case '\t':
        *out += "\\t";
        break;
      default:
        if (byte < 0x20) {
          *out += "\\u00";
          out->push_back(kHex[byte >> 4]);
          out->push_back(kHex[byte & 0xf]);
        } else {
          out->push_back(c);
        }
    }
  }
  out->push_back('"');
}

void JsonText::BeginObject(std::string_view key) { Open(key, '{'); }
void JsonText::EndObject() { Close('}'); }
void JsonText::BeginArray(std::string_view key) { Open(key, '['); }
void JsonText::EndArray() { Close(']'); }

void JsonText::String(std::string_view key, std::string_view value) {
  Key(key);
  AppendJsonString(&out_, value);
}

void JsonText::Number(std::string_view key, double value) {
  Key(key);
  if (!std::isfinite(value)) {
    out_ += "null";
    return;
  }
  // Shortest form that reads back as the same double; -0 as 0. Every such text is a JSON number
  // (RFC 8259 §6).
  AppendShortest(&out_, value);
}

void JsonText::Integer(std::string_view key, std::int64_t value) {
  Key(key);
  out_ += std::to_string(value);
}

void JsonText::Unsigned(std::string_view key, std::uint64_t value) {
  Key(key);
  out_ += std::to_string(value);
}

void JsonText::Null(std::string_view key) {
  Key(key);
  out_ += "null";
}

void JsonText::Bool(std::string_view key, bool value) {
  Key(key);
  out_ += value ? "true" : "false";
}

void JsonText::Key(std::string_view key) {
  if (depth_ > 0) {
    if (!first_in_container_) out_ += ',';
    out_ += '\n';
    out_.append(2 * static_cast<std::size_t>(depth_), ' ');
  }
  first_in_container_ = false;
  if (!key.empty()) {
    AppendJsonString(&out_, key);
    out_ += ": ";
  }
}

void JsonText::Open(std::string_view key, char bracket) {
  Key(key);
  out_ += bracket;
  ++depth_;
  first_in_container_ = true;
}

void JsonText::Close(char bracket) {
  --depth_;
  if (!first_in_container_) {
    out_ += '\n';
    out_.append(2 * static_cast<std::size_t>(depth_), ' ');
  }
  out_ += bracket;
  first_in_container_ = false;
  if (depth_ == 0) out_ += '\n';
}

}  // namespace upright::runner
