#include "kit/config.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <numbers>
#include <utility>

#include "kit/abi_model.hpp"
#include "upright/design/robot_limits.hpp"
#include "upright/model/conventions.hpp"

namespace upright::controllers {
namespace {

std::string Trimmed(const std::string& text) {
  const auto first =
      std::find_if_not(text.begin(), text.end(), [](unsigned char c) { return std::isspace(c); });
  const auto last =
      std::find_if_not(text.rbegin(), text.rend(), [](unsigned char c) { return std::isspace(c); });
  return first < last.base() ? std::string(first, last.base()) : std::string();
}

const char* RuleText(NumberRule rule) {
  switch (rule) {
    case NumberRule::kPositive:
      return "must be > 0";
    case NumberRule::kAboveOne:
      return "must be > 1";
    case NumberRule::kFraction:
      return "must be in (0, 1]";
  }
  return "is out of range";
}

bool Keeps(NumberRule rule, double v) {
  switch (rule) {
    case NumberRule::kPositive:
      return v > 0;
    case NumberRule::kAboveOne:
      return v > 1;
    case NumberRule::kFraction:
      return v > 0 && v <= 1;
  }
  return false;
}

std::string Joined(const std::vector<std::string>& words, const char* separator) {
  std::string out;
  for (const auto& w : words) out += (out.empty() ? "" : separator) + w;
  return out;
}

}  // namespace

ConfigReader::ConfigReader(const ConfigEntries& entries) : entries_(entries) {
  for (std::size_t i = 0; i < entries_.size(); ++i) {
    for (std::size_t j = 0; j < i; ++j) {
      if (entries_[i].first == entries_[j].first) {
        Refuse(entries_[i].first + " = " + entries_[i].second + ": given twice (first as " +
               entries_[j].second + ")");
      }
    }
  }
}

bool ConfigReader::Has(const std::string& key) const {
  return std::any_of(entries_.begin(), entries_.end(),
                     [&](const auto& entry) { return entry.first == key; });
}

const std::string* ConfigReader::Find(const std::string& key) {
  if (std::find(known_.begin(), known_.end(), key) == known_.end()) known_.push_back(key);
  for (const auto& [k, v] : entries_) {
    if (k == key) return &v;
  }
  return nullptr;
}

void ConfigReader::Number(const std::string& key, NumberRule rule, double* value) {
  const std::string* text = Find(key);
  if (!text) return;
  const std::string t = Trimmed(*text);
  double v = 0;
  const auto [end, ec] = std::from_chars(t.data(), t.data() + t.size(), v);
  if (t.empty() || ec != std::errc() || end != t.data() + t.size() || !std::isfinite(v)) {
    Refuse(key + " = " + *text + ": must be a finite decimal number");
  } else if (!Keeps(rule, v)) {
    Refuse(key + " = " + *text + ": " + RuleText(rule));
  } else {
    *value = v;
  }
}

void ConfigReader::Choice(const std::string& key, const std::vector<std::string>& choices,
                          int* index) {
  const std::string* text = Find(key);
  if (!text) return;
  const std::string t = Trimmed(*text);
  const auto it = std::find(choices.begin(), choices.end(), t);
  if (it == choices.end()) {
    Refuse(key + " = " + *text + ": must be one of " + Joined(choices, ", "));
    return;
  }
  *index = static_cast<int>(it - choices.begin());
}

void ConfigReader::Refuse(std::string message) {
  if (problem_.empty()) problem_ = std::move(message);
}

Result<void, ModuleError> ConfigReader::Finish() const {
  if (!problem_.empty()) return Failure(ModuleError{UPRIGHT_BAD_CONFIG, problem_});
  for (const auto& [key, value] : entries_) {
    if (std::find(known_.begin(), known_.end(), key) == known_.end()) {
      return Failure(ModuleError{UPRIGHT_BAD_CONFIG, "unknown key " + key + " (= " + value +
                                                         "); known keys: " + Joined(known_, ", ")});
    }
  }
  return {};
}

CommonConfig ReadCommonConfig(ConfigReader* reader, const ModuleContext& context,
                              bool voltage_allowed) {
  CommonConfig c;
  int state = 0;
  reader->Choice("state", {"estimated", "true"}, &state);
  c.state = state == 1 ? StateChoice::kTrue : StateChoice::kEstimated;
  if (c.state == StateChoice::kTrue && !context.true_state_available) {
    reader->Refuse(
        "state = true: the host offers no true state (allow it in the scenario, or use "
        "state = estimated)");
  }
  int input = 0;
  reader->Choice("input", {"torque", "voltage"}, &input);
  c.input = input == 1 ? design::InputKind::kVoltage : design::InputKind::kTorque;
  if (c.input == design::InputKind::kVoltage && !voltage_allowed) {
    reader->Refuse("input = voltage: this controller commands torque only");
  }
  design::DesignWeights& w = c.weights;
  reader->Number("max_drift_m", NumberRule::kPositive, &w.max_drift_m);
  reader->Number("max_speed_m_s", NumberRule::kPositive, &w.max_speed_m_s);
  reader->Number("max_tilt_deg", NumberRule::kPositive, &w.max_tilt_deg);
  reader->Number("max_tilt_rate_deg_s", NumberRule::kPositive, &w.max_tilt_rate_deg_s);
  reader->Number("max_yaw_deg", NumberRule::kPositive, &w.max_yaw_deg);
  reader->Number("max_yaw_rate_deg_s", NumberRule::kPositive, &w.max_yaw_rate_deg_s);
  reader->Number("max_input_fraction", NumberRule::kFraction, &w.max_input_fraction);
  if (w.max_tilt_deg == 0 && !HasOutline(context.robot)) {
    reader->Refuse(
        "max_tilt_deg: the host's robot carries no chassis outline to take the default from (a "
        "host older than the outline fields); give max_tilt_deg");
  } else if (Result<design::DesignWeights> resolved = design::WeightsForRobot(
                 w, context.robot, context.linear_abi.equilibrium_pitch_rad);
             resolved) {
    w = *resolved;
  } else {
    reader->Refuse(resolved.error());
  }
  reader->Number("tilt_filter_s", NumberRule::kPositive, &c.tilt_filter_s);
  reader->Number("bias_filter_s", NumberRule::kPositive, &c.bias_filter_s);
  c.max_accel_m_s2 = model::kStandardGravity_m_s2 *
                     std::tan(std::min(w.max_tilt_deg, 45.0) * std::numbers::pi / 180);
  reader->Number("max_accel_m_s2", NumberRule::kPositive, &c.max_accel_m_s2);
  return c;
}

}  // namespace upright::controllers
