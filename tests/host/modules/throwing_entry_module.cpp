// A test module written in C++ whose entry function throws through the C boundary before handing
// out any table; the loader must refuse it with a message, not end the program.
#include <stdexcept>

#include "upright/controller_abi.h"

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  throw std::runtime_error("no table for this build");
}
