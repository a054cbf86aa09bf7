// Temporary-then-rename writing. Guards against an interrupted process, not against power loss:
// the data is not fsync'ed (a results folder is cheap to regenerate, and traces are many).
#include "upright/runner/common/atomic_file.hpp"

#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>

namespace upright::runner {
namespace {

Status Fail(const std::string& path, const std::string& temporary, int error_number) {
  std::remove(temporary.c_str());
  return Failure("cannot write " + path + ": " + std::strerror(error_number));
}

}  // namespace

Status WriteFileAtomically(const std::string& path, std::string_view contents) {
  const std::string temporary = path + ".tmp." + std::to_string(static_cast<long>(::getpid()));
  std::FILE* file = std::fopen(temporary.c_str(), "wb");
  if (file == nullptr) {
    const int open_errno = errno;
    return Failure("cannot write " + path + ": " + std::strerror(open_errno));
  }
  const std::size_t written = std::fwrite(contents.data(), 1, contents.size(), file);
  const int write_errno = errno;
  if (written != contents.size()) {
    std::fclose(file);
    return Fail(path, temporary, write_errno);
  }
  if (std::fclose(file) != 0) return Fail(path, temporary, errno);
  if (std::rename(temporary.c_str(), path.c_str()) != 0) return Fail(path, temporary, errno);
  return {};
}

}  // namespace upright::runner
