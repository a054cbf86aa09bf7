// Module context (internal to the built-in modules): what a module's create receives through the
// C ABI — robot, linear model, rate, key/value configuration, log callback — checked and copied
// into C++ values; and what the module declares back (command kind, diagnostic names).
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/controller_abi.h"
#include "upright/design/linear_model.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::controllers {

// Why create refused, with the status the host is to see (UPRIGHT_BAD_CONFIG, UPRIGHT_UNSUPPORTED
// or UPRIGHT_ERROR): the failing side of every fallible function of the kit and the modules. The
// adapter turns it into that status and message.
struct ModuleError {
  int status = UPRIGHT_ERROR;
  std::string message;
};

using ConfigEntries = std::vector<std::pair<std::string, std::string>>;

// Everything create was given, copied (the ABI's pointers are valid only during the call).
struct ModuleContext {
  upright_robot robot_abi{};
  upright_linear_model linear_abi{};
  model::RobotModel robot;  // rebuilt from robot_abi (abi_model.hpp)
  double rate_hz = 0;
  double period_s = 0;
  bool true_state_available = false;
  ConfigEntries config;
  upright_log_fn log = nullptr;
  void* log_host = nullptr;

  // Sends `message` to the host's log callback, when there is one.
  void Log(upright_log_level level, const std::string& message) const;
};

// Checks create's arguments (sizes, version, pointers, rate, robot) and copies them. Fails with
// UPRIGHT_ERROR for a malformed call, UPRIGHT_UNSUPPORTED for a robot or linear model the
// built-ins cannot design for.
Result<ModuleContext, ModuleError> ContextFromArgs(const upright_create_args* args);

// Fills the create result: the command kind of `input` and the diagnostic names, in order (at
// most UPRIGHT_MAX_DIAGNOSTICS, each shorter than UPRIGHT_NAME_SIZE; UPRIGHT_ERROR otherwise).
Result<void, ModuleError> Declare(design::InputKind input,
                                  const std::vector<const char*>& diagnostics,
                                  upright_create_result* result);

}  // namespace upright::controllers
