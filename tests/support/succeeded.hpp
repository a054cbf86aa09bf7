// Succeeded(result): a GoogleTest assertion that a Result or Status holds its value, which prints
// the failure's reason when it does not: ASSERT_TRUE(Succeeded(plant->AddPush(push))).
// FailureOf(result): the failing side of a result that must fail, for checks on the reason.
#pragma once

#include <gtest/gtest.h>

#include <string>
#include <type_traits>

#include "upright/base/result.hpp"

namespace upright {

// A failure's reason as text: the string itself, its ToString() or message, or each element of a
// list on its own line.
template <class E>
std::string ReasonText(const E& reason) {
  if constexpr (std::is_convertible_v<const E&, std::string>) {
    return reason;
  } else if constexpr (requires { reason.ToString(); }) {
    return reason.ToString();
  } else if constexpr (requires { reason.message; }) {
    return reason.message;
  } else if constexpr (requires {
                         reason.begin();
                         reason.end();
                       }) {
    std::string text;
    for (const auto& each : reason) {
      if (!text.empty()) text += '\n';
      text += ReasonText(each);
    }
    return text;
  } else {
    return "(a failure without text)";
  }
}

template <class T, class E>
::testing::AssertionResult Succeeded(const Result<T, E>& result) {
  if (result.has_value()) return ::testing::AssertionSuccess();
  return ::testing::AssertionFailure() << ReasonText(result.error());
}

// The failure of `result`; a test failure, and a default E, when it holds a value instead.
template <class T, class E>
E FailureOf(const Result<T, E>& result) {
  EXPECT_FALSE(result.has_value()) << "succeeded where a failure was expected";
  return result.has_value() ? E{} : result.error();
}

}  // namespace upright
