// RunMetrics: what one run of one controller in one scenario came to — its status and the figures
// the tables compare. Units are in the field names; NaN marks a figure that does not apply
// (a settling time when nothing disturbed the robot, or when it never settled).
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
  RunStatus status = RunStatus::kNotRun;
  std::string message = "not run";  // one line: why it fell or faulted, or "survived"
  double fall_time_s = std::numeric_limits<double>::quiet_NaN();  // NaN unless it fell
  double end_time_s = 0;                                          // simulated time reached
  double max_tilt_deg = 0;  // max |pitch − equilibrium pitch|
  double max_drift_m = 0;   // max horizontal distance from the commanded path
  // Worst over the disturbances: time from a disturbance's start until the signal stays within
  // its band of its final value for good (final = the mean of the window's last tenth). NaN
  // means "did not settle in the window" for any one disturbance, or no disturbance, or a run
  // that did not end kOk; a run that never settled never looks better than one that did.
  double tilt_settle_s = std::numeric_limits<double>::quiet_NaN();
  double drift_settle_s = std::numeric_limits<double>::quiet_NaN();
  // Worst over disturbances: the rebound past the final value, opposite to the first excursion
  // out of the tilt band, as a percentage of that excursion (0 when tilt never left the band).
  double tilt_overshoot_pct = std::numeric_limits<double>::quiet_NaN();
  double rms_tilt_deg = 0;     // over the whole run, about the equilibrium pitch
  double iae_tilt_deg_s = 0;   // ∫|tilt| dt
  double effort_Nm2s = 0;      // ∫(τ_L² + τ_R²) dt, wheel torques
  double peak_torque_Nm = 0;   // max |wheel torque| over both wheels
  double peak_current_A = 0;   // max |motor current| over both motors
  double saturation_frac = 0;  // fraction of steps with either motor voltage- or current-limited
  double max_slip_ratio = 0;   // max |slip ratio| over wheels touching the ground
  double slip_time_s = 0;      // time with either touching wheel's |slip ratio| over threshold
  double energy_J = 0;         // ∫ max(0, V·i) dt over both motors: electrical energy drawn
};

}  // namespace upright::runner
