#include "upright/model/xml_reader.hpp"

#include <tinyxml2.h>

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <cstring>
#include <system_error>
#include <utility>

#include "upright/base/read_file.hpp"

namespace upright::model {
namespace internal {

// One element, copied out of the parser's tree together with what the caller has asked of it.
struct XmlNode {
  std::string name;
  std::string label;
  int line = 0;
  std::vector<std::pair<std::string, std::string>> attributes;  // in file order
  std::vector<std::size_t> children;                            // indices into XmlTree::nodes
  std::vector<std::string> asked_attributes;                    // in the order asked
  std::vector<std::string> asked_children;
  bool reached = false;  // handed to the caller, so its unread parts are worth reporting
  // The element's own text pieces joined as written (entities replaced), whether any of it is
  // more than white space, and whether the caller asked for it.
  std::string text;
  bool has_text = false;
  bool text_read = false;
};

struct XmlTree {
  std::string path;
  std::vector<XmlNode> nodes;  // pre-order, so index order is file order; nodes[0] is the root
  std::vector<FileError> errors;

  void Error(int line, std::string message) {
    errors.push_back(FileError{path, line, std::move(message)});
  }
};

}  // namespace internal

namespace {

using internal::XmlNode;
using internal::XmlTree;

// XML's white space characters.
constexpr std::string_view kSpace = " \t\r\n";

// `text` with every run of white space made one space, and none at either end.
std::string CollapseSpace(std::string_view text) {
  std::string collapsed;
  std::size_t at = text.find_first_not_of(kSpace);
  while (at != std::string_view::npos) {
    const std::size_t end = std::min(text.find_first_of(kSpace, at), text.size());
    if (!collapsed.empty()) collapsed += ' ';
    collapsed += text.substr(at, end - at);
    at = text.find_first_not_of(kSpace, end);
  }
  return collapsed;
}

void Remember(std::vector<std::string>& names, std::string_view name) {
  if (std::find(names.begin(), names.end(), name) == names.end()) names.emplace_back(name);
}

std::string JoinNames(const std::vector<std::string>& names) {
  std::string joined;
  for (const std::string& name : names) joined += (joined.empty() ? "" : ", ") + name;
  return joined;
}

// Where line `line` (1-based) of `text` starts and ends (before its line break); npos when the
// text has fewer lines.
std::pair<std::size_t, std::size_t> LineSpan(std::string_view text, int line) {
  std::size_t start = 0;
  for (int i = 1; i < line; ++i) {
    start = text.find('\n', start);
    if (start == std::string_view::npos) return {start, start};
    ++start;
  }
  return {start, std::min(text.find('\n', start), text.size())};
}

// XML name characters as the parser takes them: letters, '_', ':' and any byte of a multi-byte
// character to start; digits, '.' and '-' too after that.
bool IsNameStart(char c) {
  const auto u = static_cast<unsigned char>(c);
  return u >= 0x80 || std::isalpha(u) || c == '_' || c == ':';
}
bool IsNameChar(char c) {
  return IsNameStart(c) || std::isdigit(static_cast<unsigned char>(c)) || c == '.' || c == '-';
}

// The element name the parser names in its detail ("XMLElement name=control"), or "".
std::string ElementInDetail(const tinyxml2::XMLDocument& doc) {
  const std::string detail = doc.ErrorStr();
  const std::string key = "XMLElement name=";
  const std::size_t at = detail.find(key);
  return at == std::string::npos ? std::string() : detail.substr(at + key.size());
}

// Where the opening tag of <element> that reaches line `line` starts: the last "<element" that
// begins at or before the end of the line; npos when there is none.
std::size_t TagStart(std::string_view text, int line, const std::string& element) {
  const auto [line_start, line_end] = LineSpan(text, line);
  if (element.empty() || line_start == std::string_view::npos) return std::string_view::npos;
  std::size_t at = line_end;
  while (true) {
    at = text.rfind("<" + element, at);
    if (at == std::string_view::npos) return at;
    const std::size_t after = at + 1 + element.size();
    if (after >= text.size() || !IsNameChar(text[after])) return at;
    if (at == 0) return std::string_view::npos;
    --at;
  }
}

// What is wrong with the attributes of the tag of <element> that reaches line `line`: the first
// attribute, from the tag's start, that is not name="value" (or 'value'), or that repeats a name.
std::string AttributeProblem(std::string_view text, int line, const std::string& element) {
  const std::string fallback = "an attribute of <" + element +
                               "> is malformed or given twice (expected name=\"value\", each "
                               "name once)";
  const std::size_t at = TagStart(text, line, element);
  if (at == std::string_view::npos) return fallback;
  std::size_t p = at + 1 + element.size();
  std::vector<std::string> names;
  while (p < text.size()) {
    p = text.find_first_not_of(kSpace, p);
    if (p == std::string_view::npos || !IsNameStart(text[p])) break;  // '>', '/>' or junk
    const std::size_t name_start = p;
    while (p < text.size() && IsNameChar(text[p])) ++p;
    const std::string name(text.substr(name_start, p - name_start));
    p = text.find_first_not_of(kSpace, p);
    if (p == std::string_view::npos || text[p] != '=') {
      return "attribute '" + name + "' has no value (expected " + name + "=\"...\")";
    }
    p = text.find_first_not_of(kSpace, p + 1);
    if (p == std::string_view::npos || (text[p] != '"' && text[p] != '\'')) {
      return "the value of attribute '" + name + "' is missing its quotes (expected " + name +
             "=\"...\")";
    }
    const std::size_t close = text.find(text[p], p + 1);
    if (close == std::string_view::npos) {
      return "the value of attribute '" + name + "' has no closing quote";
    }
    if (std::find(names.begin(), names.end(), name) != names.end()) {
      return "attribute '" + name + "' is given twice in <" + element + ">";
    }
    names.push_back(name);
    p = close + 1;
  }
  return fallback;
}

// A syntax error in words, for the line the parser reports it at.
std::string ParserMessage(const tinyxml2::XMLDocument& doc, std::string_view text) {
  const int line = doc.ErrorLineNum();
  const std::string element = ElementInDetail(doc);
  std::string what;
  switch (doc.ErrorID()) {
    case tinyxml2::XML_ERROR_EMPTY_DOCUMENT:
      what = "the file is empty (expected one root element)";
      break;
    case tinyxml2::XML_ERROR_MISMATCHED_ELEMENT: {
      // The parser says so too of an element open when the text ends right after its tag (a
      // file cut short): no closing tag follows it then.
      const std::size_t at = TagStart(text, line, element);
      if (at != std::string_view::npos && text.find("</", at) == std::string_view::npos) {
        what = "the element <" + element +
               "> opened on this line is not closed before the end of the file";
        break;
      }
      what = "mismatched closing tag: the element <" + element +
             "> opened on this line is closed by another element's closing tag (expected </" +
             element + ">, or <" + element + " .../> for an element with no content)";
      break;
    }
    case tinyxml2::XML_ERROR_PARSING_ATTRIBUTE:
      what = AttributeProblem(text, line, element);
      break;
    case tinyxml2::XML_ERROR_PARSING_ELEMENT:
      what =
          "a tag is not ended properly (expected attributes as name=\"value\", then '>' or "
          "'/>')";
      break;
    case tinyxml2::XML_ERROR_PARSING_TEXT:
      what = "text runs on to the end of the file (an element is not closed)";
      break;
    case tinyxml2::XML_ERROR_PARSING_CDATA:
      what = "a CDATA section is not closed (expected ]]>)";
      break;
    case tinyxml2::XML_ERROR_PARSING_COMMENT:
      what = "a comment is not closed (expected -->)";
      break;
    case tinyxml2::XML_ERROR_PARSING_DECLARATION:
      what = "a declaration <?...?> is not closed (expected ?>)";
      break;
    case tinyxml2::XML_ERROR_PARSING_UNKNOWN:
      what = "a <!...> construct is not closed (expected >)";
      break;
    case tinyxml2::XML_ELEMENT_DEPTH_EXCEEDED:
      what =
          "elements are nested more than " + std::to_string(TINYXML2_MAX_ELEMENT_DEPTH) + " deep";
      break;
    case tinyxml2::XML_ERROR_PARSING: {
      // Either a '<' that starts no element, or an element left open at the end of the file.
      const auto [start, end] = LineSpan(text, line);
      bool stray = false;
      for (std::size_t i = start; start != std::string_view::npos && i < end; ++i) {
        if (text[i] != '<') continue;
        const char next = i + 1 < end ? text[i + 1] : ' ';
        if (!IsNameStart(next) && next != '/' && next != '!' && next != '?') stray = true;
      }
      what = stray ? "a '<' here starts no element name (write &lt; for a '<' in text)"
                   : "an element opened on this line is not closed before the end of the file";
      break;
    }
    default:
      what = "the file is not well-formed XML";
      break;
  }
  return "malformed XML: " + what;
}

void Flatten(const tinyxml2::XMLElement& element, const std::string& label, XmlTree& tree) {
  const std::size_t index = tree.nodes.size();
  XmlNode node;
  node.name = element.Name();
  node.label = label;
  node.line = element.GetLineNum();
  for (const tinyxml2::XMLAttribute* a = element.FirstAttribute(); a != nullptr; a = a->Next()) {
    node.attributes.emplace_back(a->Name(), a->Value());
  }
  tree.nodes.push_back(std::move(node));
  for (const tinyxml2::XMLNode* child = element.FirstChild(); child != nullptr;
       child = child->NextSibling()) {
    if (const tinyxml2::XMLElement* child_element = child->ToElement()) {
      const std::size_t child_index = tree.nodes.size();
      const std::string child_label =
          index == 0 ? std::string(child_element->Name()) : label + "/" + child_element->Name();
      Flatten(*child_element, child_label, tree);
      tree.nodes[index].children.push_back(child_index);
    } else if (const tinyxml2::XMLText* text = child->ToText()) {
      const std::string_view value = text->Value();
      tree.nodes[index].text += value;
      if (value.find_first_not_of(kSpace) != std::string_view::npos) {
        tree.nodes[index].has_text = true;
      }
    }
  }
}

std::unique_ptr<XmlTree> BuildTree(std::string_view text, const std::string& path) {
  auto tree = std::make_unique<XmlTree>();
  tree->path = path;
  tinyxml2::XMLDocument doc;
  doc.Parse(text.data(), text.size());
  if (doc.Error()) {
    tree->Error(doc.ErrorLineNum(), ParserMessage(doc, text));
    return tree;
  }
  const tinyxml2::XMLElement* root = doc.FirstChildElement();
  if (root == nullptr) {
    tree->Error(0, "no root element");
    return tree;
  }
  Flatten(*root, root->Name(), *tree);
  for (const tinyxml2::XMLElement* extra = root->NextSiblingElement(); extra != nullptr;
       extra = extra->NextSiblingElement()) {
    tree->Error(extra->GetLineNum(), std::string("second top-level element <") + extra->Name() +
                                         "> (a file holds one root element)");
  }
  return tree;
}

}  // namespace

XmlDocument::XmlDocument(std::unique_ptr<internal::XmlTree> tree) : tree_(std::move(tree)) {}
XmlDocument::XmlDocument(XmlDocument&&) noexcept = default;
XmlDocument& XmlDocument::operator=(XmlDocument&&) noexcept = default;
XmlDocument::~XmlDocument() = default;

XmlDocument XmlDocument::Open(const std::string& path) {
  Result<std::string> text = ReadRegularFile(path, kMaxInputFileBytes);
  if (!text) {
    auto tree = std::make_unique<XmlTree>();
    tree->path = path;
    tree->Error(0, std::move(text.error()));
    return XmlDocument(std::move(tree));
  }
  return Parse(*text, path);
}

XmlDocument XmlDocument::Parse(std::string_view text, const std::string& path) {
  return XmlDocument(BuildTree(text, path));
}

const std::string& XmlDocument::path() const { return tree_->path; }

bool XmlDocument::parsed() const { return !tree_->nodes.empty(); }

XmlElement XmlDocument::Root() {
  tree_->nodes.at(0).reached = true;
  return XmlElement(tree_.get(), 0);
}

void XmlDocument::AddError(int line, std::string message) {
  tree_->Error(line, std::move(message));
}

void XmlDocument::ReportUnread() {
  for (const XmlNode& node : tree_->nodes) {
    if (!node.reached) continue;
    for (const auto& [name, value] : node.attributes) {
      if (std::find(node.asked_attributes.begin(), node.asked_attributes.end(), name) !=
          node.asked_attributes.end()) {
        continue;
      }
      tree_->Error(node.line,
                   node.label + ": unknown attribute '" + name + "' " +
                       (node.asked_attributes.empty()
                            ? "(this element takes no attributes)"
                            : "(expected one of: " + JoinNames(node.asked_attributes) + ")"));
    }
    for (const std::size_t child_index : node.children) {
      const XmlNode& child = tree_->nodes[child_index];
      if (std::find(node.asked_children.begin(), node.asked_children.end(), child.name) !=
          node.asked_children.end()) {
        continue;
      }
      tree_->Error(child.line,
                   node.label + ": unknown element <" + child.name + "> " +
                       (node.asked_children.empty()
                            ? "(this element takes no child elements)"
                            : "(expected one of: " + JoinNames(node.asked_children) + ")"));
    }
    if (node.has_text && !node.text_read) {
      tree_->Error(node.line, node.label + ": unexpected text inside the element");
    }
  }
}

bool XmlDocument::HasErrors() const { return !tree_->errors.empty(); }

std::vector<FileError> XmlDocument::errors() const {
  std::vector<FileError> sorted = tree_->errors;
  std::stable_sort(sorted.begin(), sorted.end(),
                   [](const FileError& a, const FileError& b) { return a.line < b.line; });
  return sorted;
}

const std::string& XmlElement::name() const { return tree_->nodes[index_].name; }

const std::string& XmlElement::label() const { return tree_->nodes[index_].label; }

int XmlElement::line() const { return tree_->nodes[index_].line; }

const std::string* XmlElement::AskAttribute(std::string_view attribute, Presence presence) {
  XmlNode& node = tree_->nodes[index_];
  Remember(node.asked_attributes, attribute);
  for (const auto& [name, value] : node.attributes) {
    if (name == attribute) return &value;
  }
  if (presence == Presence::kRequired) {
    tree_->Error(node.line,
                 node.label + ": missing required attribute '" + std::string(attribute) + "'");
  }
  return nullptr;
}

void XmlElement::ValueError(std::string_view attribute, const std::string& text,
                            std::string_view problem) {
  tree_->Error(line(), label() + " " + std::string(attribute) + " = '" + text +
                           "': " + std::string(problem));
}

bool XmlElement::Has(std::string_view attribute) {
  return AskAttribute(attribute, Presence::kOptional) != nullptr;
}

std::optional<std::string> XmlElement::String(std::string_view attribute, Presence presence) {
  const std::string* text = AskAttribute(attribute, presence);
  if (text == nullptr) return std::nullopt;
  return *text;
}

std::optional<double> XmlElement::Double(std::string_view attribute, Presence presence) {
  const std::string* text = AskAttribute(attribute, presence);
  if (text == nullptr) return std::nullopt;
  if (text->empty()) {
    ValueError(attribute, *text, "empty (expected a finite number)");
    return std::nullopt;
  }
  double value = 0;
  const char* end = text->data() + text->size();
  const auto [stop, status] = std::from_chars(text->data(), end, value);
  if (status == std::errc::result_out_of_range) {
    ValueError(attribute, *text, "out of the range of a double (expected a finite number)");
    return std::nullopt;
  }
  if (status != std::errc{} || stop != end) {
    ValueError(attribute, *text, "not a number (expected a finite decimal number such as 0.25)");
    return std::nullopt;
  }
  if (!std::isfinite(value)) {
    ValueError(attribute, *text, "not finite (expected a finite number)");
    return std::nullopt;
  }
  return value;
}

std::optional<long long> XmlElement::Integer(std::string_view attribute, Presence presence) {
  const std::string* text = AskAttribute(attribute, presence);
  if (text == nullptr) return std::nullopt;
  if (text->empty()) {
    ValueError(attribute, *text, "empty (expected a whole number)");
    return std::nullopt;
  }
  long long value = 0;
  const char* end = text->data() + text->size();
  const auto [stop, status] = std::from_chars(text->data(), end, value);
  if (status == std::errc::result_out_of_range) {
    ValueError(attribute, *text, "too large (expected a whole number)");
    return std::nullopt;
  }
  if (status != std::errc{} || stop != end) {
    ValueError(attribute, *text, "not a whole number (expected digits such as 42)");
    return std::nullopt;
  }
  return value;
}

std::optional<std::size_t> XmlElement::Choice(std::string_view attribute,
                                              std::span<const std::string_view> choices,
                                              Presence presence) {
  const std::string* text = AskAttribute(attribute, presence);
  if (text == nullptr) return std::nullopt;
  for (std::size_t i = 0; i < choices.size(); ++i) {
    if (choices[i] == *text) return i;
  }
  std::string expected;
  for (const std::string_view choice : choices) {
    expected += (expected.empty() ? "" : ", ") + std::string(choice);
  }
  ValueError(attribute, *text, "not a known value (expected one of: " + expected + ")");
  return std::nullopt;
}

std::optional<std::string> XmlElement::Text(Presence presence) {
  XmlNode& node = tree_->nodes[index_];
  node.text_read = true;
  std::string text = CollapseSpace(node.text);
  if (!text.empty()) return text;
  if (presence == Presence::kRequired) {
    tree_->Error(node.line, node.label + ": missing required text inside the element");
  }
  return std::nullopt;
}

std::optional<XmlElement> XmlElement::Child(std::string_view name, Presence presence) {
  std::vector<XmlElement> found = Children(name);
  if (found.empty()) {
    if (presence == Presence::kRequired) {
      tree_->Error(line(), label() + ": missing required element <" + std::string(name) + ">");
    }
    return std::nullopt;
  }
  for (std::size_t i = 1; i < found.size(); ++i) {
    XmlNode& duplicate = tree_->nodes[found[i].index_];
    duplicate.reached = false;
    tree_->Error(duplicate.line, label() + ": duplicate element <" + std::string(name) +
                                     "> (first at line " + std::to_string(found[0].line()) + ")");
  }
  return found[0];
}

std::vector<XmlElement> XmlElement::Children(std::string_view name) {
  return Children(std::span<const std::string_view>(&name, 1));
}

std::vector<XmlElement> XmlElement::Children(std::span<const std::string_view> names) {
  XmlNode& node = tree_->nodes[index_];
  for (const std::string_view name : names) Remember(node.asked_children, name);
  std::vector<XmlElement> found;
  for (const std::size_t child_index : node.children) {
    XmlNode& child = tree_->nodes[child_index];
    if (std::find(names.begin(), names.end(), child.name) == names.end()) continue;
    child.reached = true;
    found.push_back(XmlElement(tree_, child_index));
  }
  return found;
}

std::vector<XmlElement> XmlElement::Peek(std::string_view name) const {
  std::vector<XmlElement> found;
  for (const std::size_t child_index : tree_->nodes[index_].children) {
    if (tree_->nodes[child_index].name == name) found.push_back(XmlElement(tree_, child_index));
  }
  return found;
}

}  // namespace upright::model
