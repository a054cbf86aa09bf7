#include "upright/runner/common/text_format.hpp"

namespace upright::runner {

void AppendCsvField(std::string* out, std::string_view text) {
  // RFC 4180 §2: fields containing line breaks (CRLF), double quotes or commas should be enclosed
  // in double quotes (rule 6); a double quote inside such a field is escaped by preceding it with
  // another double quote (rule 7). Records here end in LF, which CSV readers accept alike.
  if (text.find_first_of(",\"\r\n") == std::string_view::npos) {
    out->append(text);
    return;
  }
  out->push_back('"');
  for (char c : text) {
    if (c == '"') out->push_back('"');
    out->push_back(c);
  }
  out->push_back('"');
}

std::string XmlEscaped(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

const char* CsvBool(bool value) { return value ? "true" : "false"; }

std::string MarkdownCell(std::string_view text) {
  std::string cell;
  cell.reserve(text.size());
  for (char c : text) {
    if (c == '|') {
      cell += "\\|";
    } else if (c == '\n' || c == '\r') {
      cell += ' ';
    } else {
      cell += c;
    }
  }
  return cell;
}

void AppendMarkdownCell(std::string* md, std::string_view text) {
  md->push_back(' ');
  md->append(text);
  md->append(" |");
}

}  // namespace upright::runner
