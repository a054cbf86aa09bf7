// Where the program finds the data it ships (the demo models/ and scenarios/): the installed share
// folder beside its bin folder (bin/../share/upright), or, for the program still in the build
// tree it was built in, the source tree. Found from the executable's own path, so an installed
// program never depends on the tree it was built from.
#pragma once

#include <filesystem>
#include <vector>

namespace upright::cli {

// The folders that may hold models/ and scenarios/, in the order to try them.
std::vector<std::filesystem::path> DataFolders();

}  // namespace upright::cli
