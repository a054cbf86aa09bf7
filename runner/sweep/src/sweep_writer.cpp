// WriteSweepResults: each file's text built from the result, then written atomically one by one;
// manifest.json last, so its presence means the folder is complete.
#include "upright/runner/sweep_writer.hpp"

#include <filesystem>
#include <system_error>

#include "upright/runner/atomic_file.hpp"

namespace upright::runner {

const std::vector<std::string>& SweepFileNames() {
  static const std::vector<std::string> kNames = {"sweep.csv", "sweep.md", "manifest.json"};
  return kNames;
}

bool WriteSweepResults(const std::string& dir, const SweepResult& result, std::string* error) {
  const std::filesystem::path root(dir);
  std::error_code code;
  std::filesystem::create_directories(root, code);
  if (code || !std::filesystem::is_directory(root, code)) {
    *error = "cannot create folder " + root.string() + ": " +
             (code ? code.message() : std::string("a file of that name is in the way"));
    return false;
  }
  return WriteFileAtomically((root / "sweep.csv").string(), SweepCsv(result), error) &&
         WriteFileAtomically((root / "sweep.md").string(), SweepMarkdown(result), error) &&
         WriteFileAtomically((root / "manifest.json").string(), SweepManifestJson(result), error);
}

}  // namespace upright::runner
