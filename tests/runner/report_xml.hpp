// Reading a report as XML in tests: its elements by name, attributes and text, the points of an
// SVG path, and a report made and parsed in one step.
#pragma once

#include <gtest/gtest.h>
#include <tinyxml2.h>

#include <cctype>
#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "run_test_support.hpp"
#include "upright/runner/report/report.hpp"

namespace upright::runner::testing {

using tinyxml2::XMLElement;

// Every element below `root` (itself included), depth first.
inline void Walk(const XMLElement* root, const std::function<void(const XMLElement*)>& visit) {
  visit(root);
  for (const XMLElement* child = root->FirstChildElement(); child != nullptr;
       child = child->NextSiblingElement()) {
    Walk(child, visit);
  }
}

inline std::size_t Count(const std::string& text, const std::string& needle) {
  std::size_t n = 0;
  for (auto at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) ++n;
  return n;
}

inline std::vector<const XMLElement*> Elements(const XMLElement* root, const char* name) {
  std::vector<const XMLElement*> found;
  Walk(root, [&](const XMLElement* e) {
    if (std::string(e->Name()) == name) found.push_back(e);
  });
  return found;
}

inline std::string Attribute(const XMLElement* e, const char* name) {
  const char* value = e->Attribute(name);
  return value == nullptr ? "" : value;
}

// All text inside an element, its children's included.
inline std::string TextOf(const XMLElement* e) {
  std::string text;
  for (const tinyxml2::XMLNode* n = e->FirstChild(); n != nullptr; n = n->NextSibling()) {
    if (n->ToText() != nullptr) text += n->Value();
    if (n->ToElement() != nullptr) text += TextOf(n->ToElement());
  }
  return text;
}

// The number of points an SVG path visits: its numbers in pairs. The report separates numbers by
// a space or by the minus sign that starts one.
inline std::size_t PathPoints(const std::string& d) {
  std::size_t numbers = 0;
  bool in_number = false;
  for (const char c : d) {
    if (c == '-') {
      ++numbers;
      in_number = true;
    } else if (std::isdigit(static_cast<unsigned char>(c)) || c == '.') {
      if (!in_number) ++numbers;
      in_number = true;
    } else {
      in_number = false;
    }
  }
  return numbers / 2;
}

struct Report {
  ReportWritten written;
  std::string html;
  tinyxml2::XMLDocument doc;
};

inline void MakeAndParse(const std::filesystem::path& dir, const ReportOptions& options,
                         Report* report) {
  const Result<ReportWritten, ReportFailure> made = MakeReport(dir.string(), options);
  ASSERT_TRUE(made) << made.error().message;
  report->written = *made;
  report->html = ReadFile(report->written.path);
  ASSERT_EQ(report->doc.Parse(report->html.c_str(), report->html.size()), tinyxml2::XML_SUCCESS)
      << report->doc.ErrorStr();
}

inline const XMLElement* PlotOf(const XMLElement* root, const std::string& kind) {
  for (const XMLElement* svg : Elements(root, "svg")) {
    if (Attribute(svg, "data-plot") == kind) return svg;
  }
  return nullptr;
}

}  // namespace upright::runner::testing
