// Strict reading of XML input files (robot models, scenarios): file or text → elements, typed
// attribute values and element text. Every problem becomes a FileError (path:line); attributes,
// child elements and text the caller never asks for are reported, so a misspelt name cannot pass.
#pragma once

#include <cstddef>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "upright/model/file_error.hpp"

namespace upright::model {

namespace internal {
struct XmlTree;
}  // namespace internal

enum class Presence { kOptional, kRequired };

class XmlElement;

// One parsed file and the problems found in it so far. Reading goes on after an error, so that
// a single pass reports everything; errors come back in file order.
class XmlDocument {
 public:
  // Reads the file at `path`. A missing or unreadable file is an error on line 0.
  static XmlDocument Open(const std::string& path);
  // Parses text already in memory; `path` is used only in messages.
  static XmlDocument Parse(std::string_view text, const std::string& path);

  XmlDocument(XmlDocument&&) noexcept;
  XmlDocument& operator=(XmlDocument&&) noexcept;
  ~XmlDocument();

  const std::string& path() const;
  // False when the file could not be read or is not well-formed XML; then Root() must not be
  // called and errors() says why.
  bool parsed() const;
  // The single top-level element.
  XmlElement Root();

  // Records a problem found by the caller (a rule across several fields, say).
  void AddError(int line, std::string message);
  // Reports, on every element the caller has reached, each attribute and child element it never
  // asked for, and any text inside the element that it never read. Call once, after reading.
  void ReportUnread();
  bool HasErrors() const;
  // Every problem so far, ordered by line (problems not tied to a line first).
  std::vector<FileError> errors() const;

 private:
  explicit XmlDocument(std::unique_ptr<internal::XmlTree> tree);
  std::unique_ptr<internal::XmlTree> tree_;
};

// A handle to one element of an XmlDocument; valid while the document lives. Reading methods
// record the name asked for (so it is not "unknown") and report problems to the document with
// this element's line. They return nullopt when the value is absent or bad.
class XmlElement {
 public:
  const std::string& name() const;
  // Where the element sits below the root, for messages: "chassis/outline"; the root's own name
  // for the root.
  const std::string& label() const;
  int line() const;

  bool Has(std::string_view attribute);
  std::optional<std::string> String(std::string_view attribute, Presence presence);
  // A finite decimal number, the whole attribute text ("1.5x", "", "nan", "inf" are errors).
  std::optional<double> Double(std::string_view attribute, Presence presence);
  // A whole number written as digits with an optional leading minus.
  std::optional<long long> Integer(std::string_view attribute, Presence presence);
  // One of `choices`; returns its index.
  std::optional<std::size_t> Choice(std::string_view attribute,
                                    std::span<const std::string_view> choices, Presence presence);

  // The element's own text (not its child elements'), with every run of white space collapsed to
  // one space and leading and trailing white space removed; nullopt when that leaves nothing.
  // Marks the text as read, so ReportUnread does not call it unexpected.
  std::optional<std::string> Text(Presence presence);

  // The child element called `name`; a second one is a duplicate error.
  std::optional<XmlElement> Child(std::string_view name, Presence presence);
  // Every child element called `name`, in file order, for elements that may repeat.
  std::vector<XmlElement> Children(std::string_view name);
  // Every child element whose name is one of `names`, in file order across the names (for a
  // sequence of mixed kinds); each name counts as asked for.
  std::vector<XmlElement> Children(std::span<const std::string_view> names);
  // Every child element called `name`, in file order, without asking for it (ReportUnread still
  // calls each one unknown): for spotting a name a file may no longer use, to say what replaced it.
  std::vector<XmlElement> Peek(std::string_view name) const;

 private:
  friend class XmlDocument;
  XmlElement(internal::XmlTree* tree, std::size_t index) : tree_(tree), index_(index) {}
  const std::string* AskAttribute(std::string_view attribute, Presence presence);
  void ValueError(std::string_view attribute, const std::string& text, std::string_view problem);

  internal::XmlTree* tree_;
  std::size_t index_;
};

}  // namespace upright::model
