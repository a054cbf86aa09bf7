#include "upright/model/xml_reader.hpp"

#include <gtest/gtest.h>

#include <array>
#include <string>
#include <string_view>
#include <vector>

namespace upright {
namespace {

std::vector<std::string> Texts(const model::XmlDocument& doc) {
  std::vector<std::string> texts;
  for (const model::FileError& error : doc.errors()) texts.push_back(error.ToString());
  return texts;
}

TEST(XmlReader, ReadsTypedAttributes) {
  model::XmlDocument doc = model::XmlDocument::Parse(
      R"(<thing label="left wheel" gain="-2.5e-3" count="-42" mode="fast"/>)", "t.xml");
  ASSERT_TRUE(doc.parsed());
  model::XmlElement root = doc.Root();
  EXPECT_EQ(root.name(), "thing");
  EXPECT_EQ(root.label(), "thing");
  EXPECT_EQ(root.line(), 1);
  EXPECT_EQ(root.String("label", model::Presence::kRequired), "left wheel");
  EXPECT_EQ(root.Double("gain", model::Presence::kRequired), -2.5e-3);
  EXPECT_EQ(root.Integer("count", model::Presence::kRequired), -42);
  constexpr std::array<std::string_view, 2> kModes = {"slow", "fast"};
  EXPECT_EQ(root.Choice("mode", kModes, model::Presence::kRequired), 1u);
  EXPECT_FALSE(root.Double("absent", model::Presence::kOptional).has_value());
  doc.ReportUnread();
  EXPECT_FALSE(doc.HasErrors());
}

TEST(XmlReader, RejectsNumbersThatAreNotWholeAttributes) {
  model::XmlDocument doc = model::XmlDocument::Parse(
      R"(<t a="1.5x" b="" c="nan" d="inf" e=" 1" f="1e999" g="-inf"/>)", "t.xml");
  model::XmlElement root = doc.Root();
  for (const char* name : {"a", "b", "c", "d", "e", "f", "g"}) {
    EXPECT_FALSE(root.Double(name, model::Presence::kRequired).has_value()) << name;
  }
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{
                "t.xml:1: t a = '1.5x': not a number (expected a finite decimal number such as "
                "0.25)",
                "t.xml:1: t b = '': empty (expected a finite number)",
                "t.xml:1: t c = 'nan': not finite (expected a finite number)",
                "t.xml:1: t d = 'inf': not finite (expected a finite number)",
                "t.xml:1: t e = ' 1': not a number (expected a finite decimal number such as "
                "0.25)",
                "t.xml:1: t f = '1e999': out of the range of a double (expected a finite number)",
                "t.xml:1: t g = '-inf': not finite (expected a finite number)",
            }));
}

TEST(XmlReader, RejectsFractionInWholeNumber) {
  model::XmlDocument doc = model::XmlDocument::Parse(R"(<t n="4.5"/>)", "t.xml");
  EXPECT_FALSE(doc.Root().Integer("n", model::Presence::kRequired).has_value());
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{
                "t.xml:1: t n = '4.5': not a whole number (expected digits such as 42)"}));
}

TEST(XmlReader, RejectsValueOutsideChoices) {
  model::XmlDocument doc = model::XmlDocument::Parse(R"(<t mode="medium"/>)", "t.xml");
  constexpr std::array<std::string_view, 2> kModes = {"slow", "fast"};
  EXPECT_FALSE(doc.Root().Choice("mode", kModes, model::Presence::kRequired).has_value());
  EXPECT_EQ(Texts(doc), (std::vector<std::string>{"t.xml:1: t mode = 'medium': not a known value "
                                                  "(expected one of: slow, fast)"}));
}

TEST(XmlReader, ReportsMissingRequiredAttributeAndChild) {
  model::XmlDocument doc = model::XmlDocument::Parse("<t>\n</t>", "t.xml");
  model::XmlElement root = doc.Root();
  EXPECT_FALSE(root.Double("mass_kg", model::Presence::kRequired).has_value());
  EXPECT_FALSE(root.Child("part", model::Presence::kRequired).has_value());
  EXPECT_FALSE(root.Child("extra", model::Presence::kOptional).has_value());
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{"t.xml:1: t: missing required attribute 'mass_kg'",
                                      "t.xml:1: t: missing required element <part>"}));
}

TEST(XmlReader, LabelsNestedElementsByPathBelowRoot) {
  model::XmlDocument doc = model::XmlDocument::Parse("<r>\n  <a>\n    <b/>\n  </a>\n</r>", "t.xml");
  model::XmlElement a = *doc.Root().Child("a", model::Presence::kRequired);
  model::XmlElement b = *a.Child("b", model::Presence::kRequired);
  EXPECT_EQ(a.label(), "a");
  EXPECT_EQ(b.label(), "a/b");
  EXPECT_EQ(b.line(), 3);
}

TEST(XmlReader, ReportsUnreadAttributesAndElementsOfReachedElementsOnly) {
  model::XmlDocument doc = model::XmlDocument::Parse(
      "<r known=\"1\" stray=\"2\">\n"
      "  <a x=\"1\" y=\"2\"/>\n"
      "  <other>\n"
      "    <deep z=\"3\"/>\n"
      "  </other>\n"
      "</r>",
      "t.xml");
  model::XmlElement root = doc.Root();
  root.Double("known", model::Presence::kRequired);
  root.Double("also", model::Presence::kOptional);
  root.Child("a", model::Presence::kRequired)->Double("x", model::Presence::kRequired);
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc), (std::vector<std::string>{
                            "t.xml:1: r: unknown attribute 'stray' (expected one of: known, also)",
                            "t.xml:2: a: unknown attribute 'y' (expected one of: x)",
                            "t.xml:3: r: unknown element <other> (expected one of: a)",
                        }));
}

TEST(XmlReader, ReportsAttributesOnElementThatTakesNone) {
  model::XmlDocument doc = model::XmlDocument::Parse("<r>\n  <flag on=\"1\"/>\n</r>", "t.xml");
  doc.Root().Child("flag", model::Presence::kRequired);
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc), (std::vector<std::string>{
                            "t.xml:2: flag: unknown attribute 'on' (this element takes no "
                            "attributes)"}));
}

TEST(XmlReader, ReportsTextInsideElement) {
  model::XmlDocument doc = model::XmlDocument::Parse("<r>\n  stray words\n</r>", "t.xml");
  doc.Root();
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{"t.xml:1: r: unexpected text inside the element"}));
}

TEST(XmlReader, TextCollapsesWhiteSpaceAndIsNotUnexpectedOnceRead) {
  model::XmlDocument doc = model::XmlDocument::Parse(
      "<r>\n  <note>\n    Two\tlines\r\n    of   text &amp; more.\n  </note>\n</r>", "t.xml");
  model::XmlElement note = *doc.Root().Child("note", model::Presence::kRequired);
  EXPECT_EQ(note.Text(model::Presence::kRequired), "Two lines of text & more.");
  doc.ReportUnread();
  EXPECT_FALSE(doc.HasErrors()) << Texts(doc)[0];
}

TEST(XmlReader, TextIsOwnTextOnlyAndLeavesChildElementsToBeAskedFor) {
  model::XmlDocument doc =
      model::XmlDocument::Parse("<r>\n  <note>A <b>bold</b> claim.</note>\n</r>", "t.xml");
  model::XmlElement note = *doc.Root().Child("note", model::Presence::kRequired);
  EXPECT_EQ(note.Text(model::Presence::kRequired), "A claim.");
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc), (std::vector<std::string>{
                            "t.xml:2: note: unknown element <b> (this element takes no child "
                            "elements)"}));
}

TEST(XmlReader, ReportsRequiredEmptyTextAtElementLine) {
  model::XmlDocument doc =
      model::XmlDocument::Parse("<r>\n  <a>  \n  </a>\n  <b/>\n  <c></c>\n</r>", "t.xml");
  model::XmlElement root = doc.Root();
  EXPECT_FALSE(
      root.Child("a", model::Presence::kRequired)->Text(model::Presence::kRequired).has_value());
  EXPECT_FALSE(
      root.Child("b", model::Presence::kRequired)->Text(model::Presence::kRequired).has_value());
  EXPECT_FALSE(
      root.Child("c", model::Presence::kRequired)->Text(model::Presence::kOptional).has_value());
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{"t.xml:2: a: missing required text inside the element",
                                      "t.xml:4: b: missing required text inside the element"}));
}

TEST(XmlReader, ReportsTextOfElementWhoseTextWasNotRead) {
  model::XmlDocument doc =
      model::XmlDocument::Parse("<r>\n  <a>read</a>\n  <b>not read</b>\n</r>", "t.xml");
  model::XmlElement root = doc.Root();
  EXPECT_EQ(root.Child("a", model::Presence::kRequired)->Text(model::Presence::kOptional), "read");
  root.Child("b", model::Presence::kRequired);
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{"t.xml:3: b: unexpected text inside the element"}));
}

TEST(XmlReader, ReportsDuplicateChildAtItsLine) {
  model::XmlDocument doc =
      model::XmlDocument::Parse("<r>\n  <a/>\n  <b/>\n  <a q=\"1\"/>\n</r>", "t.xml");
  model::XmlElement root = doc.Root();
  EXPECT_EQ(root.Child("a", model::Presence::kRequired)->line(), 2);
  root.Child("b", model::Presence::kRequired);
  doc.ReportUnread();
  // The duplicate's own attributes are not reported: the duplicate itself is the problem.
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{"t.xml:4: r: duplicate element <a> (first at line 2)"}));
}

TEST(XmlReader, ChildrenReturnsRepeatedElementsInFileOrder) {
  model::XmlDocument doc =
      model::XmlDocument::Parse("<r>\n  <e t=\"1\"/>\n  <f/>\n  <e t=\"2\"/>\n</r>", "t.xml");
  model::XmlElement root = doc.Root();
  std::vector<model::XmlElement> events = root.Children("e");
  ASSERT_EQ(events.size(), 2u);
  EXPECT_EQ(events[0].Double("t", model::Presence::kRequired), 1.0);
  EXPECT_EQ(events[1].Double("t", model::Presence::kRequired), 2.0);
  EXPECT_EQ(events[1].line(), 4);
  root.Children("f");
  doc.ReportUnread();
  EXPECT_FALSE(doc.HasErrors());
}

TEST(XmlReader, ChildrenOfSeveralNamesKeepFileOrderOnOneLineAndAcrossLines) {
  model::XmlDocument doc = model::XmlDocument::Parse(
      "<r>\n"
      "  <up n=\"1\"/> <flat n=\"2\"/><up n=\"3\"/>\n"
      "  <other/>\n"
      "  <flat n=\"4\"/>\n"
      "  <up n=\"5\"/>\n"
      "</r>",
      "t.xml");
  model::XmlElement root = doc.Root();
  constexpr std::array<std::string_view, 2> kKinds = {"up", "flat"};
  std::vector<model::XmlElement> parts = root.Children(kKinds);
  ASSERT_EQ(parts.size(), 5u);
  const std::vector<std::string> names = {parts[0].name(), parts[1].name(), parts[2].name(),
                                          parts[3].name(), parts[4].name()};
  EXPECT_EQ(names, (std::vector<std::string>{"up", "flat", "up", "flat", "up"}));
  const std::vector<int> lines = {parts[0].line(), parts[1].line(), parts[2].line(),
                                  parts[3].line(), parts[4].line()};
  EXPECT_EQ(lines, (std::vector<int>{2, 2, 2, 4, 5}));
  for (std::size_t i = 0; i < parts.size(); ++i) {
    EXPECT_EQ(parts[i].Integer("n", model::Presence::kRequired), static_cast<long long>(i + 1));
  }
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc), (std::vector<std::string>{
                            "t.xml:3: r: unknown element <other> (expected one of: up, flat)"}));
}

TEST(XmlReader, ChildrenOfSeveralNamesCountEveryNameAsAskedEvenWhenAbsent) {
  model::XmlDocument doc = model::XmlDocument::Parse("<r>\n  <down/>\n  <x/>\n</r>", "t.xml");
  model::XmlElement root = doc.Root();
  constexpr std::array<std::string_view, 3> kKinds = {"up", "flat", "down"};
  EXPECT_EQ(root.Children(kKinds).size(), 1u);
  EXPECT_TRUE(root.Children("friction").empty());
  doc.ReportUnread();
  EXPECT_EQ(Texts(doc), (std::vector<std::string>{"t.xml:3: r: unknown element <x> (expected one "
                                                  "of: up, flat, down, friction)"}));
}

// The one problem of a text that is not well-formed XML, as path:line: message.
std::vector<std::string> Malformed(std::string_view text) {
  const model::XmlDocument doc = model::XmlDocument::Parse(text, "t.xml");
  EXPECT_FALSE(doc.parsed()) << text;
  return Texts(doc);
}

using Lines = std::vector<std::string>;

TEST(XmlReader, SaysInWordsWhatIsWrongWithAnAttribute) {
  EXPECT_EQ(Malformed("<r>\n  <a/>\n  <b x=\"1/>\n</r>"),
            Lines{"t.xml:3: malformed XML: the value of attribute 'x' has no closing quote"});
  EXPECT_EQ(Malformed("<r>\n  <a x=1/>\n</r>"),
            Lines{"t.xml:2: malformed XML: the value of attribute 'x' is missing its quotes "
                  "(expected x=\"...\")"});
  EXPECT_EQ(Malformed("<r>\n  <a x/>\n</r>"),
            Lines{"t.xml:2: malformed XML: attribute 'x' has no value (expected x=\"...\")"});
  // A tag over several lines: the line is the repeated attribute's.
  EXPECT_EQ(Malformed("<r>\n  <a x=\"1\"\n     y=\"2\" x=\"3\"/>\n</r>"),
            Lines{"t.xml:3: malformed XML: attribute 'x' is given twice in <a>"});
}

TEST(XmlReader, SaysInWordsWhatIsWrongWithAnElement) {
  EXPECT_EQ(Malformed("<r>\n  <a>\n</r>"),
            Lines{"t.xml:2: malformed XML: mismatched closing tag: the element <a> opened on this "
                  "line is closed by another element's closing tag (expected </a>, or <a .../> "
                  "for an element with no content)"});
  EXPECT_EQ(Malformed("<r>\n  <a/>\n"),
            Lines{"t.xml:1: malformed XML: an element opened on this line is not closed before "
                  "the end of the file"});
  EXPECT_EQ(Malformed("<r>\n  <1a/>\n</r>"),
            Lines{"t.xml:2: malformed XML: a '<' here starts no element name (write &lt; for a "
                  "'<' in text)"});
  EXPECT_EQ(Malformed("<r>\n  <a x=\"1\" / >\n</r>"),
            Lines{"t.xml:2: malformed XML: a tag is not ended properly (expected attributes as "
                  "name=\"value\", then '>' or '/>')"});
  EXPECT_EQ(Malformed("<r/>\ntrailing"),
            Lines{"t.xml:2: malformed XML: text runs on to the end of the file (an element is not "
                  "closed)"});
}

// A file that ends right after an opening tag (cut short while written): the parser calls it a
// mismatched element, but no closing tag follows; the message must not say one does.
TEST(XmlReader, AnElementOpenAtTheVeryEndIsNotClosedRatherThanMismatched) {
  EXPECT_EQ(Malformed("<r>\n  <a x=\"1\">"),
            Lines{"t.xml:2: malformed XML: the element <a> opened on this line is not closed "
                  "before the end of the file"});
  EXPECT_EQ(Malformed("<r>"), Lines{"t.xml:1: malformed XML: the element <r> opened on this line "
                                    "is not closed before the end of the file"});
  // A closing tag of another element after it is a mismatch.
  EXPECT_EQ(Malformed("<r>\n  <a>\n</b>"),
            Lines{"t.xml:2: malformed XML: mismatched closing tag: the element <a> opened on this "
                  "line is closed by another element's closing tag (expected </a>, or <a .../> "
                  "for an element with no content)"});
}

TEST(XmlReader, SaysInWordsWhatIsNotClosed) {
  EXPECT_EQ(Malformed("<r>\n  <!-- a note\n</r>"),
            Lines{"t.xml:2: malformed XML: a comment is not closed (expected -->)"});
  EXPECT_EQ(Malformed("<r>\n  <![CDATA[ abc\n</r>"),
            Lines{"t.xml:2: malformed XML: a CDATA section is not closed (expected ]]>)"});
  EXPECT_EQ(Malformed("<?xml version=\"1.0\"\n<r/>"),
            Lines{"t.xml:1: malformed XML: a declaration <?...?> is not closed (expected ?>)"});
}

TEST(XmlReader, ReportsEmptyDocument) {
  EXPECT_EQ(Malformed(""), Lines{"t.xml: malformed XML: the file is empty (expected one root "
                                 "element)"});
  EXPECT_EQ(Malformed(" \n\t\n"), Lines{"t.xml: malformed XML: the file is empty (expected one "
                                        "root element)"});
}

TEST(XmlReader, ReportsElementsNestedTooDeep) {
  std::string deep;
  for (int i = 0; i < 200; ++i) deep += "<a>\n";
  const Lines errors = Malformed(deep);
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_NE(errors[0].find(": malformed XML: elements are nested more than 100 deep"),
            std::string::npos)
      << errors[0];
}

TEST(XmlReader, ReportsSecondTopLevelElement) {
  model::XmlDocument doc = model::XmlDocument::Parse("<r/>\n<s/>", "t.xml");
  EXPECT_EQ(Texts(doc),
            (std::vector<std::string>{
                "t.xml:2: second top-level element <s> (a file holds one root element)"}));
}

TEST(XmlReader, ReportsMissingFileWithoutLine) {
  model::XmlDocument doc = model::XmlDocument::Open("no/such/file.xml");
  EXPECT_FALSE(doc.parsed());
  EXPECT_EQ(
      Texts(doc),
      (std::vector<std::string>{"no/such/file.xml: cannot open file: No such file or directory"}));
}

TEST(XmlReader, ReturnsErrorsInLineOrder) {
  model::XmlDocument doc =
      model::XmlDocument::Parse("<r>\n  <a v=\"x\"/>\n  <b v=\"y\"/>\n</r>", "t.xml");
  model::XmlElement root = doc.Root();
  model::XmlElement b = *root.Child("b", model::Presence::kRequired);
  model::XmlElement a = *root.Child("a", model::Presence::kRequired);
  b.Double("v", model::Presence::kRequired);
  a.Double("v", model::Presence::kRequired);
  doc.AddError(1, "first");
  const std::vector<model::FileError> errors = doc.errors();
  ASSERT_EQ(errors.size(), 3u);
  EXPECT_EQ(errors[0].line, 1);
  EXPECT_EQ(errors[1].line, 2);
  EXPECT_EQ(errors[2].line, 3);
}

}  // namespace
}  // namespace upright
