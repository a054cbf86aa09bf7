// The one way a fallible function says what went wrong: it returns Result<T> (a value, or why
// there is none) or Status (nothing, or why it failed). The reason is a message a user can act on;
// where callers branch on the kind of failure, E is a small typed reason instead of a string.
// tl::expected (Debian libexpected-dev) has the interface of C++23's std::expected.
#pragma once

#include <string>
#include <utility>

#include <tl/expected.hpp>

namespace upright {

template <class T, class E = std::string>
using Result = tl::expected<T, E>;

// Success is `return {};`, failure `return Failure("what is wrong");`.
using Status = Result<void>;

// The failing side of a Result or Status: `return Failure("the file is empty");`.
template <class E = std::string>
tl::unexpected<E> Failure(E reason) {
  return tl::unexpected<E>(std::move(reason));
}

inline tl::unexpected<std::string> Failure(const char* message) {
  return tl::unexpected<std::string>(std::string(message));
}

}  // namespace upright
