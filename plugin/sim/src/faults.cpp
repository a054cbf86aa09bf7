#include "upright/sim/faults.hpp"

#include <cmath>
#include <cstddef>
#include <limits>
#include <sstream>

namespace upright::sim {
namespace {

constexpr const char* kSideNames[] = {"left", "right", "both"};
constexpr const char* kChannelNames[] = {"gyro_x",  "gyro_y",  "gyro_z",       "accel_x",
                                         "accel_y", "accel_z", "encoder_left", "encoder_right"};
constexpr const char* kKindNames[] = {"bias", "dropout", "stuck"};

template <typename Enum, size_t N>
const char* Name(Enum value, const char* const (&names)[N]) {
  const auto i = static_cast<size_t>(value);
  return i < N ? names[i] : "?";
}

template <typename Enum, size_t N>
bool Parse(const std::string& text, const char* const (&names)[N], Enum* out) {
  for (size_t i = 0; i < N; ++i) {
    if (text == names[i]) {
      *out = static_cast<Enum>(i);
      return true;
    }
  }
  return false;
}

}  // namespace

long FirstStepAtOrAfter(double t_s, double dt_s) {
  const double k = std::ceil(t_s / dt_s - 1e-9);
  if (!(k > 0)) return 0;
  // 2^62 steps: far beyond any run, and exactly representable, so the cast below is defined.
  constexpr double kNever = 4611686018427387904.0;
  if (k >= kNever) return std::numeric_limits<long>::max();
  return static_cast<long>(k);
}

Status MotorFault::Validate() const {
  std::ostringstream why;
  if (!std::isfinite(start_s) || start_s < 0) {
    why << "MotorFault::start_s = " << start_s << ", must be finite and >= 0";
  } else if (static_cast<size_t>(side) > static_cast<size_t>(MotorSide::kBoth)) {
    why << "MotorFault::side = " << static_cast<int>(side) << ", must be left, right or both";
  } else if (!(torque_scale >= 0 && torque_scale <= 1)) {
    why << "MotorFault::torque_scale = " << torque_scale << ", must be in [0, 1]";
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

Status SensorFault::Validate() const {
  std::ostringstream why;
  if (!std::isfinite(start_s) || start_s < 0) {
    why << "SensorFault::start_s = " << start_s << ", must be finite and >= 0";
  } else if (!(duration_s > 0)) {
    why << "SensorFault::duration_s = " << duration_s << ", must be > 0 (inf: to the end)";
  } else if (static_cast<size_t>(channel) > static_cast<size_t>(SensorChannel::kEncoderRight)) {
    why << "SensorFault::channel = " << static_cast<int>(channel) << ", not a sensor channel";
  } else if (static_cast<size_t>(kind) > static_cast<size_t>(SensorFaultKind::kStuck)) {
    why << "SensorFault::kind = " << static_cast<int>(kind) << ", must be bias, dropout or stuck";
  } else if (kind == SensorFaultKind::kBias && !std::isfinite(value)) {
    why << "SensorFault::value = " << value << ", must be finite for a bias";
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

const char* ToString(MotorSide side) { return Name(side, kSideNames); }
const char* ToString(SensorChannel channel) { return Name(channel, kChannelNames); }
const char* ToString(SensorFaultKind kind) { return Name(kind, kKindNames); }

bool FromString(const std::string& text, MotorSide* side) { return Parse(text, kSideNames, side); }

bool FromString(const std::string& text, SensorChannel* channel) {
  return Parse(text, kChannelNames, channel);
}

bool FromString(const std::string& text, SensorFaultKind* kind) {
  return Parse(text, kKindNames, kind);
}

}  // namespace upright::sim
