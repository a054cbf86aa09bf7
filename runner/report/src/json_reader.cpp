#include "json_reader.hpp"

#include <cctype>
#include <charconv>
#include <cstdint>

namespace upright::runner::report {
namespace {

constexpr int kMaxDepth = 64;

class JsonParser {
 public:
  JsonParser(std::string_view text, const std::string& path) : text_(text), path_(path) {}

  Result<JsonValue> Document() {
    JsonValue value;
    SkipSpace();
    if (!Value(&value, 0)) return Failure(error_);
    SkipSpace();
    if (at_ != text_.size()) {
      Fail("text after the document (expected the end of the file)");
      return Failure(error_);
    }
    return value;
  }

 private:
  bool Fail(const std::string& what) {
    if (error_.empty()) error_ = path_ + ":" + std::to_string(line_) + ": " + what;
    return false;
  }

  void SkipSpace() {
    while (at_ < text_.size()) {
      const char c = text_[at_];
      if (c == '\n') {
        ++line_;
      } else if (c != ' ' && c != '\t' && c != '\r') {
        return;
      }
      ++at_;
    }
  }

  bool Literal(std::string_view word) {
    if (text_.substr(at_, word.size()) != word) {
      return Fail(
          "unknown word (expected a value: an object, array, string, number, true, "
          "false or null)");
    }
    at_ += word.size();
    return true;
  }

  bool Value(JsonValue* value, int depth) {
    if (depth > kMaxDepth) return Fail("nesting deeper than 64 levels");
    if (at_ >= text_.size()) return Fail("the file ends early (expected a value)");
    *value = JsonValue{};
    const char c = text_[at_];
    if (c == '{') return Object(value, depth);
    if (c == '[') return Array(value, depth);
    if (c == '"') {
      value->kind = JsonKind::kString;
      return String(&value->text);
    }
    if (c == 't' || c == 'f') {
      value->kind = JsonKind::kBool;
      value->boolean = c == 't';
      return Literal(c == 't' ? "true" : "false");
    }
    if (c == 'n') return Literal("null");
    if (c == '-' || (c >= '0' && c <= '9')) return Number(value);
    return Fail(std::string("'") + c +
                "' (expected a value: an object, array, string, number, true, false or null)");
  }

  bool Object(JsonValue* value, int depth) {
    value->kind = JsonKind::kObject;
    ++at_;
    SkipSpace();
    if (at_ < text_.size() && text_[at_] == '}') {
      ++at_;
      return true;
    }
    while (true) {
      SkipSpace();
      if (at_ >= text_.size() || text_[at_] != '"') return Fail("expected a member name in quotes");
      std::string key;
      if (!String(&key)) return false;
      SkipSpace();
      if (at_ >= text_.size() || text_[at_] != ':') return Fail("expected ':' after a member name");
      ++at_;
      SkipSpace();
      JsonValue member;
      if (!Value(&member, depth + 1)) return false;
      value->members.emplace_back(std::move(key), std::move(member));
      SkipSpace();
      if (at_ < text_.size() && text_[at_] == ',') {
        ++at_;
        continue;
      }
      if (at_ < text_.size() && text_[at_] == '}') {
        ++at_;
        return true;
      }
      return Fail("expected ',' or '}' in an object");
    }
  }

  bool Array(JsonValue* value, int depth) {
    value->kind = JsonKind::kArray;
    ++at_;
    SkipSpace();
    if (at_ < text_.size() && text_[at_] == ']') {
      ++at_;
      return true;
    }
    while (true) {
      SkipSpace();
      JsonValue item;
      if (!Value(&item, depth + 1)) return false;
      value->items.push_back(std::move(item));
      SkipSpace();
      if (at_ < text_.size() && text_[at_] == ',') {
        ++at_;
        continue;
      }
      if (at_ < text_.size() && text_[at_] == ']') {
        ++at_;
        return true;
      }
      return Fail("expected ',' or ']' in an array");
    }
  }

  bool Number(JsonValue* value) {
    value->kind = JsonKind::kNumber;
    const std::size_t start = at_;
    if (text_[at_] == '-') ++at_;
    while (at_ < text_.size() &&
           (std::isdigit(static_cast<unsigned char>(text_[at_])) || text_[at_] == '.' ||
            text_[at_] == 'e' || text_[at_] == 'E' || text_[at_] == '+' || text_[at_] == '-')) {
      ++at_;
    }
    value->text = std::string(text_.substr(start, at_ - start));
    const char* first = value->text.data();
    const char* last = first + value->text.size();
    const auto [end, ec] = std::from_chars(first, last, value->number);
    if (ec != std::errc() || end != last) return Fail("'" + value->text + "' is not a number");
    return true;
  }

  static void AppendUtf8(std::uint32_t code, std::string* out) {
    if (code < 0x80) {
      *out += static_cast<char>(code);
    } else if (code < 0x800) {
      *out += static_cast<char>(0xC0 | (code >> 6));
      *out += static_cast<char>(0x80 | (code & 0x3F));
    } else if (code < 0x10000) {
      *out += static_cast<char>(0xE0 | (code >> 12));
      *out += static_cast<char>(0x80 | ((code >> 6) & 0x3F));
      *out += static_cast<char>(0x80 | (code & 0x3F));
    } else {
      *out += static_cast<char>(0xF0 | (code >> 18));
      *out += static_cast<char>(0x80 | ((code >> 12) & 0x3F));
      *out += static_cast<char>(0x80 | ((code >> 6) & 0x3F));
      *out += static_cast<char>(0x80 | (code & 0x3F));
    }
  }

  bool Hex4(std::uint32_t* code) {
    if (at_ + 4 > text_.size()) return Fail("a \\u escape needs four hex digits");
    *code = 0;
    for (int k = 0; k < 4; ++k) {
      const char c = text_[at_++];
      std::uint32_t digit = 0;
      if (c >= '0' && c <= '9') {
        digit = static_cast<std::uint32_t>(c - '0');
      } else if (c >= 'a' && c <= 'f') {
        digit = static_cast<std::uint32_t>(c - 'a' + 10);
      } else if (c >= 'A' && c <= 'F') {
        digit = static_cast<std::uint32_t>(c - 'A' + 10);
      } else {
        return Fail("a \\u escape needs four hex digits");
      }
      *code = *code * 16 + digit;
    }
    return true;
  }

  bool String(std::string* out) {
    ++at_;  // the opening quote
    out->clear();
    while (true) {
      if (at_ >= text_.size()) return Fail("a string is never closed (expected '\"')");
      const char c = text_[at_++];
      if (c == '"') return true;
      if (static_cast<unsigned char>(c) < 0x20) {
        return Fail("a control character inside a string (expected it escaped)");
      }
      if (c != '\\') {
        *out += c;
        continue;
      }
      if (at_ >= text_.size()) return Fail("a string is never closed (expected '\"')");
      const char e = text_[at_++];
      switch (e) {
        case '"':
          *out += '"';
          break;
        case '\\':
          *out += '\\';
          break;
        case '/':
          *out += '/';
          break;
        case 'b':
          *out += '\b';
          break;
        case 'f':
          *out += '\f';
          break;
        case 'n':
          *out += '\n';
          break;
        case 'r':
          *out += '\r';
          break;
        case 't':
          *out += '\t';
          break;
        case 'u': {
          std::uint32_t code = 0;
          if (!Hex4(&code)) return false;
          if (code >= 0xD800 && code < 0xDC00) {
            std::uint32_t low = 0;
            if (text_.substr(at_, 2) != "\\u") return Fail("a lone high surrogate in \\u escapes");
            at_ += 2;
            if (!Hex4(&low)) return false;
            if (low < 0xDC00 || low >= 0xE000) return Fail("a lone high surrogate in \\u escapes");
            code = 0x10000 + ((code - 0xD800) << 10) + (low - 0xDC00);
          } else if (code >= 0xDC00 && code < 0xE000) {
            return Fail("a lone low surrogate in \\u escapes");
          }
          AppendUtf8(code, out);
          break;
        }
        default:
          return Fail(std::string("unknown escape '\\") + e + "' in a string");
      }
    }
  }

  std::string_view text_;
  const std::string& path_;
  std::size_t at_ = 0;
  int line_ = 1;
  std::string error_;
};

}  // namespace

const JsonValue* JsonValue::Find(std::string_view key) const {
  if (kind != JsonKind::kObject) return nullptr;
  for (const auto& [name, value] : members) {
    if (name == key) return &value;
  }
  return nullptr;
}

std::string JsonValue::StringOr(std::string_view key, std::string_view fallback) const {
  const JsonValue* value = Find(key);
  if (value == nullptr || value->kind != JsonKind::kString) return std::string(fallback);
  return value->text;
}

Result<JsonValue> ParseJson(std::string_view text, const std::string& path) {
  JsonParser parser(text, path);
  return parser.Document();
}

}  // namespace upright::runner::report
