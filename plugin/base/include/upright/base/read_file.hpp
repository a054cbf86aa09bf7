// Reading a whole file the program was given, bounded: a regular file only (never a FIFO, a
// device or a folder, which could block or never end), and no larger than the caller's limit.
#pragma once

#include <cstdint>
#include <string>

#include "upright/base/result.hpp"

namespace upright {

// The limit for the files a user writes by hand: robot models, scenarios and tune files.
inline constexpr std::uintmax_t kMaxInputFileBytes = std::uintmax_t{16} << 20;  // 16 MiB

// The file's bytes; otherwise why not, without the path: "cannot open file: <reason>", "not a
// regular file (a FIFO)", "the file is N bytes, more than the limit of M", "cannot read file".
Result<std::string> ReadRegularFile(const std::string& path, std::uintmax_t max_bytes);

}  // namespace upright
