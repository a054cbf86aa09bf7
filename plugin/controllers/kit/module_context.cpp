#include "kit/module_context.hpp"

#include <cmath>
#include <cstddef>
#include <cstring>
#include <sstream>
#include <utility>

#include "kit/abi_model.hpp"

namespace upright::controllers {
namespace {

// The create arguments must reach at least to their last version-1 field.
// upright_robot as version 1 first had it, up to payload_z_m; later fields are read when present.
constexpr std::size_t kFirstRobotSize =
    offsetof(upright_robot, payload_z_m) + sizeof(upright_robot::payload_z_m);
constexpr std::size_t kMinimumArgsSize =
    offsetof(upright_create_args, log_host) + sizeof(upright_create_args::log_host);

// A malformed call: UPRIGHT_ERROR.
tl::unexpected<ModuleError> Malformed(std::string what) {
  return Failure(ModuleError{UPRIGHT_ERROR, std::move(what)});
}

}  // namespace

void ModuleContext::Log(upright_log_level level, const std::string& message) const {
  if (log) log(log_host, level, message.c_str());
}

Result<ModuleContext, ModuleError> ContextFromArgs(const upright_create_args* args) {
  if (!args) return Malformed("create called without arguments (args is NULL)");
  if (args->struct_size < kMinimumArgsSize) {
    return Malformed("upright_create_args::struct_size = " + std::to_string(args->struct_size) +
                     ": must be >= " + std::to_string(kMinimumArgsSize));
  }
  if (args->abi_version != UPRIGHT_CONTROLLER_ABI_VERSION) {
    return Failure(ModuleError{UPRIGHT_UNSUPPORTED,
                               "the host speaks controller ABI version " +
                                   std::to_string(args->abi_version) + ", this module version " +
                                   std::to_string(UPRIGHT_CONTROLLER_ABI_VERSION)});
  }
  if (!args->robot || args->robot->struct_size < kFirstRobotSize) {
    return Malformed(
        "upright_create_args::robot is NULL or shorter than version 1's upright_robot");
  }
  if (!args->linear || args->linear->struct_size < sizeof(upright_linear_model)) {
    return Malformed(
        "upright_create_args::linear is NULL or shorter than version 1's upright_linear_model");
  }
  if (!(args->rate_hz > 0) || !std::isfinite(args->rate_hz)) {
    std::ostringstream why;
    why << "upright_create_args::rate_hz = " << args->rate_hz << ": must be > 0";
    return Malformed(why.str());
  }
  if (args->config_count > 0 && !args->config) {
    return Malformed("upright_create_args::config is NULL with config_count = " +
                     std::to_string(args->config_count));
  }
  ModuleContext context;
  std::memcpy(&context.robot_abi, args->robot, sizeof(upright_robot));
  std::memcpy(&context.linear_abi, args->linear, sizeof(upright_linear_model));
  context.robot_abi.struct_size = sizeof(upright_robot);
  context.linear_abi.struct_size = sizeof(upright_linear_model);
  context.rate_hz = args->rate_hz;
  context.period_s = 1 / args->rate_hz;
  context.true_state_available = args->true_state_available != 0;
  for (uint32_t i = 0; i < args->config_count; ++i) {
    const upright_config_entry& e = args->config[i];
    if (!e.key || !e.value) {
      return Malformed("config entry " + std::to_string(i) + " has a NULL key or value");
    }
    context.config.emplace_back(e.key, e.value);
  }
  context.log = args->log;
  context.log_host = args->log_host;
  if (auto usable = CheckAbiModel(context.robot_abi, context.linear_abi); !usable) {
    return Failure(usable.error());
  }
  context.robot = RobotFromAbi(context.robot_abi, context.rate_hz);
  return context;
}

Result<void, ModuleError> Declare(design::InputKind input,
                                  const std::vector<const char*>& diagnostics,
                                  upright_create_result* result) {
  if (diagnostics.size() > UPRIGHT_MAX_DIAGNOSTICS) {
    return Malformed("more than UPRIGHT_MAX_DIAGNOSTICS diagnostics declared");
  }
  result->command_kind =
      input == design::InputKind::kVoltage ? UPRIGHT_COMMAND_VOLTAGE : UPRIGHT_COMMAND_TORQUE;
  result->diagnostic_count = 0;
  for (const char* name : diagnostics) {
    const std::size_t length = std::strlen(name);
    if (length == 0 || length >= UPRIGHT_NAME_SIZE) {
      return Malformed(std::string("diagnostic name '") + name + "' must have 1 to " +
                       std::to_string(UPRIGHT_NAME_SIZE - 1) + " characters");
    }
    std::memcpy(result->diagnostic_names[result->diagnostic_count], name, length + 1);
    ++result->diagnostic_count;
  }
  return {};
}

}  // namespace upright::controllers
