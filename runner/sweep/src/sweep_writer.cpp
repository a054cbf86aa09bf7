// WriteSweepResults: each file's text built from the result, then written atomically one by one;
// manifest.json last, so its presence means the folder is complete.
#include "upright/runner/sweep_writer.hpp"

#include <filesystem>

#include "upright/runner/atomic_file.hpp"
#include "upright/runner/make_results_folder.hpp"

namespace upright::runner {

const std::vector<std::string>& SweepFileNames() {
  static const std::vector<std::string> kNames = {"sweep.csv", "sweep.md", "manifest.json"};
  return kNames;
}

bool WriteSweepResults(const std::string& dir, const SweepResult& result, std::string* error) {
  if (!MakeResultsFolder(dir, error)) return false;
  const std::filesystem::path root(dir);
  return WriteFileAtomically((root / "sweep.csv").string(), SweepCsv(result), error) &&
         WriteFileAtomically((root / "sweep.md").string(), SweepMarkdown(result), error) &&
         WriteFileAtomically((root / "manifest.json").string(), SweepManifestJson(result), error);
}

}  // namespace upright::runner
