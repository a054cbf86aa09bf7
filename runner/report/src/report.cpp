#include "upright/runner/report/report.hpp"

#include <algorithm>
#include <filesystem>

#include "manifest_info.hpp"
#include "report_page.hpp"
#include "results_folder.hpp"
#include "sections.hpp"
#include "upright/runner/common/atomic_file.hpp"

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
  if (HasFile(dir, "summary.csv") || HasFile(dir, "envelope.csv") || HasFile(dir, "sweep.csv") ||
      HasFile(dir, "loop_response.csv") || HasFile(dir, "tune.csv")) {
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
  return "summary.csv (upright run, demo), envelope.csv (upright envelope), sweep.csv "
         "(upright sweep), loop_response.csv (upright design --report) or tune.csv (upright "
         "tune), in the folder or in "
         "subfolders up to " +
         std::to_string(kMaxDepth) + " levels down";
}

std::vector<std::string> FindResultsFolders(const std::string& dir) {
  std::vector<std::string> found;
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) return found;
  Collect(fs::path(dir), fs::path(dir), 0, &found);
  return found;
}

namespace {

tl::unexpected<ReportFailure> Refused(ReportProblem problem, std::string message) {
  return Failure(ReportFailure{problem, std::move(message)});
}

// One results folder's sections, each kind it holds, and its manifest's input files.
Status AppendFolder(const internal::ResultsFolder& folder, const ReportOptions& options,
                    internal::ReportPage* page) {
  const Result<internal::ManifestInfo> manifest = internal::ReadManifest(folder.path);
  if (!manifest) return Failure(manifest.error());
  internal::AddManifestInputs(*manifest, page);
  if (folder.run) {
    if (Status added = internal::AppendRunSection(folder, *manifest, options, page); !added) {
      return added;
    }
  }
  if (folder.envelope) {
    if (Status added = internal::AppendEnvelopeSection(folder, *manifest, page); !added) {
      return added;
    }
  }
  if (folder.sweep) {
    if (Status added = internal::AppendSweepSection(folder, *manifest, page); !added) {
      return added;
    }
  }
  if (folder.design) {
    if (Status added = internal::AppendDesignSection(folder, *manifest, options, page); !added) {
      return added;
    }
  }
  if (folder.tune) return internal::AppendTuneSection(folder, *manifest, options, page);
  return {};
}

}  // namespace

Result<ReportWritten, ReportFailure> MakeReport(const std::string& dir,
                                                const ReportOptions& options) {
  if (const Status valid = options.Validate(); !valid) {
    return Refused(ReportProblem::kBadInput, valid.error());
  }
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) {
    return Refused(
        ReportProblem::kNoResults,
        dir + ": not a folder (expected a results folder holding " + ReportLooksFor() + ")");
  }
  const std::vector<std::string> relative = FindResultsFolders(dir);
  if (relative.empty()) {
    return Refused(ReportProblem::kNoResults,
                   dir + ": no results found (looked for " + ReportLooksFor() + ")");
  }

  internal::ReportPage page;
  // The folder's own name, not its path, so the page does not depend on where it lies.
  page.title = fs::path(dir).lexically_normal().filename().string();
  if (page.title.empty() || page.title == ".") {
    page.title = fs::absolute(dir).lexically_normal().parent_path().filename().string();
  }
  for (std::size_t i = 0; i < relative.size(); ++i) {
    internal::ResultsFolder folder;
    folder.relative = relative[i];
    folder.path = (fs::path(dir) / relative[i]).lexically_normal().string();
    folder.id = 'f' + std::to_string(i);
    folder.id += '-';
    folder.run = HasFile(folder.path, "summary.csv");
    folder.envelope = HasFile(folder.path, "envelope.csv");
    folder.sweep = HasFile(folder.path, "sweep.csv");
    folder.design = HasFile(folder.path, "loop_response.csv");
    folder.tune = HasFile(folder.path, "tune.csv");
    if (Status added = AppendFolder(folder, options, &page); !added) {
      return Refused(ReportProblem::kBadInput, added.error());
    }
  }
  ReportWritten written;
  written.path = (fs::path(dir) / kReportFileName).string();
  written.folders = relative.size();
  const std::string html = internal::PageHtml(page);
  if (Status saved = WriteFileAtomically(written.path, html); !saved) {
    return Refused(ReportProblem::kWriteFailed, saved.error());
  }
  written.bytes = html.size();
  return written;
}

Result<std::string> WriteReport(const std::string& dir) {
  Result<ReportWritten, ReportFailure> made = MakeReport(dir);
  if (!made) return Failure(std::move(made.error().message));
  return std::move(made->path);
}

}  // namespace upright::runner
