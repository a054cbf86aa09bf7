// <dispersions> in scenario files: spreads read into exact values, and every rule with its
// path:line message.
#include <gtest/gtest.h>

#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "upright/runner/scenario/scenario_file.hpp"
#include "upright/runner/scenario/scenario_parameter.hpp"

namespace upright::runner {
namespace {

using Lines = std::vector<std::string>;

// A scenario on the demo courier (chassis mass 24 kg, gyro bias_y -0.001 rad/s); `spreads` starts
// on line 11.
std::string WithSpreads(std::string_view spreads, std::string_view root = R"(duration_s="2")") {
  return std::string(R"(<scenario name="t" schema="1" )") + std::string(root) + R"(>
  <description>Test: a shove on the courier.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N="100" duration_s="0.2"/>
  </timeline>
  <controllers>
    <controller name="lqr" builtin="lqr"/>
  </controllers>
  <dispersions>
)" + std::string(spreads) +
         R"(
  </dispersions>
</scenario>
)";
}

ScenarioLoadResult Parse(const std::string& text) {
  const std::string dir = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";
  return ParseScenarioText(text, "t.xml", dir);
}

Lines Errors(const std::string& text) {
  Lines lines;
  const ScenarioLoadResult result = Parse(text);
  if (result) return lines;
  for (const model::FileError& error : result.error()) lines.push_back(error.ToString());
  return lines;
}

// The same scenario without <dispersions>, for the messages GetScenarioParameter and
// SetScenarioParameter give.
Scenario Plain() {
  std::string text = WithSpreads("");
  text.erase(text.find("  <dispersions>"), text.find("</scenario>") - text.find("  <dispersions>"));
  ScenarioLoadResult loaded = Parse(text);
  EXPECT_TRUE(loaded) << (loaded ? "" : loaded.error()[0].ToString());
  return std::move(loaded).value();  // throws, failing the test, when it did not load
}

TEST(ScenarioDispersions, ReadsSpreadsInFileOrderWithTheirNominalValues) {
  const ScenarioLoadResult result = Parse(WithSpreads(
      R"(    <spread param="robot/chassis.mass_kg" kind="normal" sd="1.5"/>
    <spread param="timeline/push[1].peak_N" kind="uniform" lo="80" hi="130"/>
    <spread param="robot/sensors/gyro.bias_y_rad_s" kind="normal" mean="0" sd="0.002"/>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  const std::vector<Dispersion>& d = result->dispersions;
  ASSERT_EQ(d.size(), 3u);
  EXPECT_EQ(d[0].param, "robot/chassis.mass_kg");
  EXPECT_EQ(d[0].kind, SpreadKind::kNormal);
  EXPECT_EQ(d[0].nominal, 24);
  EXPECT_EQ(d[0].mean, 24);  // the scenario's own value when the file gives no mean
  EXPECT_EQ(d[0].sd, 1.5);
  EXPECT_EQ(d[0].line, 11);
  EXPECT_EQ(d[1].kind, SpreadKind::kUniform);
  EXPECT_EQ(d[1].nominal, 100);
  EXPECT_EQ(d[1].lo, 80);
  EXPECT_EQ(d[1].hi, 130);
  EXPECT_EQ(d[1].line, 12);
  EXPECT_EQ(d[2].nominal, -0.001);
  EXPECT_EQ(d[2].mean, 0);
  EXPECT_EQ(d[2].sd, 0.002);
}

// A run reads the scenario as written: dispersions change nothing else in it.
TEST(ScenarioDispersions, LeaveTheScenarioAsWritten) {
  const ScenarioLoadResult result =
      Parse(WithSpreads(R"(    <spread param="robot/chassis.mass_kg" kind="normal" sd="1.5"/>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  const Scenario plain = Plain();
  EXPECT_FALSE(result->plant_model.has_value());
  EXPECT_EQ(result->model.chassis.mass_kg, plain.model.chassis.mass_kg);
  EXPECT_EQ(result->pushes.at(0).peak_N, plain.pushes.at(0).peak_N);
  EXPECT_TRUE(plain.dispersions.empty());
}

TEST(ScenarioDispersions, KindNamesReadBack) {
  for (const SpreadKind kind : {SpreadKind::kNormal, SpreadKind::kUniform}) {
    SpreadKind back = kind == SpreadKind::kNormal ? SpreadKind::kUniform : SpreadKind::kNormal;
    EXPECT_TRUE(FromString(ToString(kind), &back));
    EXPECT_EQ(back, kind);
  }
  SpreadKind unused;
  EXPECT_FALSE(FromString("gaussian", &unused));
}

TEST(ScenarioDispersions, RejectsAnUnknownParameterWithTheParameterMessage) {
  for (const std::string param :
       {"robot/chassis.mass_k", "timeline/push[2].peak_N", "ground.slope_deg", "mass"}) {
    const Result<double> value = GetScenarioParameter(Plain(), param);
    ASSERT_FALSE(value) << param;
    EXPECT_EQ(Errors(WithSpreads(R"(    <spread param=")" + param + R"(" kind="normal" sd="1"/>)")),
              Lines{"t.xml:11: dispersions/spread param = '" + param + "': " + value.error()});
  }
}

TEST(ScenarioDispersions, RejectsANonPositiveStandardDeviation) {
  EXPECT_EQ(
      Errors(WithSpreads(R"(    <spread param="robot/chassis.mass_kg" kind="normal" sd="0"/>)")),
      Lines{"t.xml:11: dispersions/spread sd = 0: must be > 0"});
  EXPECT_EQ(
      Errors(WithSpreads(R"(    <spread param="robot/chassis.mass_kg" kind="normal" sd="-2"/>)")),
      Lines{"t.xml:11: dispersions/spread sd = -2: must be > 0"});
  EXPECT_EQ(Errors(WithSpreads(R"(    <spread param="robot/chassis.mass_kg" kind="normal"/>)")),
            Lines{"t.xml:11: dispersions/spread: missing required attribute 'sd'"});
}

TEST(ScenarioDispersions, RejectsAnEmptyOrReversedUniformRange) {
  EXPECT_EQ(
      Errors(WithSpreads(
          R"(    <spread param="timeline/push[1].peak_N" kind="uniform" lo="120" hi="80"/>)")),
      Lines{"t.xml:11: dispersions/spread hi = 80: must be > lo = 120"});
  EXPECT_EQ(Errors(WithSpreads(
                R"(    <spread param="timeline/push[1].peak_N" kind="uniform" lo="90" hi="90"/>)")),
            Lines{"t.xml:11: dispersions/spread hi = 90: must be > lo = 90"});
  EXPECT_EQ(Errors(WithSpreads(
                R"(    <spread param="timeline/push[1].peak_N" kind="uniform" lo="90"/>)")),
            Lines{"t.xml:11: dispersions/spread: missing required attribute 'hi'"});
}

// However the path is written: the first push may be written without its index.
TEST(ScenarioDispersions, RejectsAParameterGivenTwice) {
  EXPECT_EQ(Errors(WithSpreads(
                R"(    <spread param="timeline/push[1].peak_N" kind="uniform" lo="80" hi="120"/>
    <spread param="robot/chassis.mass_kg" kind="normal" sd="1"/>
    <spread param="timeline/push.peak_N" kind="normal" sd="10"/>
    <spread param="robot/chassis.mass_kg" kind="normal" sd="2"/>)")),
            (Lines{"t.xml:13: dispersions/spread param = 'timeline/push.peak_N': given twice "
                   "(first on line 11)",
                   "t.xml:14: dispersions/spread param = 'robot/chassis.mass_kg': given twice "
                   "(first on line 12)"}));
}

TEST(ScenarioDispersions, RejectsAttributesOfTheOtherKind) {
  EXPECT_EQ(Errors(WithSpreads(
                R"(    <spread param="robot/chassis.mass_kg" kind="normal" sd="1" lo="20"/>)")),
            Lines{"t.xml:11: dispersions/spread lo = 20: only with kind=\"uniform\""});
  EXPECT_EQ(
      Errors(WithSpreads(
          R"(    <spread param="robot/chassis.mass_kg" kind="uniform" lo="20" hi="28" mean="24"/>)")),
      Lines{"t.xml:11: dispersions/spread mean = 24: only with kind=\"normal\""});
}

TEST(ScenarioDispersions, RejectsAnUnknownKindOrAttribute) {
  EXPECT_EQ(
      Errors(WithSpreads(R"(    <spread param="robot/chassis.mass_kg" kind="gaussian" sd="1"/>)")),
      Lines{"t.xml:11: dispersions/spread kind = 'gaussian': not a known value (expected one of: "
            "normal, uniform)"});
  const Lines errors = Errors(
      WithSpreads(R"(    <spread param="robot/chassis.mass_kg" kind="normal" sd="1" sigma="1"/>)"));
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].rfind("t.xml:11: dispersions/spread: unknown attribute 'sigma'", 0), 0u)
      << errors[0];
}

TEST(ScenarioDispersions, RejectsAnEmptyElement) {
  EXPECT_EQ(Errors(WithSpreads("")),
            Lines{"t.xml:10: dispersions: empty (expected at least one <spread param=\"...\" "
                  "kind=\"normal\" sd=\"...\"/> or <spread param=\"...\" kind=\"uniform\" "
                  "lo=\"...\" hi=\"...\"/>)"});
}

// The centre of a spread must be a value the parameter takes.
TEST(ScenarioDispersions, RejectsACentreTheParameterDoesNotTake) {
  Scenario trial = Plain();
  const Status mass = SetScenarioParameter(&trial, "robot/chassis.mass_kg", -5);
  ASSERT_FALSE(mass);
  const std::string mass_message = mass.error();
  const Status at = SetScenarioParameter(&trial, "timeline/push[1].at_s", 2.5);
  ASSERT_FALSE(at);
  const std::string at_message = at.error();
  EXPECT_EQ(Errors(WithSpreads(
                R"(    <spread param="robot/chassis.mass_kg" kind="normal" mean="-5" sd="1"/>)")),
            Lines{"t.xml:11: dispersions/spread mean = -5: not a value the parameter takes (" +
                  mass_message + ")"});
  EXPECT_EQ(Errors(WithSpreads(
                R"(    <spread param="timeline/push[1].at_s" kind="uniform" lo="2" hi="3"/>)")),
            Lines{"t.xml:11: dispersions/spread lo = 2, hi = 3: the midpoint is not a value the "
                  "parameter takes (" +
                  at_message + ")"});
}

// Parameters are looked up only in a scenario that is otherwise right; the spread's own rules are
// still checked.
TEST(ScenarioDispersions, ChecksParametersOnlyWhenTheRestIsValid) {
  EXPECT_EQ(Errors(WithSpreads(R"(    <spread param="nothing.here" kind="normal" sd="0"/>)",
                               R"(duration_s="-1")")),
            (Lines{"t.xml:1: scenario duration_s = -1: must be > 0",
                   "t.xml:11: dispersions/spread sd = 0: must be > 0"}));
}

// The demo scenario that declares dispersions loads them all.
TEST(ScenarioDispersions, TheDemoShoveDeclaresItsSpreads) {
  const ScenarioLoadResult result =
      LoadScenarioFile(std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/courier-shove-half-sine.xml");
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_GE(result->dispersions.size(), 7u);
}

}  // namespace
}  // namespace upright::runner
