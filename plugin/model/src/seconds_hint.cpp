#include "upright/model/seconds_hint.hpp"

#include <string>

#include "upright/base/number_text.hpp"

namespace upright::model {

std::string SecondsHint(double value_s) {
  return "the field is in seconds: " + ShortestFixedText(value_s) + " ms is " +
         ShortestFixedText(value_s / 1000);
}

}  // namespace upright::model
