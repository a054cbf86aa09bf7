// Configuration of the built-in modules through ControllerHost::Create: unknown keys, bad values
// and impossible requests are refused with messages naming the key, the value and the rule; what
// a module declares (command kind, diagnostics) follows its configuration.
#include <gtest/gtest.h>

#include <algorithm>
#include <string>
#include <utility>

#include "builtin_run.hpp"
#include "succeeded.hpp"

namespace upright::host {
namespace {

using testing::Config;
using testing::CreateBuiltin;
using testing::DemoRobot;

// The error of a create that must fail.
std::string Refusal(const std::string& module, const Config& config, bool true_state = false) {
  const auto host = CreateBuiltin(module, DemoRobot("courier"), config, true_state);
  EXPECT_FALSE(host.has_value()) << module << " accepted the configuration";
  return host ? std::string() : host.error();
}

class EveryBuiltin : public ::testing::TestWithParam<std::string> {};

TEST_P(EveryBuiltin, RefusesAnUnknownKeyNamingItAndItsValue) {
  const std::string error = Refusal(GetParam(), {{"max_tilt", "3"}});
  EXPECT_NE(error.find("status 2"), std::string::npos) << error;  // UPRIGHT_BAD_CONFIG
  EXPECT_NE(error.find("unknown key max_tilt (= 3)"), std::string::npos) << error;
  EXPECT_NE(error.find("max_tilt_deg"), std::string::npos) << error;  // the keys it knows
}

TEST_P(EveryBuiltin, RefusesBadValuesNamingKeyValueAndRule) {
  const std::pair<Config, std::string> cases[] = {
      {{{"max_tilt_deg", "-1"}}, "max_tilt_deg = -1: must be > 0"},
      {{{"max_drift_m", "0"}}, "max_drift_m = 0: must be > 0"},
      {{{"max_input_fraction", "1.5"}}, "max_input_fraction = 1.5: must be in (0, 1]"},
      {{{"tilt_filter_s", "fast"}}, "tilt_filter_s = fast: must be a finite decimal number"},
      {{{"max_speed_m_s", "inf"}}, "max_speed_m_s = inf: must be a finite decimal number"},
      {{{"max_accel_m_s2", "0.5 m/s2"}}, "max_accel_m_s2 = 0.5 m/s2: must be a finite decimal"},
      {{{"state", "maybe"}}, "state = maybe: must be one of estimated, true"},
      {{{"input", "current"}}, "input = current: must be one of torque, voltage"},
      {{{"max_yaw_deg", "10"}, {"max_yaw_deg", "20"}}, "max_yaw_deg = 20: given twice"},
  };
  for (const auto& [config, message] : cases) {
    const std::string error = Refusal(GetParam(), config);
    EXPECT_NE(error.find("status 2"), std::string::npos) << error;
    EXPECT_NE(error.find(message), std::string::npos) << error;
  }
}

TEST_P(EveryBuiltin, RefusesTheTrueStateWhenTheHostDoesNotOfferIt) {
  const std::string error = Refusal(GetParam(), {{"state", "true"}}, /*true_state=*/false);
  EXPECT_NE(error.find("status 2"), std::string::npos) << error;
  EXPECT_NE(error.find("state = true: the host offers no true state"), std::string::npos) << error;
}

TEST_P(EveryBuiltin, AcceptsTheTrueStateWhenOffered) {
  EXPECT_TRUE(
      Succeeded(CreateBuiltin(GetParam(), DemoRobot("courier"), {{"state", "true"}}, true)));
}

TEST_P(EveryBuiltin, CommandsTorqueByDefaultAndDeclaresItsEstimate) {
  const auto created = CreateBuiltin(GetParam(), DemoRobot("tabletop"), {}, false);
  ASSERT_TRUE(Succeeded(created));
  const auto& host = *created;
  EXPECT_EQ(host->drive(), sim::DriveMode::kTorque);
  const auto& names = host->diagnostic_names();
  EXPECT_NE(std::find(names.begin(), names.end(), "pitch_est_rad"), names.end());
}

INSTANTIATE_TEST_SUITE_P(Builtins, EveryBuiltin, ::testing::Values("lqr", "hinf", "lqg", "pid"));

class StateFeedbackBuiltin : public ::testing::TestWithParam<std::string> {};

TEST_P(StateFeedbackBuiltin, CommandsVoltageWhenAsked) {
  const auto created =
      CreateBuiltin(GetParam(), DemoRobot("courier"), {{"input", "voltage"}}, false);
  ASSERT_TRUE(Succeeded(created));
  const auto& host = *created;
  EXPECT_EQ(host->drive(), sim::DriveMode::kVoltage);
  const auto& names = host->diagnostic_names();
  EXPECT_NE(std::find(names.begin(), names.end(), "x_est_m"), names.end());
}

INSTANTIATE_TEST_SUITE_P(Builtins, StateFeedbackBuiltin, ::testing::Values("lqr", "hinf", "lqg"));

TEST(PidModule, RefusesVoltageCommands) {
  const std::string error = Refusal("pid", {{"input", "voltage"}});
  EXPECT_NE(error.find("status 2"), std::string::npos) << error;
  EXPECT_NE(error.find("input = voltage: this controller commands torque only"), std::string::npos)
      << error;
}

TEST(PidModule, RefusesPoleChoicesOutsideTheRuleInTheKeysTerms) {
  // design::PidPoles::Validate's rules, worded with the module's keys.
  const std::pair<Config, std::string> cases[] = {
      {{{"tilt_pole_factor", "0"}}, "tilt_pole_factor = 0: must be > 0"},
      {{{"speed_pole_factor", "1"}, {"tilt_pole_factor", "1.5"}},
       "speed_pole_factor = 1: must be at most half of tilt_pole_factor = 1.5 (the speed loop "
       "slower than the tilt loop it steers)"},
      {{{"speed_pole_factor", "1.5"}},
       "speed_pole_factor = 1.5: must be at most half of "
       "tilt_pole_factor = 2"},
      {{{"tilt_damping", "0.1"}}, "tilt_damping = 0.1: must be in [0.2, 1]"},
      {{{"speed_damping", "2"}}, "speed_damping = 2: must be in [0.2, 1]"},
      {{{"yaw_pole_factor", "fast"}}, "yaw_pole_factor = fast: must be a finite decimal number"},
  };
  for (const auto& [config, message] : cases) {
    const std::string error = Refusal("pid", config);
    EXPECT_NE(error.find("status 2"), std::string::npos) << error;
    EXPECT_NE(error.find(message), std::string::npos) << error;
  }
  // The pole keys are the pid module's alone.
  EXPECT_NE(Refusal("lqr", {{"tilt_pole_factor", "3"}}).find("unknown key tilt_pole_factor"),
            std::string::npos);
  EXPECT_TRUE(Succeeded(CreateBuiltin("pid", DemoRobot("courier"),
                                      {{"tilt_pole_factor", "1"},
                                       {"speed_pole_factor", "0.5"},
                                       {"tilt_damping", "0.2"},
                                       {"speed_damping", "1"}},
                                      false)));
}

TEST(HinfModule, RefusesAGammaAtOrBelowTheOptimum) {
  const std::string error = Refusal("hinf", {{"gamma", "0.001"}});
  EXPECT_NE(error.find("status 2"), std::string::npos) << error;
  EXPECT_NE(error.find("gamma = 0.001: must be > gamma_opt = "), std::string::npos) << error;
}

TEST(HinfModule, RefusesAGammaFactorOfOneOrLess) {
  const std::string error = Refusal("hinf", {{"gamma_factor", "1"}});
  EXPECT_NE(error.find("gamma_factor = 1: must be > 1"), std::string::npos) << error;
}

TEST(HinfModule, RefusesGammaAndGammaFactorTogether) {
  const std::string error = Refusal("hinf", {{"gamma", "10"}, {"gamma_factor", "2"}});
  EXPECT_NE(error.find("gamma and gamma_factor: give one of them, not both"), std::string::npos)
      << error;
}

TEST(HinfModule, DeclaresItsGamma) {
  const auto created = CreateBuiltin("hinf", DemoRobot("courier"), {{"gamma", "10"}}, false);
  ASSERT_TRUE(Succeeded(created));
  const auto& host = *created;
  const auto& names = host->diagnostic_names();
  EXPECT_NE(std::find(names.begin(), names.end(), "gamma"), names.end());
}

TEST(LqrModule, RefusesALatencyCompensationThatIsNeitherTrueNorFalse) {
  const std::string error = Refusal("lqr", {{"latency_compensation", "on"}});
  EXPECT_NE(error.find("latency_compensation = on: must be one of false, true"), std::string::npos)
      << error;
  EXPECT_NE(Refusal("hinf", {{"latency_compensation", "true"}}).find("unknown key"),
            std::string::npos);
}

TEST(LqrModule, KeyValuesMayCarrySurroundingSpaces) {
  EXPECT_TRUE(Succeeded(CreateBuiltin("lqr", DemoRobot("courier"),
                                      {{"max_tilt_deg", " 4 "}, {"state", " estimated"}}, false)));
}

}  // namespace
}  // namespace upright::host
