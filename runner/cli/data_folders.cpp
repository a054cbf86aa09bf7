#include "data_folders.hpp"

#include <system_error>

namespace upright::cli {
namespace {

namespace fs = std::filesystem;

// The folder of the running program, or empty when /proc/self/exe cannot be read.
fs::path ExecutableFolder() {
  std::error_code ec;
  const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
  return ec ? fs::path() : exe.parent_path();
}

bool SameFolder(const fs::path& a, const fs::path& b) {
  std::error_code ec;
  return fs::equivalent(a, b, ec) && !ec;
}

}  // namespace

std::vector<fs::path> DataFolders() {
  std::vector<fs::path> folders;
  const fs::path exe_folder = ExecutableFolder();
  if (exe_folder.empty()) return folders;
  folders.push_back((exe_folder / UPRIGHT_DATA_DIR_FROM_BIN).lexically_normal());
  if (SameFolder(exe_folder, UPRIGHT_BUILD_EXE_DIR)) folders.emplace_back(UPRIGHT_SOURCE_DIR);
  return folders;
}

}  // namespace upright::cli
