#include "read_file.hpp"

#include "upright/base/read_file.hpp"

namespace upright::runner::internal {

Result<std::string> ReadWholeFile(const std::string& path) {
  Result<std::string> text = ReadRegularFile(path, kMaxResultFileBytes);
  if (!text) return Failure("cannot read " + path + ": " + text.error());
  return text;
}

}  // namespace upright::runner::internal
