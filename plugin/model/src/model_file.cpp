#include "upright/model/model_file.hpp"

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "model_schema.hpp"
#include "upright/model/xml_reader.hpp"

namespace upright::model {
namespace {

using internal::ElementRule;
using internal::FieldRule;
using internal::ModelDraft;
using internal::Occurs;

std::string_view ParentPath(std::string_view path) {
  const std::size_t slash = path.rfind('/');
  return slash == std::string_view::npos ? std::string_view() : path.substr(0, slash);
}

std::string_view LeafName(std::string_view path) {
  const std::size_t slash = path.rfind('/');
  return slash == std::string_view::npos ? path : path.substr(slash + 1);
}

// The elements of the schema found in the file, by path below the root.
using FoundElements = std::map<std::string_view, XmlElement>;

FoundElements ReadElements(XmlElement root, ModelDraft& draft) {
  FoundElements found;
  for (const ElementRule& rule : internal::ElementRules()) {
    const std::string_view parent_path = ParentPath(rule.path);
    std::optional<XmlElement> parent = root;
    if (!parent_path.empty()) {
      const auto it = found.find(parent_path);
      if (it == found.end()) continue;
      parent = it->second;
    }
    const Presence presence =
        rule.occurs == Occurs::kRequired ? Presence::kRequired : Presence::kOptional;
    if (std::optional<XmlElement> element = parent->Child(LeafName(rule.path), presence)) {
      found.emplace(rule.path, *element);
      if (rule.present != nullptr) *rule.present(draft.model) = true;
    }
  }
  return found;
}

// Exactly one element of each one-of group, under a parent that is itself present.
void CheckOneOfGroups(const FoundElements& found, XmlDocument& doc) {
  const auto rules = internal::ElementRules();
  for (std::size_t i = 0; i < rules.size(); ++i) {
    if (rules[i].occurs != Occurs::kOneOf) continue;
    bool first_of_group = true;
    for (std::size_t j = 0; j < i; ++j) {
      if (rules[j].occurs == Occurs::kOneOf && rules[j].group == rules[i].group) {
        first_of_group = false;
      }
    }
    if (!first_of_group) continue;
    const std::string_view parent_path = ParentPath(rules[i].path);
    const auto parent = found.find(parent_path);
    if (parent == found.end()) continue;
    std::string names;
    std::vector<XmlElement> given;
    for (const ElementRule& member : rules.subspan(i)) {
      if (member.occurs != Occurs::kOneOf || member.group != rules[i].group) continue;
      names += (names.empty() ? "<" : " or <") + std::string(LeafName(member.path)) + ">";
      if (const auto it = found.find(member.path); it != found.end()) given.push_back(it->second);
    }
    if (given.empty()) {
      doc.AddError(parent->second.line(),
                   parent->second.label() + ": needs one of " + names + " (found neither)");
    }
    for (std::size_t k = 1; k < given.size(); ++k) {
      doc.AddError(given[k].line(), parent->second.label() + ": <" + given[k].name() +
                                        "> given together with <" + given[0].name() + "> at line " +
                                        std::to_string(given[0].line()) + " (give exactly one of " +
                                        names + ")");
    }
  }
}

void ReadFields(FoundElements& found, ModelDraft& draft, XmlDocument& doc) {
  const auto rules = internal::FieldRules();
  std::vector<bool> given(rules.size(), false);
  for (std::size_t i = 0; i < rules.size(); ++i) {
    const FieldRule& rule = rules[i];
    const auto element = found.find(rule.element);
    if (element == found.end()) continue;
    const std::optional<double> value = element->second.Double(
        rule.attribute, rule.required ? Presence::kRequired : Presence::kOptional);
    if (!value) continue;
    given[i] = true;
    *rule.field(draft) = *value;
    if (Status kept = internal::CheckField(rule, *value); !kept) {
      doc.AddError(element->second.line(), kept.error());
    }
  }
  // Defaults last, since derived ones depend on fields read above.
  for (std::size_t i = 0; i < rules.size(); ++i) {
    if (given[i]) continue;
    if (rules[i].derive != nullptr) {
      *rules[i].field(draft) = rules[i].derive(draft);
    } else if (!rules[i].required) {
      *rules[i].field(draft) = rules[i].default_value;
    }
  }
}

// Names schema 2 replaced. A file still using one is told, at its line, what to write instead,
// and nothing else is read from it: the rest of its messages would follow from the old names.
constexpr std::string_view kFormerRootElement = "robot";
struct FormerName {
  std::string_view parent;  // the element it sits in, directly below the root
  std::string_view former;
  std::string_view current;
};
constexpr FormerName kFormerNames[] = {
    {"chassis", "inertia", "principal_moments"},
    {"chassis", "box", "uniform_block"},
};

// "<former> is the former name of `what`: rename it <current> (schema 2)".
std::string RenameMessage(std::string_view former, std::string_view what,
                          std::string_view current) {
  std::string text = "<";
  text.append(former).append("> is the former name of ").append(what);
  text.append(": rename it <").append(current).append("> (schema ");
  return text.append(std::to_string(internal::kModelSchemaVersion)).append(")");
}

// True when the root or an element below it bears a former name; each gets its message.
bool ReportFormerNames(const XmlElement& root, XmlDocument& doc) {
  bool found = false;
  if (root.name() == kFormerRootElement) {
    doc.AddError(root.line(), RenameMessage(kFormerRootElement, "this file's root element",
                                            internal::kModelRootElement));
    found = true;
  }
  for (const FormerName& name : kFormerNames) {
    for (const XmlElement& parent : root.Peek(name.parent)) {
      for (const XmlElement& element : parent.Peek(name.former)) {
        doc.AddError(element.line(),
                     std::string(name.parent)
                         .append(": ")
                         .append(RenameMessage(name.former, "this element", name.current)));
        found = true;
      }
    }
  }
  return found;
}

// The line of the element at `path`, or of its nearest present ancestor, or of the root.
int LineOf(std::string_view path, const FoundElements& found, int root_line) {
  for (; !path.empty(); path = ParentPath(path)) {
    if (const auto it = found.find(path); it != found.end()) return it->second.line();
  }
  return root_line;
}

Result<RobotModel, std::vector<FileError>> Load(XmlDocument doc, const ModelLoadOptions& options) {
  if (!doc.parsed()) return Failure(doc.errors());
  XmlElement root = doc.Root();
  const std::string root_name(internal::kModelRootElement);
  // A <robot> root is a model file of schema 1 only when it states a schema, as every one did;
  // without one it is a file of another format, told only the root expected.
  const bool former_root = root.name() == kFormerRootElement && root.Has("schema");
  if (root.name() != root_name && !former_root) {
    doc.AddError(root.line(),
                 "root element is <" + root.name() + ">, expected <" + root_name + ">");
    return Failure(doc.errors());
  }
  if (ReportFormerNames(root, doc)) return Failure(doc.errors());
  const std::optional<long long> schema = root.Integer("schema", Presence::kRequired);
  if (schema && *schema != internal::kModelSchemaVersion) {
    doc.AddError(root.line(), root_name + " schema = " + std::to_string(*schema) +
                                  ": unsupported schema version (expected " +
                                  std::to_string(internal::kModelSchemaVersion) + ")");
    return Failure(doc.errors());
  }
  ModelDraft draft;
  if (std::optional<std::string> name = root.String("name", Presence::kRequired)) {
    if (name->empty()) doc.AddError(root.line(), root_name + " name = '': must not be empty");
    draft.model.name = *name;
  }
  FoundElements found = ReadElements(root, draft);
  CheckOneOfGroups(found, doc);
  ReadFields(found, draft, doc);
  if (!doc.HasErrors()) {
    for (const internal::CrossRule& rule : internal::CrossRules()) {
      if (Status kept = rule.check(draft.model); !kept) {
        doc.AddError(LineOf(rule.element, found, root.line()), kept.error());
      }
    }
  }
  if (!doc.HasErrors() && options.check_default_step) {
    for (const internal::StepRule& rule : internal::StepRules()) {
      if (Status kept = rule.check(draft.model); !kept) {
        doc.AddError(LineOf(rule.element, found, root.line()), kept.error());
      }
    }
  }
  doc.ReportUnread();
  if (doc.HasErrors()) return Failure(doc.errors());
  return draft.model;
}

}  // namespace

Result<RobotModel, std::vector<FileError>> LoadModelFile(const std::string& path,
                                                         const ModelLoadOptions& options) {
  return Load(XmlDocument::Open(path), options);
}

Result<RobotModel, std::vector<FileError>> ParseModelText(std::string_view xml_text,
                                                          const std::string& path,
                                                          const ModelLoadOptions& options) {
  return Load(XmlDocument::Parse(xml_text, path), options);
}

}  // namespace upright::model
