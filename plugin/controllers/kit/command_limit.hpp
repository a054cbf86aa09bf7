// Command limiting (internal to the built-in modules): the wheel commands a law wants and each
// wheel's speed in; the commands the drive can carry out at that speed out, balance first.
#pragma once

#include <Eigen/Dense>

#include "upright/design/linear_model.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::controllers {

// The commands one wheel's drive can carry out, lo ≤ hi.
struct CommandRange {
  double lo = 0, hi = 0;
};

// The drive's limits at the wheel's present speed ω relative to the chassis, with the motor's
// back-EMF e = K_e n ω, supply V_s, resistance R and current limit I:
//   torque commands: n η K_t i, i from clamp((−V_s − e) / R, −I, I) to clamp((V_s − e) / R, −I, I)
//     — the current limit, or the supply's headroom V_s − e over the back-EMF where it is smaller;
//   voltage commands: clamp(e − R I, −V_s, V_s) to clamp(e + R I, −V_s, V_s) — the supply, or
//     the voltage the drive lowers the terminals to so as to hold the current limit.
// The motor equations are those of the plant's drive (sim/motor.hpp), friction left out.
class DriveLimits {
 public:
  DriveLimits(const model::MotorModel& motor, design::InputKind input);
  CommandRange At(double wheel_speed_rad_s) const;

 private:
  model::MotorModel motor_;
  design::InputKind input_;
};

// The commands as limited, and which way each part was cut: −1 raised to its low end, +1 lowered
// to its high end, 0 as wanted.
struct LimitedCommand {
  Eigen::Vector2d command = Eigen::Vector2d::Zero();  // [left, right]
  int common_cut = 0;                                 // the common mode c = (u_L + u_R) / 2
  int differential_cut = 0;  // the differential d = (u_R − u_L) / 2 (positive turns left)
};

// Balance before heading: the common mode c is clamped first, to what the two wheels can carry
// together ((lo_L + lo_R) / 2 to (hi_L + hi_R) / 2), and the differential d is then clamped to what
// is left at that c (max(c − hi_L, lo_R − c) to min(c − lo_L, hi_R − c), never empty). Where both
// wheels can carry c alone the range holds 0, and clamping d scales it down toward 0 (its sign
// kept): heading gives way and the torque that holds the robot up is kept. A per-wheel clamp would
// instead cut the common mode whenever a turn pushed one wheel past its limit.
LimitedCommand LimitWithPitchPriority(const Eigen::Vector2d& wanted, const CommandRange& left,
                                      const CommandRange& right);

}  // namespace upright::controllers
