// The folder a results writer fills: a path in, the folder and its parents made when missing, or
// a message saying why they cannot be.
#pragma once

#include <string>

namespace upright::runner {

// Creates `dir` and its parents when missing. True when `dir` is a folder afterwards; otherwise
// false and, when `error` is not null, "cannot create folder <dir>: <reason>".
bool MakeResultsFolder(const std::string& dir, std::string* error);

}  // namespace upright::runner
