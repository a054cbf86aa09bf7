/* Test modules that misbehave in one way each, chosen at compile time by FAULT:
 *   1 leaves the right command unwritten (stays NaN)   2 returns an error status from step
 *   3 declares ABI version 99                           4 has a NULL step in its table
 *   5 fails create with UPRIGHT_BAD_CONFIG               6 returns +inf as the left command
 *   0 behaves: commands zero torque.
 * Plain C99, like a user's module. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "upright/controller_abi.h"

#ifndef FAULT
#error "FAULT must be defined"
#endif

static int Create(const upright_create_args* args, upright_create_result* result, void** instance,
                  char* error, size_t error_size) {
  if (args->log) args->log(args->log_host, UPRIGHT_LOG_INFO, "created");
  if (FAULT == 5) {
    snprintf(error, error_size, "gain = banana: must be a number");
    return UPRIGHT_BAD_CONFIG;
  }
  result->command_kind = UPRIGHT_COMMAND_TORQUE;
  result->diagnostic_count = 1;
  snprintf(result->diagnostic_names[0], UPRIGHT_NAME_SIZE, "ticks");
  *instance = calloc(1, sizeof(double));
  return *instance ? UPRIGHT_OK : UPRIGHT_ERROR;
}

static int Reset(void* instance, char* error, size_t error_size) {
  (void)error;
  (void)error_size;
  *(double*)instance = 0;
  return UPRIGHT_OK;
}

static int Step(void* instance, const upright_step_input* input, upright_step_output* output,
                char* error, size_t error_size) {
  double* ticks = (double*)instance;
  (void)input;
  *ticks += 1;
  output->diagnostics[0] = *ticks;
  if (FAULT == 2 && *ticks >= 3) {
    snprintf(error, error_size, "estimator diverged at tick %.0f", *ticks);
    return UPRIGHT_ERROR;
  }
  output->command[0] = FAULT == 6 ? INFINITY : 0.0;
  if (FAULT != 1) output->command[1] = 0.0;
  return UPRIGHT_OK;
}

static void Destroy(void* instance) { free(instance); }

static const upright_controller_api kApi = {
    sizeof(upright_controller_api),
    FAULT == 3 ? 99u : UPRIGHT_CONTROLLER_ABI_VERSION,
    "faulty",
    Create,
    Reset,
    FAULT == 4 ? NULL : Step,
    Destroy};

UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return &kApi;
}
