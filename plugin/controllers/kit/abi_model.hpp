// ABI model (internal to the built-in modules): the robot and linear-model structs a module
// receives through the C ABI in, the RobotModel and design::LinearModel the design functions
// (weights, LQR, H-infinity, Kalman, PID tuning) work on out.
#pragma once

#include "kit/module_context.hpp"
#include "upright/controller_abi.h"
#include "upright/design/linear_model.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::controllers {

// UPRIGHT_UNSUPPORTED naming the first field the designs cannot use: a non-finite number
// anywhere, a non-positive size, rate or motor constant, or a negative resolution.
Result<void, ModuleError> CheckAbiModel(const upright_robot& robot,
                                        const upright_linear_model& linear);

// The robot as the design functions read it. Fields the ABI does not carry stay at their
// defaults (zero): wheel width, diameter inertia and rolling resistance, motor friction, sensor
// biases, payload size and travel; none of the designs used here reads them. The IMU resolutions
// and the chassis outline come when the host's struct carries them (else zero: readings without
// quantisation, which only LineariseSensors would have used; an outline with front = rear, from
// which no default tilt can be drawn: HasOutline).
model::RobotModel RobotFromAbi(const upright_robot& robot, double control_rate_hz);

// The linear model for `input` (A_torque, B_torque or A_voltage, B_voltage), with E, the push
// height and the equilibrium pitch as given. The fall rate comes from A (θ̈ = λ² θ: λ =
// √A(θ̇, θ)); the lumped body's mass and COM from the chassis and the payload (its inertias
// stay zero: only the mass is used, by the filter's default noise).
design::LinearModel LinearFromAbi(const upright_linear_model& linear, const upright_robot& robot,
                                  design::InputKind input);

// Whether `robot` (from RobotFromAbi) carries a chassis outline (front_m > rear_m).
bool HasOutline(const model::RobotModel& robot);

// Chassis, both wheels and the payload, kg.
double TotalMass(const upright_robot& robot);

}  // namespace upright::controllers
