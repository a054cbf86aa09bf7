#include "read_file.hpp"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <sstream>

namespace upright::runner::internal {

Result<std::string> ReadWholeFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return Failure("cannot read " + path + ": " + std::strerror(errno));
  std::ostringstream bytes;
  bytes << in.rdbuf();
  if (in.bad()) return Failure("cannot read " + path + ": read error");
  return std::move(bytes).str();
}

}  // namespace upright::runner::internal
