/* A test module that logs through the host's callback, and how much is set by its settings:
 *   at create, one message at each level: "create: debug", "create: info", "create: warning",
 *   "create: error";
 *   on its first tick, the warning "first tick";
 *   on every tick, `per_step` info messages "tick N message K" (N and K from 1; default 0);
 *   with long = true, on its first tick an info message of 2000 'x' bytes;
 *   with refuse = true, create logs its messages, then refuses with UPRIGHT_BAD_CONFIG.
 * Unknown keys are refused. Commands zero torque. Plain C99, like a user's module. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "upright/controller_abi.h"

typedef struct Logging {
  upright_log_fn log;
  void* log_host;
  long per_step;
  int long_message;
  long ticks;
} Logging;

static void Say(const Logging* self, upright_log_level level, const char* message) {
  if (self->log) self->log(self->log_host, level, message);
}

static int Create(const upright_create_args* args, upright_create_result* result, void** instance,
                  char* error, size_t error_size) {
  Logging settings = {args->log, args->log_host, 0, 0, 0};
  int refuse = 0;
  uint32_t i;
  for (i = 0; i < args->config_count; ++i) {
    const char* key = args->config[i].key;
    const char* value = args->config[i].value;
    if (strcmp(key, "per_step") == 0) {
      settings.per_step = strtol(value, NULL, 10);
    } else if (strcmp(key, "long") == 0) {
      settings.long_message = strcmp(value, "true") == 0;
    } else if (strcmp(key, "refuse") == 0) {
      refuse = strcmp(value, "true") == 0;
    } else {
      snprintf(error, error_size, "unknown key %s", key);
      return UPRIGHT_BAD_CONFIG;
    }
  }
  Say(&settings, UPRIGHT_LOG_DEBUG, "create: debug");
  Say(&settings, UPRIGHT_LOG_INFO, "create: info");
  Say(&settings, UPRIGHT_LOG_WARNING, "create: warning");
  Say(&settings, UPRIGHT_LOG_ERROR, "create: error");
  if (refuse) {
    snprintf(error, error_size, "refused as asked (refuse = true)");
    return UPRIGHT_BAD_CONFIG;
  }
  result->command_kind = UPRIGHT_COMMAND_TORQUE;
  result->diagnostic_count = 0;
  *instance = malloc(sizeof(Logging));
  if (*instance == NULL) return UPRIGHT_ERROR;
  memcpy(*instance, &settings, sizeof settings);
  return UPRIGHT_OK;
}

static int Reset(void* instance, char* error, size_t error_size) {
  (void)error;
  (void)error_size;
  ((Logging*)instance)->ticks = 0;
  return UPRIGHT_OK;
}

static int Step(void* instance, const upright_step_input* input, upright_step_output* output,
                char* error, size_t error_size) {
  Logging* self = (Logging*)instance;
  char message[64];
  long k;
  (void)input;
  (void)error;
  (void)error_size;
  self->ticks += 1;
  if (self->ticks == 1) {
    Say(self, UPRIGHT_LOG_WARNING, "first tick");
    if (self->long_message) {
      static char text[2001];
      memset(text, 'x', 2000);
      text[2000] = '\0';
      Say(self, UPRIGHT_LOG_INFO, text);
    }
  }
  for (k = 1; k <= self->per_step; ++k) {
    snprintf(message, sizeof message, "tick %ld message %ld", self->ticks, k);
    Say(self, UPRIGHT_LOG_INFO, message);
  }
  output->command[0] = 0.0;
  output->command[1] = 0.0;
  return UPRIGHT_OK;
}

static void Destroy(void* instance) { free(instance); }

static const upright_controller_api kApi = {sizeof(upright_controller_api),
                                            UPRIGHT_CONTROLLER_ABI_VERSION,
                                            "logging",
                                            Create,
                                            Reset,
                                            Step,
                                            Destroy};

UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return &kApi;
}
