// SHA-256 (FIPS 180-4) of bytes or of a file, as 64 lowercase hex digits: file contents in, digest
// text out. The manifest records each input file (scenario, robot model) by it.
#pragma once

#include <string>
#include <string_view>

#include "upright/base/result.hpp"

namespace upright::runner {

// The digest of `bytes` as 64 lowercase hex digits.
std::string Sha256Hex(std::string_view bytes);

// The digest of the file's bytes, read in chunks; "cannot read <path>: <reason>" when the file
// cannot be read.
Result<std::string> Sha256OfFile(const std::string& path);

}  // namespace upright::runner
