// RunMetrics: what one run of one controller in one scenario came to — its status and the figures
// the tables compare. Units are in the field names; NaN marks a figure that does not apply
// (a settling time when nothing disturbed the robot, or when it never settled; every figure of a
// run that never stepped).
#pragma once

#include <limits>
#include <string>

namespace upright::runner {

enum class RunStatus {
  kNotRun,           // not run yet (every result starts here)
  kOk,               // survived to the end
  kFell,             // tilt beyond the fall limit or the chassis on the ground
  kControllerFault,  // the module failed (error status, unwritten or non-finite output)
  kNumericFailure,   // the physics state became non-finite
  kSetupFailed,      // the world or the controller could not be built
};

const char* ToString(RunStatus status);  // "not_run", "ok", "fell", ...
bool FromString(const std::string& text, RunStatus* status);

struct RunMetrics {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  RunStatus status = RunStatus::kNotRun;
  std::string message = "not run";  // one line: why it fell or faulted, or "survived"
  // Every figure starts NaN and stays NaN for a run that never took a physics step (not run, set
  // up failed, a controller fault on the first tick): no figure of a run that did not happen can
  // pass for a flawless one.
  double fall_time_s = kNaN;   // NaN unless it fell
  double end_time_s = kNaN;    // simulated time reached
  double max_tilt_deg = kNaN;  // max |pitch − equilibrium pitch|
  double max_drift_m = kNaN;   // max horizontal distance from the commanded path
  // Worst over the disturbances: time from a disturbance's start until the signal stays within
  // its band of its final value for good (final = the mean of the window's last tenth). NaN
  // means "did not settle in the window" for any one disturbance, or no disturbance, or a run
  // that did not end kOk; a run that never settled never looks better than one that did.
  double tilt_settle_s = kNaN;
  double drift_settle_s = kNaN;
  // Worst over the disturbances: after the peak excursion P = max |tilt − final|, the largest
  // excursion R past the final value on the other side; in degrees, and as 100 R / P (≤ 100).
  // 0 for a disturbance whose tilt never left the tilt band; NaN as for the settling times.
  double tilt_rebound_deg = kNaN;
  double tilt_rebound_pct = kNaN;
  double rms_tilt_deg = kNaN;    // over the whole run, about the equilibrium pitch
  double iae_tilt_deg_s = kNaN;  // ∫|tilt| dt
  double effort_Nm2s = kNaN;     // ∫(τ_L² + τ_R²) dt, wheel torques
  double peak_torque_Nm = kNaN;  // max |wheel torque| over both wheels
  double peak_current_A = kNaN;  // max |motor current| over both motors
  // Percentage of physics steps with either motor at its voltage or current limit (0–100).
  double saturation_pct = kNaN;
  // Percentage of physics steps with either wheel's command at or beyond the drive's limit of
  // its kind: the supply voltage, or the stall torque at the wheel (0–100).
  double command_limit_pct = kNaN;
  double max_slip_ratio = kNaN;  // max |slip ratio| over wheels touching the ground
  double slip_time_s = kNaN;     // time with either touching wheel's |slip ratio| over threshold
  double energy_J = kNaN;        // ∫ max(0, V·i) dt over both motors: electrical energy drawn
};

}  // namespace upright::runner
