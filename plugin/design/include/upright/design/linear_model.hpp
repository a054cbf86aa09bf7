// LinearModel: a robot model linearised about upright, standing still — the matrices every
// synthesis and analysis works on. States, inputs and disturbances, and every sign, as below.
#pragma once

#include <Eigen/Dense>

#include <array>

#include "upright/model/robot_model.hpp"

namespace upright::design {

// States x = [x_m, ẋ_m_s, θ_rad, θ̇_rad_s, ψ_rad, ψ̇_rad_s]: axle-midpoint position along the
// heading, pitch (+ leaning forward), yaw (+ turning left), and their rates (conventions.hpp).
inline constexpr int kStates = 6;
enum StateIndex { kX = 0, kXDot, kPitch, kPitchRate, kYaw, kYawRate };
// Inputs u = [left, right] wheel: torque in N·m (+ drives forward) or motor terminal voltage in V.
inline constexpr int kInputs = 2;
// Disturbances w = [push_N, pitch_torque_Nm]: a horizontal force along +x on the chassis at
// LinearModel::push_height_m above the axle, and a torque on the chassis about +y.
inline constexpr int kDisturbances = 2;

enum class InputKind { kTorque, kVoltage };

using StateMatrix = Eigen::Matrix<double, kStates, kStates>;
using InputMatrix = Eigen::Matrix<double, kStates, kInputs>;
using DisturbanceMatrix = Eigen::Matrix<double, kStates, kDisturbances>;
using StateVector = Eigen::Matrix<double, kStates, 1>;

// The rigid body the linearisation sees: chassis and payload (at its home position) lumped.
struct LumpedBody {
  double mass_kg = 0;
  double com_height_m = 0;        // above the axle
  double com_forward_m = 0;       // ahead of the axle
  double pitch_inertia_kgm2 = 0;  // about its own COM
  double roll_inertia_kgm2 = 0;
  double yaw_inertia_kgm2 = 0;
};

struct LinearModel {
  InputKind input = InputKind::kTorque;
  StateMatrix A;
  InputMatrix B;
  DisturbanceMatrix E;
  double push_height_m = 0;  // where E's push acts, above the axle
  LumpedBody body;
  // Pitch at which the lumped COM stands over the axle (0 when it has no forward offset). The
  // model is linearised about it: its pitch state is θ − equilibrium_pitch_rad.
  double equilibrium_pitch_rad = 0;
  double fall_rate_1_s = 0;  // the unstable open-loop pole √(M_x m_b g l / Δ)
};

LumpedBody LumpBody(const model::RobotModel& model);

// Linearises `model` about upright at rest. push_height_m < 0 means "at the lumped COM height".
LinearModel Linearise(const model::RobotModel& model, InputKind input, double push_height_m = -1);

// The nonlinear equations the linearisation comes from, for cross-checks: ẋ = f(x, u, w) with
// wheel torques u and the pitch state measured from vertical. Planar wheeled inverted pendulum
// with rolling wheels, exact; yaw with a constant yaw inertia (the yaw–pitch coupling terms are
// products of rates, which vanish in the linearisation, and are left out).
StateVector NonlinearDerivative(const model::RobotModel& model, const StateVector& x,
                                const Eigen::Vector2d& torque_Nm, const Eigen::Vector2d& w,
                                double push_height_m);

const char* StateName(int index);  // "x_m", "xdot_m_s", "pitch_rad", ...

}  // namespace upright::design
