// Sampled values in sweep files: the shortest decimal text that reads back to the same double,
// so a sample can be replayed from sweep.csv exactly. Locale-independent (std::to_chars).
#pragma once

#include <string>

namespace upright::runner::internal {

// Appends `value` in its shortest exact form; NaN as nothing (an empty CSV field), -0 as 0.
void AppendExactNumber(std::string* out, double value);

}  // namespace upright::runner::internal
