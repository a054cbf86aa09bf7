// The folder a results writer fills: a path in, the folder and its parents made when missing, or
// a message saying why they cannot be.
#pragma once

#include <string>

#include "upright/base/result.hpp"

namespace upright::runner {

// Creates `dir` and its parents when missing. Fine when `dir` is a folder afterwards; otherwise
// "cannot create folder <dir>: <reason>".
Status MakeResultsFolder(const std::string& dir);

}  // namespace upright::runner
