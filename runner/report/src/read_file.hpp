// A whole file's bytes in one string: what every reader of a results folder starts from.
#pragma once

#include <cstdint>
#include <string>

#include "upright/base/result.hpp"

namespace upright::runner::internal {

// The largest results file the report reads: a trace of hours at 100 Hz stays well below it.
inline constexpr std::uintmax_t kMaxResultFileBytes = std::uintmax_t{1} << 30;  // 1 GiB

// The bytes of the regular file at `path`, or "cannot read <path>: <reason>" when it cannot be
// opened or read, is not a regular file or is larger than kMaxResultFileBytes.
Result<std::string> ReadWholeFile(const std::string& path);

}  // namespace upright::runner::internal
