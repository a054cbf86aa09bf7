/* The controller ABI header compiled as C99 (this file is C, not C++), loading a real module
 * with dlopen and driving it through create, step, reset and destroy as a C host would. */
#include <dlfcn.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "upright/controller_abi.h"

static int passed = 0, failed = 0;

static void Check(int ok, const char* what) {
  if (ok) {
    ++passed;
  } else {
    ++failed;
    printf("FAILED: %s\n", what);
  }
}

int main(int argc, char** argv) {
  void* handle;
  upright_controller_entry_fn entry;
  const upright_controller_api* api;
  upright_robot robot;
  upright_linear_model linear;
  upright_create_args args;
  upright_create_result result;
  upright_step_input input;
  upright_step_output output;
  void* instance = NULL;
  char error[256] = "";
  int status;

  if (argc != 2) {
    printf("usage: %s MODULE.so\n", argv[0]);
    return 2;
  }
  handle = dlopen(argv[1], RTLD_NOW | RTLD_LOCAL);
  Check(handle != NULL, "dlopen the module");
  if (!handle) {
    printf("%s\n", dlerror());
    return 1;
  }
  /* Object-to-function pointer conversion through memcpy: strict C99 has no cast for it. */
  {
    void* symbol = dlsym(handle, UPRIGHT_CONTROLLER_ENTRY_SYMBOL);
    Check(symbol != NULL, "the entry symbol is exported");
    if (!symbol) return 1;
    memcpy(&entry, &symbol, sizeof entry);
  }
  api = entry();
  Check(api != NULL, "the entry returns a table");
  Check(api->abi_version == UPRIGHT_CONTROLLER_ABI_VERSION, "the module speaks ABI version 1");
  Check(api->struct_size >= sizeof(upright_controller_api), "the table is complete");

  memset(&robot, 0, sizeof robot);
  robot.struct_size = sizeof robot;
  robot.wheel_radius_m = 0.1;
  memset(&linear, 0, sizeof linear);
  linear.struct_size = sizeof linear;
  memset(&args, 0, sizeof args);
  args.struct_size = sizeof args;
  args.abi_version = UPRIGHT_CONTROLLER_ABI_VERSION;
  args.robot = &robot;
  args.linear = &linear;
  args.rate_hz = 100;
  memset(&result, 0, sizeof result);
  result.struct_size = sizeof result;
  status = api->create(&args, &result, &instance, error, sizeof error);
  Check(status == UPRIGHT_OK, "create succeeds");
  Check(result.command_kind == UPRIGHT_COMMAND_TORQUE, "the module declares torque commands");
  Check(result.diagnostic_count == 1 && strcmp(result.diagnostic_names[0], "ticks") == 0,
        "the module declares its diagnostic");

  memset(&input, 0, sizeof input);
  input.struct_size = sizeof input;
  input.sensors.struct_size = sizeof input.sensors;
  input.reference.struct_size = sizeof input.reference;
  output.struct_size = sizeof output;
  output.command[0] = output.command[1] = NAN;
  status = api->step(instance, &input, &output, error, sizeof error);
  Check(status == UPRIGHT_OK, "step succeeds");
  Check(output.command[0] == 0.0 && output.command[1] == 0.0, "step writes both commands");
  Check(output.diagnostics[0] == 1.0, "step reports its diagnostic");
  Check(api->reset(instance, error, sizeof error) == UPRIGHT_OK, "reset succeeds");
  api->step(instance, &input, &output, error, sizeof error);
  Check(output.diagnostics[0] == 1.0, "reset restarts the module's count");
  api->destroy(instance);
  dlclose(handle);

  printf("%d passed, %d failed\n", passed, failed);
  return failed == 0 ? 0 : 1;
}
