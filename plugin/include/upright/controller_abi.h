/* upright controller module ABI, version 1.
 *
 * What flows through it: once, at create, the robot's parameters, its linear model and the
 * module's own key/value configuration go in; then, every control tick, the sensor sample (and,
 * when the scenario allows, the true state) and the reference go in, and two wheel commands plus
 * optional named diagnostics come out.
 *
 * C99, depends on nothing but the C standard library. Every struct starts with
 * `uint32_t struct_size` (set to sizeof by whoever fills it) so fields can be added at the end in
 * later versions without breaking modules built against this one. No exception, no C++ type and
 * no ownership crosses this boundary: status codes and caller-provided buffers only.
 *
 * Units are SI; frames and signs are those of upright: x forward, y left, z up; pitch positive
 * leaning forward; a positive wheel command drives that wheel forward (and pitches the chassis
 * back). Arrays of two are [left, right].
 */
#ifndef UPRIGHT_CONTROLLER_ABI_H_
#define UPRIGHT_CONTROLLER_ABI_H_

#include <stddef.h>
#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

#define UPRIGHT_CONTROLLER_ABI_VERSION 1u

/* The one symbol a module exports. */
#define UPRIGHT_CONTROLLER_ENTRY_SYMBOL "upright_controller_entry"

#if defined(_WIN32)
#define UPRIGHT_CONTROLLER_EXPORT __declspec(dllexport)
#else
#define UPRIGHT_CONTROLLER_EXPORT __attribute__((visibility("default")))
#endif

/* Status codes returned by a module's functions. */
#define UPRIGHT_OK 0
#define UPRIGHT_ERROR 1             /* anything else went wrong; the message says what */
#define UPRIGHT_BAD_CONFIG 2        /* create: an unknown key or a bad value */
#define UPRIGHT_UNSUPPORTED 3       /* create: the robot or the inputs offered do not suit it */

/* Sizes of the fixed arrays below. */
#define UPRIGHT_STATES 6            /* x_m, xdot_m_s, pitch_rad, pitchrate_rad_s, yaw_rad, yawrate_rad_s */
#define UPRIGHT_INPUTS 2            /* left, right */
#define UPRIGHT_DISTURBANCES 2      /* push_N (at push_height_m), pitch_torque_Nm */
#define UPRIGHT_MAX_DIAGNOSTICS 16  /* named values a module may report each tick */
#define UPRIGHT_NAME_SIZE 32        /* diagnostic names, NUL-terminated */

/* Which command the module returns: motor terminal voltages (V) or wheel torques (N·m). */
typedef enum upright_command_kind {
  UPRIGHT_COMMAND_VOLTAGE = 0,
  UPRIGHT_COMMAND_TORQUE = 1
} upright_command_kind;

/* Log levels of the host-supplied log callback. */
typedef enum upright_log_level {
  UPRIGHT_LOG_DEBUG = 0,
  UPRIGHT_LOG_INFO = 1,
  UPRIGHT_LOG_WARNING = 2,
  UPRIGHT_LOG_ERROR = 3
} upright_log_level;

typedef void (*upright_log_fn)(void* host, upright_log_level level, const char* message);

/* The robot, in SI units, as the model file gives it (see models/README.md). */
typedef struct upright_robot {
  uint32_t struct_size;
  double chassis_mass_kg;
  double chassis_pitch_inertia_kgm2, chassis_roll_inertia_kgm2, chassis_yaw_inertia_kgm2;
  double com_height_m, com_forward_m;
  double wheel_radius_m, wheel_mass_kg, wheel_spin_inertia_kgm2, track_m, tyre_friction;
  double motor_torque_constant_Nm_per_A, motor_back_emf_V_s_per_rad, motor_resistance_ohm;
  double gear_ratio, gear_efficiency, supply_V, current_limit_A;
  double imu_rate_hz, imu_x_m, imu_y_m, imu_z_m;
  double gyro_noise_rad_s_rthz, accel_noise_m_s2_rthz;
  double encoder_counts_per_rev;
  double latency_s;
  double payload_mass_kg; /* 0 when the robot has none */
  double payload_z_m;
  /* Added later in version 1: read them only when struct_size reaches past them
   * (offsetof + sizeof). Quantisation steps of the IMU's readings, 0 for none. */
  double gyro_resolution_rad_s, accel_resolution_m_s2;
  /* Added later in version 1, read likewise: the chassis outline, the box in the body frame
   * relative to the axle midpoint whose touching the ground is a fall (front > rear, top >
   * bottom); the tilt at which it meets the ground follows from it and the wheel radius. */
  double outline_front_m, outline_rear_m, outline_bottom_m, outline_top_m, outline_width_m;
} upright_robot;

/* The robot linearised about upright at rest (row-major): x' = A x + B u + E w, with u the wheel
 * inputs of the declared command kind's choosing: B_torque for torques, B_voltage for voltages
 * (whose A_voltage includes the back-EMF damping). */
typedef struct upright_linear_model {
  uint32_t struct_size;
  double A_torque[UPRIGHT_STATES * UPRIGHT_STATES];
  double B_torque[UPRIGHT_STATES * UPRIGHT_INPUTS];
  double A_voltage[UPRIGHT_STATES * UPRIGHT_STATES];
  double B_voltage[UPRIGHT_STATES * UPRIGHT_INPUTS];
  double E[UPRIGHT_STATES * UPRIGHT_DISTURBANCES];
  double push_height_m;
  double equilibrium_pitch_rad; /* the pitch state is measured from this */
} upright_linear_model;

/* One configuration entry from the scenario file, as text. Like everything create receives, it
 * is valid only during the call: a module copies what it keeps. */
typedef struct upright_config_entry {
  const char* key;
  const char* value;
} upright_config_entry;

typedef struct upright_create_args {
  uint32_t struct_size;
  uint32_t abi_version;              /* the host's UPRIGHT_CONTROLLER_ABI_VERSION */
  const upright_robot* robot;
  const upright_linear_model* linear;
  double rate_hz;                    /* the module's step rate */
  int true_state_available;          /* nonzero: each tick's input carries the true state */
  const upright_config_entry* config;
  uint32_t config_count;
  upright_log_fn log;                /* may be called from create, reset and step; may be NULL */
  void* log_host;                    /* pass back as the callback's first argument */
} upright_create_args;

/* What the module declares at create. */
typedef struct upright_create_result {
  uint32_t struct_size;
  upright_command_kind command_kind;
  uint32_t diagnostic_count;                                   /* ≤ UPRIGHT_MAX_DIAGNOSTICS */
  char diagnostic_names[UPRIGHT_MAX_DIAGNOSTICS][UPRIGHT_NAME_SIZE];
} upright_create_result;

typedef struct upright_sensor_sample {
  uint32_t struct_size;
  double time_s;                    /* when the controller reads it */
  double gyro_rad_s[3];             /* body-frame angular rate */
  double accel_m_s2[3];             /* body-frame specific force (+9.81 on z at rest) */
  double encoder_angle_rad[2];      /* wheel angle relative to the chassis, whole counts */
  double encoder_rate_rad_s[2];     /* count difference over one control period */
} upright_sensor_sample;

typedef struct upright_true_state {
  uint32_t struct_size;
  double x_m, y_m;                  /* axle midpoint */
  double pitch_rad, roll_rad, yaw_rad;
  double pitch_rate_rad_s, roll_rate_rad_s, yaw_rate_rad_s;
  double forward_speed_m_s;
  double wheel_angle_rad[2], wheel_rate_rad_s[2];  /* relative to the chassis */
} upright_true_state;

typedef struct upright_reference {
  uint32_t struct_size;
  double forward_speed_m_s;
  double yaw_rate_rad_s;            /* positive turns left */
} upright_reference;

typedef struct upright_step_input {
  uint32_t struct_size;
  upright_sensor_sample sensors;
  upright_reference reference;
  const upright_true_state* truth;  /* NULL unless true_state_available */
} upright_step_input;

/* The host fills every double with NaN before each step; a value left NaN (or made non-finite)
 * is a controller fault. */
typedef struct upright_step_output {
  uint32_t struct_size;
  double command[2];                              /* V or N·m, per the declared kind */
  double diagnostics[UPRIGHT_MAX_DIAGNOSTICS];    /* the first diagnostic_count are recorded */
} upright_step_output;

/* The function table a module returns. `error` buffers hold error_size bytes; on a non-OK
 * status the module writes a NUL-terminated message there. */
typedef struct upright_controller_api {
  uint32_t struct_size;
  uint32_t abi_version;             /* UPRIGHT_CONTROLLER_ABI_VERSION the module was built with */
  const char* name;                 /* short name, e.g. "gain-scheduled-pd" */
  int (*create)(const upright_create_args* args, upright_create_result* result, void** instance,
                char* error, size_t error_size);
  /* Back to the state just after create (a new run on the same robot). */
  int (*reset)(void* instance, char* error, size_t error_size);
  int (*step)(void* instance, const upright_step_input* input, upright_step_output* output,
              char* error, size_t error_size);
  void (*destroy)(void* instance);
} upright_controller_api;

/* The entry symbol: returns the module's table (static storage; never NULL). */
typedef const upright_controller_api* (*upright_controller_entry_fn)(void);

#ifdef __cplusplus
}
#endif

#endif /* UPRIGHT_CONTROLLER_ABI_H_ */
