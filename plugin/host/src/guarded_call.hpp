// Guarded call (internal): every call into a module — its entry function, create, step, reset —
// goes through GuardedCall, so an exception escaping the module (a C++ module that throws
// through the C boundary) becomes a failure with a message instead of ending the program.
#pragma once

#include <exception>
#include <string>

#include "upright/base/result.hpp"

namespace upright::host::internal {

// What `call` returned, or "threw an exception: <what>" ("... of unknown type"). No allocation
// unless the call throws.
template <typename Call>
auto GuardedCall(Call call) -> Result<decltype(call())> {
  try {
    return call();
  } catch (const std::exception& e) {
    return Failure(std::string("threw an exception: ") + e.what());
  } catch (...) {
    return Failure("threw an exception of unknown type");
  }
}

}  // namespace upright::host::internal
