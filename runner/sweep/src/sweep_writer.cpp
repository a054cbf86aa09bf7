// WriteSweepResults: each file's text built from the result, then written atomically one by one;
// manifest.json last, so its presence means the folder is complete.
#include "upright/runner/sweep/sweep_writer.hpp"

#include <filesystem>

#include "upright/runner/common/atomic_file.hpp"
#include "upright/runner/tables/make_results_folder.hpp"

namespace upright::runner {

namespace {

// The files in writing order, each with the function that builds its text: the one list both
// WriteSweepResults and SweepFileNames read.
struct SweepFile {
  const char* name;
  std::string (*text)(const SweepResult&);
};
constexpr SweepFile kFiles[] = {
    {"sweep.csv", SweepCsv}, {"sweep.md", SweepMarkdown}, {"manifest.json", SweepManifestJson}};

}  // namespace

const std::vector<std::string>& SweepFileNames() {
  static const std::vector<std::string> kNames = [] {
    std::vector<std::string> names;
    for (const SweepFile& file : kFiles) names.emplace_back(file.name);
    return names;
  }();
  return kNames;
}

Status WriteSweepResults(const std::string& dir, const SweepResult& result) {
  if (Status made = MakeResultsFolder(dir); !made) return made;
  const std::filesystem::path root(dir);
  for (const SweepFile& file : kFiles) {
    Status written = WriteFileAtomically((root / file.name).string(), file.text(result));
    if (!written) return written;
  }
  return {};
}

}  // namespace upright::runner
