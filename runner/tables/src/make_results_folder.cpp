#include "upright/runner/tables/make_results_folder.hpp"

#include <filesystem>
#include <system_error>

namespace upright::runner {

Status MakeResultsFolder(const std::string& dir) {
  const std::filesystem::path path(dir);
  std::error_code code;
  std::filesystem::create_directories(path, code);
  if (!code && std::filesystem::is_directory(path, code)) return {};
  return Failure("cannot create folder " + path.string() + ": " +
                 (code ? code.message() : std::string("a file of that name is in the way")));
}

}  // namespace upright::runner
