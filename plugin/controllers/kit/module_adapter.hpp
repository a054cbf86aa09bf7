// Module adapter (internal to the built-in modules): a C++ controller class in, the C function
// table of upright/controller_abi.h out. Create arguments, step inputs and outputs flow through
// it unchanged; a refusal (ModuleError) becomes its status code and message, and any exception
// (out of memory, say) is caught here and becomes UPRIGHT_ERROR, so none ever crosses the C
// boundary.
//
// A controller class provides:
//   static constexpr const char* kName;  // the table's short name
//   static Result<std::unique_ptr<C>, ModuleError> Create(const ModuleContext& context,
//                                                         upright_create_result* result);
//   void Reset();
//   const char* Step(const upright_step_input& input, upright_step_output* output);
//       // nullptr when all is well, else a message in static storage: no allocation per tick
#pragma once

#include <algorithm>
#include <cstddef>
#include <cstring>
#include <exception>
#include <memory>
#include <new>

#include "kit/module_context.hpp"
#include "upright/controller_abi.h"

namespace upright::controllers {

// Copies `text` into a caller's error buffer of `size` bytes, truncated and NUL-terminated; no
// allocation, so it is safe in step.
inline void WriteMessage(const char* text, char* buffer, std::size_t size) {
  if (!buffer || size == 0) return;
  const std::size_t length = std::min(std::strlen(text), size - 1);
  std::memcpy(buffer, text, length);
  buffer[length] = '\0';
}

template <typename Controller>
class ModuleAdapter {
 public:
  static const upright_controller_api* Api() {
    static const upright_controller_api kApi = {sizeof(upright_controller_api),
                                                UPRIGHT_CONTROLLER_ABI_VERSION,
                                                Controller::kName,
                                                &Create,
                                                &Reset,
                                                &Step,
                                                &Destroy};
    return &kApi;
  }

 private:
  // Runs `call`, returning its status; an exception becomes UPRIGHT_ERROR and a message.
  template <typename Call>
  static int Guard(Call call, char* error, std::size_t error_size) noexcept {
    try {
      return call();
    } catch (const std::bad_alloc&) {
      WriteMessage("out of memory", error, error_size);
    } catch (const std::exception& e) {
      WriteMessage(e.what(), error, error_size);
    } catch (...) {
      WriteMessage("an exception of unknown type", error, error_size);
    }
    return UPRIGHT_ERROR;
  }

  // A refusal as the host sees it: its status, and its message in the error buffer.
  static int Refuse(const ModuleError& refusal, char* error, std::size_t error_size) {
    WriteMessage(refusal.message.c_str(), error, error_size);
    return refusal.status;
  }

  static int Create(const upright_create_args* args, upright_create_result* result, void** instance,
                    char* error, std::size_t error_size) noexcept {
    if (instance) *instance = nullptr;
    return Guard(
        [&] {
          if (!instance) {
            return Refuse({UPRIGHT_ERROR, "create: instance is NULL"}, error, error_size);
          }
          if (!result || result->struct_size < sizeof(upright_create_result)) {
            return Refuse({UPRIGHT_ERROR,
                           "create: result is NULL or shorter than version 1's "
                           "upright_create_result"},
                          error, error_size);
          }
          const Result<ModuleContext, ModuleError> context = ContextFromArgs(args);
          if (!context) return Refuse(context.error(), error, error_size);
          Result<std::unique_ptr<Controller>, ModuleError> controller =
              Controller::Create(*context, result);
          if (!controller) return Refuse(controller.error(), error, error_size);
          *instance = controller->release();
          return UPRIGHT_OK;
        },
        error, error_size);
  }

  static int Reset(void* instance, char* error, std::size_t error_size) noexcept {
    return Guard(
        [&] {
          if (!instance) {
            return Refuse({UPRIGHT_ERROR, "reset: instance is NULL"}, error, error_size);
          }
          static_cast<Controller*>(instance)->Reset();
          return UPRIGHT_OK;
        },
        error, error_size);
  }

  static int Step(void* instance, const upright_step_input* input, upright_step_output* output,
                  char* error, std::size_t error_size) noexcept {
    return Guard(
        [&] {
          const char* why = nullptr;
          if (!instance || !input || !output) {
            why = "step: instance, input or output is NULL";
          } else if (input->struct_size < sizeof(upright_step_input) ||
                     input->sensors.struct_size < sizeof(upright_sensor_sample) ||
                     input->reference.struct_size < sizeof(upright_reference) ||
                     output->struct_size < sizeof(upright_step_output)) {
            why = "step: an input or output struct is shorter than version 1's";
          } else {
            why = static_cast<Controller*>(instance)->Step(*input, output);
          }
          if (!why) return UPRIGHT_OK;
          WriteMessage(why, error, error_size);
          return UPRIGHT_ERROR;
        },
        error, error_size);
  }

  static void Destroy(void* instance) noexcept { delete static_cast<Controller*>(instance); }
};

}  // namespace upright::controllers
