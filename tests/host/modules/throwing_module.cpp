// A test module written in C++ whose step throws through the C boundary, as a careless C++
// module might; the host must record a fault, not end the program.
#include <stdexcept>

#include "upright/controller_abi.h"

namespace {

int Create(const upright_create_args*, upright_create_result* result, void** instance, char*,
           size_t) {
  result->command_kind = UPRIGHT_COMMAND_TORQUE;
  result->diagnostic_count = 0;
  static int token;
  *instance = &token;
  return UPRIGHT_OK;
}
int Reset(void*, char*, size_t) { return UPRIGHT_OK; }
int Step(void*, const upright_step_input*, upright_step_output*, char*, size_t) {
  throw std::runtime_error("matrix not invertible");
}
void Destroy(void*) {}

const upright_controller_api kApi = {sizeof(upright_controller_api),
                                     UPRIGHT_CONTROLLER_ABI_VERSION,
                                     "throwing",
                                     Create,
                                     Reset,
                                     Step,
                                     Destroy};

}  // namespace

extern "C" UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return &kApi;
}
