// Writing a whole file at once: the bytes go to "<path>.tmp.<pid>" first, which is then renamed
// over `path`, so a reader (or a batch interrupted mid-write) sees the old file or the new one,
// never half of one. The rename is atomic within one file system (POSIX rename()).
#pragma once

#include <string>
#include <string_view>

#include "upright/base/result.hpp"

namespace upright::runner {

// Writes `contents` to `path` through a temporary beside it. The directory must exist. On failure
// "cannot write <path>: <reason>", and the temporary is removed.
Status WriteFileAtomically(const std::string& path, std::string_view contents);

}  // namespace upright::runner
