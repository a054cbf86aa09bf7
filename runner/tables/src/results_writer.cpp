// WriteResults: builds each file's text from the batch, then writes them one by one, each
// atomically; manifest.json goes last, so its presence means the folder is complete.
#include "upright/runner/tables/results_writer.hpp"

#include <filesystem>
#include <functional>
#include <map>
#include <set>
#include <utility>

#include "batch_groups.hpp"
#include "compare_table.hpp"
#include "gap_table.hpp"
#include "manifest_json.hpp"
#include "ranking_table.hpp"
#include "summary_table.hpp"
#include "trace_csv.hpp"
#include "upright/runner/common/atomic_file.hpp"
#include "upright/runner/tables/make_results_folder.hpp"

namespace upright::runner {
namespace {

Status Write(const std::filesystem::path& path, const std::string& text) {
  return WriteFileAtomically(path.string(), text);
}

// A folder written before may hold files of that batch which this one does not write: its gap
// tables, its traces. Left there they would pass for this batch's (the report reads what it
// finds), so they go; anything else in the folder is not ours and stays.
Status RemoveStaleFiles(const std::filesystem::path& root, const BatchResult& batch,
                        const std::vector<std::string>& trace_files) {
  namespace fs = std::filesystem;
  std::vector<fs::path> stale;
  if (!batch.linear_twin) stale = {root / "gap.csv", root / "gap.md"};
  std::error_code ec;
  if (fs::is_directory(root / "traces", ec)) {
    const std::set<std::string> current(trace_files.begin(), trace_files.end());
    for (const auto& entry : fs::directory_iterator(root / "traces", ec)) {
      const fs::path& path = entry.path();
      if (path.extension() == ".csv" && entry.is_regular_file(ec) &&
          current.count("traces/" + path.filename().string()) == 0) {
        stale.push_back(path);
      }
    }
  }
  for (const fs::path& path : stale) {
    fs::remove(path, ec);  // a file already gone is no error
    if (ec) {
      return Failure("cannot remove " + path.string() +
                     ", left from an earlier batch: " + ec.message());
    }
  }
  return {};
}

}  // namespace

const std::vector<std::string>& ResultFileNames() {
  static const std::vector<std::string> kNames = {"summary.csv",  "summary.md",  "compare.csv",
                                                  "compare.md",   "ranking.csv", "ranking.md",
                                                  "manifest.json"};
  return kNames;
}

std::string TraceFileName(const RunResult& run) {
  std::string name = run.scenario + "__" + run.controller + "__seed" + std::to_string(run.seed);
  for (char& c : name) {
    const bool kept = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') ||
                      c == '.' || c == '_' || c == '-';
    if (!kept) c = '_';
  }
  return name + ".csv";
}

Status WriteResults(const std::string& dir, const BatchResult& batch) {
  const std::filesystem::path root(dir);

  // Trace paths first: two runs whose names differ only in replaced characters would overwrite
  // each other's trace.
  std::vector<std::string> trace_files(batch.runs.size());
  std::map<std::string, std::size_t> run_of_trace;
  for (std::size_t i = 0; i < batch.runs.size(); ++i) {
    const RunResult& run = batch.runs[i];
    if (!(run.trace.rate_hz > 0)) continue;
    trace_files[i] = "traces/" + TraceFileName(run);
    const auto [entry, fresh] = run_of_trace.emplace(trace_files[i], i);
    if (fresh) continue;
    const RunResult& other = batch.runs[entry->second];
    return Failure("cannot write " + (root / trace_files[i]).string() + ": runs " + other.scenario +
                   " / " + other.controller + " / seed " + std::to_string(other.seed) + " and " +
                   run.scenario + " / " + run.controller + " / seed " + std::to_string(run.seed) +
                   " map to the same trace file; rename one");
  }

  if (Status made = MakeResultsFolder(root.string()); !made) return made;
  const std::vector<internal::ScenarioGroup> groups = internal::GroupBatch(batch);
  std::vector<std::pair<const char*, std::function<std::string()>>> tables = {
      {"summary.csv", [&] { return internal::SummaryCsv(batch); }},
      {"summary.md", [&] { return internal::SummaryMarkdown(groups); }},
      {"compare.csv", [&] { return internal::CompareCsv(groups); }},
      {"compare.md", [&] { return internal::CompareMarkdown(groups); }},
      {"ranking.csv", [&] { return internal::RankingCsv(groups); }},
      {"ranking.md", [&] { return internal::RankingMarkdown(groups); }},
  };
  if (batch.linear_twin) {
    tables.push_back({"gap.csv", [&] { return internal::GapCsv(batch); }});
    tables.push_back({"gap.md", [&] { return internal::GapMarkdown(groups); }});
  }
  for (const auto& [name, build] : tables) {
    if (Status written = Write(root / name, build()); !written) return written;
  }

  if (!run_of_trace.empty()) {
    if (Status made = MakeResultsFolder((root / "traces").string()); !made) return made;
    for (std::size_t i = 0; i < batch.runs.size(); ++i) {
      if (trace_files[i].empty()) continue;
      Status written = Write(root / trace_files[i], internal::TraceCsv(batch.runs[i].trace));
      if (!written) return written;
    }
  }
  if (Status removed = RemoveStaleFiles(root, batch, trace_files); !removed) return removed;
  return Write(root / "manifest.json", internal::ManifestJson(batch, trace_files));
}

}  // namespace upright::runner
