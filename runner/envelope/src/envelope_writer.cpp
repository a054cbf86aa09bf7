// WriteEnvelopeResults: builds each file's text from the result, then writes them one by one, each
// atomically; manifest.json goes last, so its presence means the folder is complete.
#include "upright/runner/envelope/envelope_writer.hpp"

#include <filesystem>

#include "envelope_tables.hpp"
#include "upright/runner/common/atomic_file.hpp"
#include "upright/runner/tables/make_results_folder.hpp"

namespace upright::runner {

std::vector<std::string> EnvelopeFileNames(const EnvelopeResult& result) {
  std::vector<std::string> names = {"envelope.csv", "envelope.md"};
  if (result.plan.axis2) names.push_back("envelope_map.csv");
  names.push_back("manifest.json");
  return names;
}

Status WriteEnvelopeResults(const std::string& dir, const EnvelopeResult& result) {
  if (Status made = MakeResultsFolder(dir); !made) return made;
  const std::filesystem::path root(dir);
  const auto write = [&](const char* name, const std::string& text) {
    return WriteFileAtomically((root / name).string(), text);
  };
  if (Status written = write("envelope.csv", internal::EnvelopeCsv(result)); !written) {
    return written;
  }
  if (Status written = write("envelope.md", internal::EnvelopeMarkdown(result)); !written) {
    return written;
  }
  if (result.plan.axis2) {
    Status written = write("envelope_map.csv", internal::EnvelopeMapCsv(result));
    if (!written) return written;
  }
  return write("manifest.json", internal::EnvelopeManifestJson(result));
}

}  // namespace upright::runner
