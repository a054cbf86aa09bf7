/* gain_scheduled_pd: an example controller module, written in plain C99 as a user would, built
 * out of tree against an installed upright (find_package(upright)).
 *
 * It balances the robot with a PD on tilt whose stiffness grows with the tilt (gain scheduling),
 * plus position and speed feedback, all designed at create from the linear model the host hands
 * over: the four planar gains place the closed-loop poles at a tilt pair and a drive pair (closed
 * form below), and a yaw-rate damper keeps it straight. The state comes from the sensors: tilt
 * from a complementary filter of gyro and accelerometer, position and speed from the encoders.
 *
 * Configuration keys (all optional): tilt_schedule (extra tilt stiffness at 10 degrees, as a
 * fraction; default 0.5), filter_s (complementary filter time constant, s; default 0.5). */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "upright/controller_abi.h"

static const double kPi = 3.14159265358979323846;

typedef struct Pd {
  double period_s, radius_m, track_m, equilibrium_rad;
  double k_x, k_v, k_tilt, k_rate, k_yaw_rate; /* torque (sum of both wheels) per unit */
  double tilt_schedule, filter_s;
  double pitch_rad, x_ref_m, heading_ref_rad; /* estimator and reference memory */
  int started;
} Pd;

/* Row-major element (row, col) of a matrix with `cols` columns. */
static double At(const double* m, int cols, int row, int col) { return m[row * cols + col]; }

/* Planar model per unit of the summed wheel torque u: v' = a θ + bx u, θ'' = L θ + bt u. For
 * u = k1 x + k2 v + k3 θ + k4 θ' the closed loop's characteristic polynomial is
 *   s⁴ − (bt k4 + bx k2) s³ − (L + bt k3 + bx k1) s² + k2 D s + k1 D,  D = bx L − a bt
 * (derived by hand), so matching s⁴ + c3 s³ + c2 s² + c1 s + c0, given as c = {c3, c2, c1, c0},
 * yields k = {k1, k2, k3, k4} directly. */
static void PlacePoles(double a, double bx, double L, double bt, const double c[4], double k[4]) {
  const double d = bx * L - a * bt;
  k[0] = c[3] / d;
  k[1] = c[2] / d;
  k[2] = (-(c[1] + L) - bx * k[0]) / bt;
  k[3] = (-c[0] - bx * k[1]) / bt;
}

/* c = {c3, c2, c1, c0}, the coefficients of (s² + 2ζ₁ω₁ s + ω₁²)(s² + 2ζ₂ω₂ s + ω₂²). */
static void TwoPairs(double w1, double z1, double w2, double z2, double c[4]) {
  const double a1 = 2 * z1 * w1, b1 = w1 * w1, a2 = 2 * z2 * w2, b2 = w2 * w2;
  c[0] = a1 + a2;
  c[1] = b1 + b2 + a1 * a2;
  c[2] = a1 * b2 + a2 * b1;
  c[3] = b1 * b2;
}

static int ReadConfig(const upright_create_args* args, Pd* pd, char* error, size_t error_size) {
  uint32_t i;
  for (i = 0; i < args->config_count; ++i) {
    const char* key = args->config[i].key;
    const char* text = args->config[i].value;
    char* end = NULL;
    const double value = strtod(text, &end);
    const int number = end != text && *end == '\0' && isfinite(value);
    if (strcmp(key, "tilt_schedule") == 0 && number && value >= 0 && value <= 5) {
      pd->tilt_schedule = value;
    } else if (strcmp(key, "filter_s") == 0 && number && value > 0 && value <= 10) {
      pd->filter_s = value;
    } else if (strcmp(key, "tilt_schedule") == 0 || strcmp(key, "filter_s") == 0) {
      snprintf(error, error_size, "%s = %s: must be a number in %s", key, text,
               strcmp(key, "filter_s") == 0 ? "(0, 10]" : "[0, 5]");
      return UPRIGHT_BAD_CONFIG;
    } else {
      snprintf(error, error_size, "unknown key '%s' (expected tilt_schedule or filter_s)", key);
      return UPRIGHT_BAD_CONFIG;
    }
  }
  return UPRIGHT_OK;
}

static int Create(const upright_create_args* args, upright_create_result* result, void** instance,
                  char* error, size_t error_size) {
  const double* A = args->linear->A_torque;
  const double* B = args->linear->B_torque;
  const double L = At(A, UPRIGHT_STATES, 3, 2), a = At(A, UPRIGHT_STATES, 1, 2);
  const double bx = At(B, UPRIGHT_INPUTS, 1, 0), bt = At(B, UPRIGHT_INPUTS, 3, 0);
  const double b_yaw = At(B, UPRIGHT_INPUTS, 5, 1);
  double c[4], k[4], lambda;
  int status;
  Pd* pd = (Pd*)calloc(1, sizeof(Pd));
  if (!pd) {
    snprintf(error, error_size, "out of memory");
    return UPRIGHT_ERROR;
  }
  pd->tilt_schedule = 0.5;
  pd->filter_s = 0.5;
  status = ReadConfig(args, pd, error, error_size);
  if (status != UPRIGHT_OK || !(L > 0) || !(bt < 0) || !(b_yaw > 0)) {
    if (status == UPRIGHT_OK) {
      snprintf(error, error_size, "the linear model is not a balancing robot's");
      status = UPRIGHT_UNSUPPORTED;
    }
    free(pd);
    return status;
  }
  lambda = sqrt(L); /* the rate at which the robot falls, 1/s */
  TwoPairs(2 * lambda, 0.7, lambda / 3, 0.9, c);
  PlacePoles(a, bx, L, bt, c, k);
  pd->k_x = k[0];
  pd->k_v = k[1];
  pd->k_tilt = k[2];
  pd->k_rate = k[3];
  pd->k_yaw_rate = lambda / b_yaw; /* yaw rate settles at about the fall rate */
  pd->period_s = 1 / args->rate_hz;
  pd->radius_m = args->robot->wheel_radius_m;
  pd->track_m = args->robot->track_m;
  pd->equilibrium_rad = args->linear->equilibrium_pitch_rad;
  result->command_kind = UPRIGHT_COMMAND_TORQUE;
  result->diagnostic_count = 2;
  snprintf(result->diagnostic_names[0], UPRIGHT_NAME_SIZE, "pitch_est_rad");
  snprintf(result->diagnostic_names[1], UPRIGHT_NAME_SIZE, "tilt_gain_scale");
  *instance = pd;
  return UPRIGHT_OK;
}

static int Reset(void* instance, char* error, size_t error_size) {
  Pd* pd = (Pd*)instance;
  (void)error;
  (void)error_size;
  pd->started = 0;
  pd->x_ref_m = 0;
  pd->heading_ref_rad = 0;
  return UPRIGHT_OK;
}

static int Step(void* instance, const upright_step_input* in, upright_step_output* out,
                char* error, size_t error_size) {
  Pd* pd = (Pd*)instance;
  const upright_sensor_sample* s = &in->sensors;
  /* Leaning forward by θ, gravity's reaction reads −g sin θ along body x and g cos θ along z. */
  const double accel_tilt = atan2(-s->accel_m_s2[0], s->accel_m_s2[2]);
  const double rate = s->gyro_rad_s[1];
  double tilt, x, v, scale, u_sum, u_diff;
  (void)error;
  (void)error_size;
  /* Complementary filter: integrate the gyro, lean toward the accelerometer's tilt. */
  if (!pd->started) {
    pd->pitch_rad = accel_tilt;
    pd->started = 1;
  } else {
    pd->pitch_rad += pd->period_s * rate;
    pd->pitch_rad += pd->period_s / pd->filter_s * (accel_tilt - pd->pitch_rad);
  }
  x = pd->radius_m * (0.5 * (s->encoder_angle_rad[0] + s->encoder_angle_rad[1]) + pd->pitch_rad);
  v = pd->radius_m * (0.5 * (s->encoder_rate_rad_s[0] + s->encoder_rate_rad_s[1]) + rate);
  pd->x_ref_m += pd->period_s * in->reference.forward_speed_m_s;
  tilt = pd->pitch_rad - pd->equilibrium_rad;
  /* Gain scheduling: tilt stiffness grows linearly with |tilt|, by tilt_schedule at 10°. */
  scale = 1 + pd->tilt_schedule * fmin(fabs(tilt) / (10 * kPi / 180), 1.0);
  u_sum = pd->k_x * (x - pd->x_ref_m) + pd->k_v * (v - in->reference.forward_speed_m_s) +
          scale * (pd->k_tilt * tilt + pd->k_rate * rate);
  u_diff = pd->k_yaw_rate * (in->reference.yaw_rate_rad_s - s->gyro_rad_s[2]);
  out->command[0] = 0.5 * (u_sum - u_diff);
  out->command[1] = 0.5 * (u_sum + u_diff);
  out->diagnostics[0] = pd->pitch_rad;
  out->diagnostics[1] = scale;
  return UPRIGHT_OK;
}

static void Destroy(void* instance) { free(instance); }

static const upright_controller_api kApi = {sizeof(upright_controller_api),
                                            UPRIGHT_CONTROLLER_ABI_VERSION,
                                            "gain-scheduled-pd",
                                            Create,
                                            Reset,
                                            Step,
                                            Destroy};

UPRIGHT_CONTROLLER_EXPORT const upright_controller_api* upright_controller_entry(void) {
  return &kApi;
}
