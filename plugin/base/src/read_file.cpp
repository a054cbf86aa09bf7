#include "upright/base/read_file.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace upright {
namespace {

// What a file that is not a regular one is, for the message.
const char* KindOf(mode_t mode) {
  if (S_ISDIR(mode)) return "a folder";
  if (S_ISFIFO(mode)) return "a FIFO";
  if (S_ISCHR(mode)) return "a character device";
  if (S_ISBLK(mode)) return "a block device";
  if (S_ISSOCK(mode)) return "a socket";
  return "not a plain file";
}

// Closes the descriptor on every way out.
struct Descriptor {
  int fd;
  ~Descriptor() {
    if (fd >= 0) ::close(fd);
  }
};

}  // namespace

Result<std::string> ReadRegularFile(const std::string& path, std::uintmax_t max_bytes) {
  // Opened without blocking (a FIFO with no writer would wait forever), then asked what it is:
  // the answer is about the file opened, whatever the path names a moment later.
  const Descriptor file{::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC)};
  if (file.fd < 0) return Failure(std::string("cannot open file: ") + std::strerror(errno));
  struct stat info {};
  if (::fstat(file.fd, &info) != 0) {
    return Failure(std::string("cannot read file: ") + std::strerror(errno));
  }
  if (!S_ISREG(info.st_mode)) {
    return Failure(std::string("not a regular file (") + KindOf(info.st_mode) + ")");
  }
  const auto too_large = [&](std::uintmax_t bytes) {
    return Failure("the file is " + std::to_string(bytes) + " bytes, more than the limit of " +
                   std::to_string(max_bytes));
  };
  if (static_cast<std::uintmax_t>(info.st_size) > max_bytes) return too_large(info.st_size);
  std::string text;
  char buffer[65536];
  for (;;) {
    const ssize_t count = ::read(file.fd, buffer, sizeof buffer);
    if (count == 0) break;
    if (count < 0) {
      if (errno == EINTR) continue;
      return Failure(std::string("cannot read file: ") + std::strerror(errno));
    }
    // A file that grows while it is read is held to the same limit.
    if (text.size() + static_cast<std::size_t>(count) > max_bytes) {
      return too_large(text.size() + static_cast<std::size_t>(count));
    }
    text.append(buffer, static_cast<std::size_t>(count));
  }
  return text;
}

}  // namespace upright
