// Module configuration (internal to the built-in modules): the scenario's key/value text in,
// typed settings out. An unknown key, a repeated key or a bad value is UPRIGHT_BAD_CONFIG with a
// message naming the key, the value and the rule ("max_tilt_deg = -1: must be > 0").
#pragma once

#include <string>
#include <vector>

#include "kit/module_context.hpp"
#include "upright/design/linear_model.hpp"
#include "upright/design/weights.hpp"

namespace upright::controllers {

// The rule a number must keep.
enum class NumberRule {
  kPositive,  // > 0
  kAboveOne,  // > 1
  kFraction,  // in (0, 1]
};

// Reads a module's entries by key (`entries` must outlive the reader). Each read marks its key as
// known. Reading goes on after a problem, so reads need no checks of their own: the first problem
// (a repeated key, a bad value, a rule the module refuses) is kept, and Finish() reports it, or
// else any entry no read asked for. Values a read could not take are left as they were.
class ConfigReader {
 public:
  explicit ConfigReader(const ConfigEntries& entries);  // notes a repeated key
  bool Has(const std::string& key) const;
  // Sets *value from `key` when present: a finite decimal number keeping `rule`.
  void Number(const std::string& key, NumberRule rule, double* value);
  // Sets *index to the position of `key`'s value in `choices` when present.
  void Choice(const std::string& key, const std::vector<std::string>& choices, int* index);
  // Notes a rule across keys that the configuration breaks ("gamma and gamma_factor: ...").
  void Refuse(std::string message);
  // UPRIGHT_BAD_CONFIG with the first problem noted, else with the first entry none of the reads
  // asked for (listing the known keys); success otherwise.
  Result<void, ModuleError> Finish() const;

 private:
  const std::string* Find(const std::string& key);
  const ConfigEntries& entries_;
  std::vector<std::string> known_;
  std::string problem_;  // the first problem noted; empty while there is none
};

// Where a state-feedback module takes the robot's state from.
enum class StateChoice {
  kEstimated,  // from the sensor samples (the module's own estimator)
  kTrue,       // the true state the host hands over (only when the scenario allows it)
};

// The keys every built-in shares, with their defaults.
struct CommonConfig {
  StateChoice state = StateChoice::kEstimated;           // `state` = estimated | true
  design::InputKind input = design::InputKind::kTorque;  // `input` = torque | voltage
  // max_drift_m, max_speed_m_s, max_tilt_deg, ... (weights.hpp), resolved for the robot.
  design::DesignWeights weights;
  // `tilt_filter_s`: the tilt filter's time constant τ (tilt_filter.hpp), how long the gyro alone
  // carries the pitch; 0.5 s is common practice for balancing robots (slow enough to average out
  // accelerations the encoders do not explain).
  double tilt_filter_s = 0.5;
  // `bias_filter_s`: the time constant τ_b in which the tilt filter learns the pitch gyro's bias
  // (about 4 % of a step in it left after 5 τ_b, less when τ_b > τ). Common practice: a few τ, so
  // that an acceleration the filter misreads for a moment moves the bias little.
  double bias_filter_s = 2;
  // `max_accel_m_s2`: how fast the speed reference may change. Default g tan(max_tilt_deg) (at
  // most g): the steady lean that acceleration takes is the tilt the weights accept.
  double max_accel_m_s2 = 0;
};

// Reads the common keys. `state = true` without the host's true state
// (context.true_state_available) is a bad configuration; so is `input = voltage` when
// `voltage_allowed` is false. Weights not given are left to the robot (design::WeightsForRobot:
// the acceptable tilt from context.robot's outline), and a robot that cannot give them (a host
// whose robot struct stops before the outline) is refused unless the key is given. Problems go
// to the reader, for its Finish().
CommonConfig ReadCommonConfig(ConfigReader* reader, const ModuleContext& context,
                              bool voltage_allowed);

}  // namespace upright::controllers
