// ControllerHost: runs one controller module instance against one plant — at the controller's
// own rate, zero-order hold between ticks, sensor samples (and the true state when allowed) in,
// wheel commands out — and turns anything a module does wrong into a recorded fault.
#pragma once

#include <array>
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/host/module.hpp"
#include "upright/model/robot_model.hpp"
#include "upright/sim/motor.hpp"
#include "upright/sim/plant.hpp"

namespace upright::host {

struct ControllerSpec {
  std::shared_ptr<Module> module;
  std::vector<std::pair<std::string, std::string>> config;  // key/value from the scenario
  double rate_hz = 0;        // 0: the robot's control rate
  bool true_state = false;   // hand the module the true state each tick
  // Receives the module's log messages: level as the module passed it (upright_log_level), the
  // simulated time of the tick being stepped (NaN before the first: create, reset), the text
  // (valid only during the call). Called on the module's thread; empty drops them.
  std::function<void(int level, double time_s, std::string_view message)> log;
};

// What the module is asked to follow.
struct Reference {
  double forward_speed_m_s = 0;
  double yaw_rate_rad_s = 0;
};

class ControllerHost {
 public:
  // Creates the module instance for `model` (its parameters and linear model go in). `dt_s` is
  // the plant's physics step; the controller period must be a whole number of them. A failure
  // naming the module when the spec is invalid or the module refuses.
  static Result<std::unique_ptr<ControllerHost>> Create(const ControllerSpec& spec,
                                                        const model::RobotModel& model,
                                                        double dt_s);
  ~ControllerHost();
  ControllerHost(const ControllerHost&) = delete;
  ControllerHost& operator=(const ControllerHost&) = delete;

  // The drive mode the plant must use for this module's commands.
  sim::DriveMode drive() const { return drive_; }
  // Call before every physics step. On a control tick it reads the plant's sensors, steps the
  // module and sets the plant's command, held until the next tick. False once the module has
  // faulted (the plant's command is then left at zero); fault() says why.
  bool Tick(sim::Plant& plant, const Reference& reference);
  // The same without a plant, for any simulation of the robot: call before every physics step
  // `step` (0, 1, ...) with what the sensors read then and, when the module reads it, the true
  // state (may be null otherwise). On a control tick it steps the module; the caller applies
  // command() until the next tick. False once the module has faulted (hold zero then).
  bool Tick(long step, const sim::SensorSample& sensed, const sim::TrueState* truth,
            const Reference& reference);
  // Back to the state just after creation, for a new run; a failure naming the module when it
  // refuses.
  Status Reset();

  bool faulted() const { return !fault_.empty(); }
  const std::string& fault() const { return fault_; }
  double fault_time_s() const { return fault_time_s_; }
  long period_steps() const { return period_steps_; }
  const std::vector<std::string>& diagnostic_names() const { return diagnostic_names_; }
  // The latest tick's diagnostics (as many as diagnostic_names) and commands.
  const double* diagnostics() const { return output_.diagnostics; }
  std::array<double, 2> command() const { return {output_.command[0], output_.command[1]}; }

 private:
  ControllerHost() = default;
  void Fail(double time_s, std::string message);
  std::string Who() const;  // "controller 'name'", for messages

  static void LogFromModule(void* host, upright_log_level level, const char* message);

  std::shared_ptr<Module> module_;
  std::function<void(int, double, std::string_view)> log_;
  double log_time_s_ = 0;  // the time handed with a log message (NaN before the first tick)
  void* instance_ = nullptr;
  sim::DriveMode drive_ = sim::DriveMode::kVoltage;
  long period_steps_ = 1;
  double dt_s_ = 0;  // the physics step, for the time of a fault
  bool true_state_ = false;
  std::vector<std::string> diagnostic_names_;
  upright_step_input input_{};
  upright_true_state truth_{};
  upright_step_output output_{};
  std::string fault_;
  double fault_time_s_ = 0;
};

}  // namespace upright::host
