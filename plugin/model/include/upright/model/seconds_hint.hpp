// The hint a message adds when it refuses a value of a field in seconds as too large: such a value
// is most often milliseconds written where seconds belong ("latency_s = 5" meant as 5 ms).
#pragma once

#include <string>

namespace upright::model {

// "the field is in seconds: 5 ms is 0.005" for `value_s` = 5 (numbers in their shortest exact
// decimal form, never in exponent notation).
std::string SecondsHint(double value_s);

}  // namespace upright::model
