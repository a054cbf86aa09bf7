// A whole file's bytes in one string: what every reader of a results folder starts from.
#pragma once

#include <string>

#include "upright/base/result.hpp"

namespace upright::runner::internal {

// The bytes of the file at `path`, or "cannot read <path>: <reason>" when it cannot be opened or
// read.
Result<std::string> ReadWholeFile(const std::string& path);

}  // namespace upright::runner::internal
