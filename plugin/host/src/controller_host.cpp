#include "upright/host/controller_host.hpp"

#include <cmath>
#include <cstdio>
#include <cstring>
#include <limits>
#include <sstream>

#include "abi_fill.hpp"
#include "guarded_call.hpp"
#include "upright/model/check.hpp"

namespace upright::host {
namespace {

constexpr std::size_t kErrorSize = 512;

std::string Message(const char* buffer) {
  return buffer[0] ? std::string(buffer) : std::string("(no message)");
}

}  // namespace

Result<std::unique_ptr<ControllerHost>> ControllerHost::Create(const ControllerSpec& spec,
                                                               const model::RobotModel& model,
                                                               double dt_s) {
  if (!spec.module) return Failure("ControllerSpec::module is null");
  const std::string who = "controller '" + spec.module->name() + "' (" + spec.module->path() + ")";
  const double rate_hz = spec.rate_hz > 0 ? spec.rate_hz : model.control_rate_hz;
  const double steps = 1 / (rate_hz * dt_s);
  // At most 2^31 steps a period, so the count converts exactly (no run takes as many).
  if (!(spec.rate_hz >= 0) || !std::isfinite(spec.rate_hz) || !(steps >= 1) ||
      !(steps <= 2147483648.0) || std::abs(steps - std::round(steps)) > 1e-6 * steps) {
    std::ostringstream why;
    why << who << ": rate_hz = " << rate_hz << " must give a period of a whole number (>= 1) of "
        << "physics steps of " << dt_s << " s";
    return Failure(why.str());
  }
  std::unique_ptr<ControllerHost> host(new ControllerHost());
  host->module_ = spec.module;
  host->period_steps_ = std::lround(steps);
  host->dt_s_ = dt_s;
  host->true_state_ = spec.true_state;
  host->log_ = spec.log;
  host->log_time_s_ = std::numeric_limits<double>::quiet_NaN();  // create's messages

  const upright_robot robot = internal::RobotForModule(model);
  const upright_linear_model linear = internal::LinearForModule(model);
  std::vector<upright_config_entry> config;
  for (const auto& [key, value] : spec.config) config.push_back({key.c_str(), value.c_str()});
  upright_create_args args{};
  args.struct_size = sizeof args;
  args.abi_version = UPRIGHT_CONTROLLER_ABI_VERSION;
  args.robot = &robot;
  args.linear = &linear;
  args.rate_hz = rate_hz;
  args.true_state_available = spec.true_state ? 1 : 0;
  args.config = config.data();
  args.config_count = static_cast<uint32_t>(config.size());
  args.log = &ControllerHost::LogFromModule;
  args.log_host = host.get();
  upright_create_result result{};
  result.struct_size = sizeof result;
  // An out-of-range kind, so a module that declares none is caught below.
  std::memset(&result.command_kind, 0xff, sizeof result.command_kind);
  char message[kErrorSize] = "";
  const upright_controller_api& api = spec.module->api();
  const Result<int> status = internal::GuardedCall(
      [&] { return api.create(&args, &result, &host->instance_, message, kErrorSize); });
  if (!status) return Failure(who + ": create " + status.error());
  message[kErrorSize - 1] = '\0';
  if (*status != UPRIGHT_OK) {
    return Failure(who + ": create failed (status " + std::to_string(*status) +
                   "): " + Message(message));
  }
  if (result.command_kind == UPRIGHT_COMMAND_VOLTAGE) {
    host->drive_ = sim::DriveMode::kVoltage;
  } else if (result.command_kind == UPRIGHT_COMMAND_TORQUE) {
    host->drive_ = sim::DriveMode::kTorque;
  } else {
    return Failure(who + ": create declared no valid command kind (voltage or torque)");
  }
  if (result.diagnostic_count > UPRIGHT_MAX_DIAGNOSTICS) {
    return Failure(who + ": declared " + std::to_string(result.diagnostic_count) +
                   " diagnostics, at most " + std::to_string(UPRIGHT_MAX_DIAGNOSTICS));
  }
  for (uint32_t i = 0; i < result.diagnostic_count; ++i) {
    result.diagnostic_names[i][UPRIGHT_NAME_SIZE - 1] = '\0';
    host->diagnostic_names_.emplace_back(result.diagnostic_names[i]);
  }
  host->input_.struct_size = sizeof host->input_;
  host->input_.sensors.struct_size = sizeof host->input_.sensors;
  host->input_.reference.struct_size = sizeof host->input_.reference;
  host->truth_.struct_size = sizeof host->truth_;
  host->output_.struct_size = sizeof host->output_;
  return host;
}

ControllerHost::~ControllerHost() {
  if (instance_ && module_) {
    try {
      module_->api().destroy(instance_);
    } catch (...) {
      // A module that throws while being destroyed has nothing left to report to.
    }
  }
}

void ControllerHost::LogFromModule(void* host, upright_log_level level, const char* message) {
  const auto* self = static_cast<const ControllerHost*>(host);
  if (self && self->log_ && message) {
    self->log_(static_cast<int>(level), self->log_time_s_, std::string_view(message));
  }
}

std::string ControllerHost::Who() const { return "controller '" + module_->name() + "'"; }

void ControllerHost::Fail(double time_s, std::string message) {
  fault_ = std::move(message);
  fault_time_s_ = time_s;
}

bool ControllerHost::Tick(sim::Plant& plant, const Reference& reference) {
  if (faulted()) return false;
  if (plant.step_count() % period_steps_ != 0) return true;
  if (!Tick(plant.step_count(), plant.Sense(), true_state_ ? &plant.truth() : nullptr, reference)) {
    plant.SetCommand(0, 0);
    return false;
  }
  plant.SetCommand(output_.command[0], output_.command[1]);
  return true;
}

bool ControllerHost::Tick(long step, const sim::SensorSample& s, const sim::TrueState* truth,
                          const Reference& reference) {
  if (faulted()) return false;
  if (step % period_steps_ != 0) return true;
  UPRIGHT_CHECK(truth != nullptr || !true_state_, "%s reads the true state; none was given",
                Who().c_str());
  const double t = static_cast<double>(step) * dt_s_;
  upright_sensor_sample& in = input_.sensors;
  in.time_s = s.time_s;
  for (int i = 0; i < 3; ++i) {
    in.gyro_rad_s[i] = s.gyro_rad_s[i];
    in.accel_m_s2[i] = s.accel_m_s2[i];
  }
  for (int i = 0; i < 2; ++i) {
    in.encoder_angle_rad[i] = s.encoder_angle_rad[i];
    in.encoder_rate_rad_s[i] = s.encoder_rate_rad_s[i];
  }
  input_.reference.forward_speed_m_s = reference.forward_speed_m_s;
  input_.reference.yaw_rate_rad_s = reference.yaw_rate_rad_s;
  input_.truth = nullptr;
  if (true_state_) {
    const sim::TrueState& x = *truth;
    truth_.x_m = x.x_m;
    truth_.y_m = x.y_m;
    truth_.pitch_rad = x.pitch_rad;
    truth_.roll_rad = x.roll_rad;
    truth_.yaw_rad = x.yaw_rad;
    truth_.pitch_rate_rad_s = x.pitch_rate_rad_s;
    truth_.roll_rate_rad_s = x.roll_rate_rad_s;
    truth_.yaw_rate_rad_s = x.yaw_rate_rad_s;
    truth_.forward_speed_m_s = x.forward_speed_m_s;
    for (int i = 0; i < 2; ++i) {
      truth_.wheel_angle_rad[i] = x.wheel_angle_rad[i];
      truth_.wheel_rate_rad_s[i] = x.wheel_rate_rad_s[i];
    }
    input_.truth = &truth_;
  }
  // Outputs start as NaN: whatever the module leaves unwritten is caught below.
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  output_.command[0] = output_.command[1] = kNaN;
  for (double& d : output_.diagnostics) d = kNaN;
  log_time_s_ = t;
  char message[kErrorSize] = "";
  const Result<int> status = internal::GuardedCall(
      [&] { return module_->api().step(instance_, &input_, &output_, message, kErrorSize); });
  message[kErrorSize - 1] = '\0';
  if (!status) {
    Fail(t, Who() + " " + status.error());
  } else if (*status != UPRIGHT_OK) {
    Fail(t, Who() + " step failed (status " + std::to_string(*status) + "): " + Message(message));
  } else {
    for (int i = 0; i < 2 && !faulted(); ++i) {
      if (!std::isfinite(output_.command[i])) {
        Fail(t, Who() + " returned a non-finite " + (i == 0 ? "left" : "right") + " command (" +
                    (std::isnan(output_.command[i]) ? "NaN: left unwritten?" : "infinite") + ")");
      }
    }
    for (size_t i = 0; i < diagnostic_names_.size() && !faulted(); ++i) {
      if (!std::isfinite(output_.diagnostics[i])) {
        Fail(t, Who() + " left diagnostic '" + diagnostic_names_[i] + "' non-finite");
      }
    }
  }
  return !faulted();
}

Status ControllerHost::Reset() {
  log_time_s_ = std::numeric_limits<double>::quiet_NaN();  // back before the first tick
  char message[kErrorSize] = "";
  const Result<int> status =
      internal::GuardedCall([&] { return module_->api().reset(instance_, message, kErrorSize); });
  if (!status) return Failure(Who() + " reset " + status.error());
  message[kErrorSize - 1] = '\0';
  if (*status != UPRIGHT_OK) return Failure(Who() + " reset failed: " + Message(message));
  fault_.clear();
  fault_time_s_ = 0;
  return {};
}

}  // namespace upright::host
