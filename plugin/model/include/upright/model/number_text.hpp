// Numbers as messages and documentation write them: the shortest text that reads back as the same
// double, whole numbers in plain digits (100000, not 1e+05). Shared by every file's messages.
#pragma once

#include <string>

namespace upright {

// 0.25, -3, 1e-05, 100000; "?" only if the number cannot be formatted.
std::string NumberText(double value);

}  // namespace upright
