#include "read_file.hpp"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <sstream>

namespace upright::runner::report {

bool ReadWholeFile(const std::string& path, std::string* text, std::string* error) {
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    *error = "cannot read " + path + ": " + std::strerror(errno);
    return false;
  }
  std::ostringstream bytes;
  bytes << in.rdbuf();
  if (in.bad()) {
    *error = "cannot read " + path + ": read error";
    return false;
  }
  *text = std::move(bytes).str();
  return true;
}

}  // namespace upright::runner::report
