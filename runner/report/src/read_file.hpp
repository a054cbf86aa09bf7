// A whole file's bytes in one string: what every reader of a results folder starts from.
#pragma once

#include <string>

namespace upright::runner::report {

// Reads the file at `path` into *text. False and *error ("cannot read <path>: <reason>") when it
// cannot be opened or read.
bool ReadWholeFile(const std::string& path, std::string* text, std::string* error);

}  // namespace upright::runner::report
