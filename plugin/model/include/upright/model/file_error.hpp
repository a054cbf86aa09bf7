// FileError: one problem found in an input file, located by path and line.
// Shared by robot model files and scenario files.
#pragma once

#include <string>

#include "upright/base/printable.hpp"

namespace upright::model {

struct FileError {
  std::string path;
  int line = 0;  // 1-based; 0 when the problem is not tied to a line (file missing, unreadable)
  std::string message;
  // "path:line: message", or "path: message" when line is 0, on one line: the control
  // characters a value from the file may carry escaped (upright::Printable).
  std::string ToString() const {
    return Printable(line > 0 ? path + ":" + std::to_string(line) + ": " + message
                              : path + ": " + message);
  }
};

}  // namespace upright::model
