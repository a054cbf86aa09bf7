// The report page as it is put together: each results folder's section appends its HTML, its
// contents entries and its manifest's inputs; the page then wraps them in the header (tool
// version, robots, input files with SHA-256, the caution), the contents and the styles.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "manifest_info.hpp"

namespace upright::runner::internal {

// The caution every report carries, word for word.
inline constexpr const char* kCaution =
    "Simulation results never certify a real robot: validate on hardware with a tether or "
    "spotter, at low speed first, within local rules; qualified people judge.";

struct TocEntry {
  std::string id;
  std::string text;
  int level = 1;  // 1: a results folder, 2: a scenario or chart in it
};

struct InputFile {
  std::string kind;  // "scenario" or "robot model"
  std::string name;
  std::string path;  // as recorded, lexically normalised
  std::string sha256;
};

struct ReportPage {
  std::string title;                       // the results folder's name
  std::vector<std::string> tool_versions;  // as the manifests record them, each once
  std::vector<InputFile> inputs;           // each (kind, path, digest) once, in first-seen order
  std::vector<TocEntry> toc;
  std::string body;
};

// Records a manifest's tool version and input files on the page.
void AddManifestInputs(const ManifestInfo& manifest, ReportPage* page);

// An id for an element: `prefix` and `text` with every character other than [A-Za-z0-9_-]
// replaced by '-'.
std::string AnchorId(std::string_view prefix, std::string_view text);

// The whole document: well-formed XML (every element closed, only XML's own entities), so it
// can be checked with an XML parser as well as shown by a browser.
std::string PageHtml(const ReportPage& page);

}  // namespace upright::runner::internal
