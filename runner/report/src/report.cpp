#include "upright/runner/report.hpp"

#include <algorithm>
#include <filesystem>

#include "manifest_info.hpp"
#include "report_page.hpp"
#include "results_folder.hpp"
#include "sections.hpp"
#include "upright/runner/atomic_file.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;

constexpr int kMaxDepth = 3;

bool HasFile(const fs::path& dir, const char* name) {
  std::error_code ec;
  return fs::is_regular_file(dir / name, ec);
}

// Appends the folders under `dir` (relative to `root`) that hold results, depth first in sorted
// order; traces/ folders hold no tables and are skipped.
void Collect(const fs::path& root, const fs::path& dir, int depth,
             std::vector<std::string>* found) {
  if (HasFile(dir, "summary.csv") || HasFile(dir, "envelope.csv") || HasFile(dir, "sweep.csv")) {
    found->push_back(dir == root ? "." : dir.lexically_relative(root).generic_string());
  }
  if (depth >= kMaxDepth) return;
  std::vector<fs::path> children;
  std::error_code ec;
  for (fs::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
    std::error_code type_ec;
    if (it->is_directory(type_ec) && it->path().filename() != "traces") {
      children.push_back(it->path());
    }
  }
  std::sort(children.begin(), children.end());
  for (const fs::path& child : children) Collect(root, child, depth + 1, found);
}

}  // namespace

Status ReportOptions::Validate() const {
  if (max_points < 4) {
    return Failure("ReportOptions::max_points = " + std::to_string(max_points) + ", must be >= 4");
  }
  return {};
}

std::string ReportLooksFor() {
  return "summary.csv (upright run, demo), envelope.csv (upright envelope) or sweep.csv "
         "(upright sweep), in the folder or in subfolders up to " +
         std::to_string(kMaxDepth) + " levels down";
}

std::vector<std::string> FindResultsFolders(const std::string& dir) {
  std::vector<std::string> found;
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) return found;
  Collect(fs::path(dir), fs::path(dir), 0, &found);
  return found;
}

ReportOutcome MakeReport(const std::string& dir, const ReportOptions& options) {
  ReportOutcome outcome;
  outcome.path = (fs::path(dir) / kReportFileName).string();
  if (const Status valid = options.Validate(); !valid) {
    outcome.status = ReportStatus::kBadInput;
    outcome.message = valid.error();
    return outcome;
  }
  std::string error;
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) {
    outcome.status = ReportStatus::kNoResults;
    outcome.message =
        dir + ": not a folder (expected a results folder holding " + ReportLooksFor() + ")";
    return outcome;
  }
  const std::vector<std::string> relative = FindResultsFolders(dir);
  outcome.folders = relative.size();
  if (relative.empty()) {
    outcome.status = ReportStatus::kNoResults;
    outcome.message = dir + ": no results found (looked for " + ReportLooksFor() + ")";
    return outcome;
  }

  report::ReportPage page;
  // The folder's own name, not its path, so the page does not depend on where it lies.
  page.title = fs::path(dir).lexically_normal().filename().string();
  if (page.title.empty() || page.title == ".") {
    page.title = fs::absolute(dir).lexically_normal().parent_path().filename().string();
  }
  for (std::size_t i = 0; i < relative.size(); ++i) {
    report::ResultsFolder folder;
    folder.relative = relative[i];
    folder.path = (fs::path(dir) / relative[i]).lexically_normal().string();
    folder.id = 'f' + std::to_string(i);
    folder.id += '-';
    folder.run = HasFile(folder.path, "summary.csv");
    folder.envelope = HasFile(folder.path, "envelope.csv");
    folder.sweep = HasFile(folder.path, "sweep.csv");
    report::ManifestInfo manifest;
    bool ok = report::ReadManifest(folder.path, &manifest, &error);
    if (ok) report::AddManifestInputs(manifest, &page);
    if (ok && folder.run) ok = report::AppendRunSection(folder, manifest, options, &page, &error);
    if (ok && folder.envelope) ok = report::AppendEnvelopeSection(folder, manifest, &page, &error);
    if (ok && folder.sweep) ok = report::AppendSweepSection(folder, manifest, &page, &error);
    if (!ok) {
      outcome.status = ReportStatus::kBadInput;
      outcome.message = error;
      return outcome;
    }
  }
  const std::string html = report::PageHtml(page);
  if (Status written = WriteFileAtomically(outcome.path, html); !written) {
    outcome.status = ReportStatus::kWriteFailed;
    outcome.message = written.error();
    return outcome;
  }
  outcome.status = ReportStatus::kWritten;
  outcome.bytes = html.size();
  return outcome;
}

bool WriteReport(const std::string& dir, std::string* report_path, std::string* error) {
  const ReportOutcome outcome = MakeReport(dir);
  if (outcome.status != ReportStatus::kWritten) {
    if (error != nullptr) *error = outcome.message;
    return false;
  }
  if (report_path != nullptr) *report_path = outcome.path;
  return true;
}

}  // namespace upright::runner
