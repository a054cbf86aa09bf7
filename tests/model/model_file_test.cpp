#include "upright/model/model_file.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <string>
#include <string_view>
#include <vector>

namespace upright {
namespace {

// A small valid model (invented test data). Its first line is line 1.
constexpr std::string_view kMinimal = R"(<balancer name="mini" schema="2">
  <chassis mass_kg="10" com_height_m="0.3">
    <principal_moments pitch_kgm2="0.5" roll_kgm2="0.4" yaw_kgm2="0.3"/>
    <outline front_m="0.2" rear_m="-0.2" bottom_m="-0.05" top_m="0.6" width_m="0.3"/>
  </chassis>
  <wheels radius_m="0.1" width_m="0.04" mass_kg="1" track_m="0.4" friction="0.8"/>
  <motor torque_constant_Nm_per_A="0.05" back_emf_V_s_per_rad="0.05" resistance_ohm="0.5"
         gear_ratio="10" supply_V="24" current_limit_A="10"/>
  <sensors>
    <imu rate_hz="500" x_m="0" y_m="0" z_m="0.2"/>
    <encoder counts_per_rev="1024"/>
  </sensors>
  <control rate_hz="200"/>
</balancer>
)";

// The box spans x in [-0.2, 0.2] at its travel limits, exactly the outline's length.
constexpr std::string_view kPayload =
    R"(  <payload mass_kg="5" length_m="0.2" width_m="0.2" height_m="0.2" x_m="0" z_m="0.7"
           min_x_m="-0.1" max_x_m="0.1"/>
</balancer>)";

// kMinimal with `from` (which must occur exactly once) replaced by `to`.
std::string Edit(std::string_view from, std::string_view to, std::string_view text = kMinimal) {
  std::string edited(text);
  const std::size_t at = edited.find(from);
  EXPECT_NE(at, std::string::npos) << "no '" << from << "' in the test model";
  EXPECT_EQ(edited.find(from, at + 1), std::string::npos) << "'" << from << "' is not unique";
  if (at != std::string::npos) edited.replace(at, from.size(), to);
  return edited;
}

std::string WithPayload(std::string_view payload = kPayload) {
  return Edit("</balancer>", payload);
}

std::vector<std::string> Errors(const std::string& text) {
  std::vector<std::string> texts;
  const auto loaded = model::ParseModelText(text, "mini.xml");
  if (loaded) return texts;
  for (const model::FileError& error : loaded.error()) texts.push_back(error.ToString());
  return texts;
}

std::string ModelPath(const char* file) {
  return std::string(UPRIGHT_SOURCE_DIR) + "/models/" + file;
}

using Lines = std::vector<std::string>;

TEST(ModelFile, LoadsMinimalModel) {
  const auto result = model::ParseModelText(kMinimal, "mini.xml");
  ASSERT_TRUE(result.has_value()) << result.error()[0].ToString();
  EXPECT_EQ(result->name, "mini");
  EXPECT_EQ(result->chassis.mass_kg, 10);
  EXPECT_EQ(result->chassis.pitch_inertia_kgm2, 0.5);
  EXPECT_EQ(result->chassis.outline_rear_m, -0.2);
  EXPECT_EQ(result->motor.gear_ratio, 10);
  EXPECT_EQ(result->sensors.imu_rate_hz, 500);
  EXPECT_EQ(result->sensors.encoder_counts_per_rev, 1024);
  EXPECT_EQ(result->control_rate_hz, 200);
  EXPECT_FALSE(result->payload.present);
}

TEST(ModelFile, AppliesFixedDefaultsWhenOmitted) {
  const model::RobotModel model = model::ParseModelText(kMinimal, "mini.xml").value();
  EXPECT_EQ(model.chassis.com_forward_m, 0);
  EXPECT_EQ(model.wheel.rolling_resistance, 0);
  EXPECT_EQ(model.motor.gear_efficiency, 1);
  EXPECT_EQ(model.motor.viscous_friction_Nm_s_per_rad, 0);
  EXPECT_EQ(model.motor.coulomb_friction_Nm, 0);
  EXPECT_EQ(model.sensors.latency_s, 0);
  EXPECT_EQ(model.sensors.gyro_noise_rad_s_rthz, 0);
  EXPECT_EQ(model.sensors.gyro_bias_y_rad_s, 0);
  EXPECT_EQ(model.sensors.accel_noise_m_s2_rthz, 0);
  EXPECT_EQ(model.sensors.accel_resolution_m_s2, 0);
}

TEST(ModelFile, DerivesWheelInertiaWhenOmitted) {
  const model::RobotModel model = model::ParseModelText(kMinimal, "mini.xml").value();
  // Uniform disc about its axis ½ m r² (handbook, from memory): ½ × 1 × 0.1² = 0.005.
  EXPECT_DOUBLE_EQ(model.wheel.spin_inertia_kgm2, 0.005);
  // Uniform cylinder about a diameter m(3r² + w²)/12 (handbook, from memory):
  // 1 × (3 × 0.01 + 0.0016) / 12 = 0.0026333...
  EXPECT_DOUBLE_EQ(model.wheel.diameter_inertia_kgm2, 0.0316 / 12);
}

TEST(ModelFile, DerivesChassisInertiaFromUniformBlock) {
  const auto result = model::ParseModelText(
      Edit(R"(<principal_moments pitch_kgm2="0.5" roll_kgm2="0.4" yaw_kgm2="0.3"/>)",
           R"(<uniform_block length_m="0.3" width_m="0.2" height_m="0.5"/>)"),
      "mini.xml");
  ASSERT_TRUE(result.has_value()) << result.error()[0].ToString();
  // Uniform solid block about its centre, m(a² + b²)/12 over the two sides across the axis
  // (handbook, from memory); m = 10 kg.
  EXPECT_DOUBLE_EQ(result->chassis.pitch_inertia_kgm2, 10 * (0.09 + 0.25) / 12);
  EXPECT_DOUBLE_EQ(result->chassis.roll_inertia_kgm2, 10 * (0.04 + 0.25) / 12);
  EXPECT_DOUBLE_EQ(result->chassis.yaw_inertia_kgm2, 10 * (0.09 + 0.04) / 12);
}

TEST(ModelFile, LoadsCourierDemo) {
  const auto result = model::LoadModelFile(ModelPath("courier.xml"));
  ASSERT_TRUE(result.has_value()) << result.error()[0].ToString();
  const model::RobotModel& m = *result;
  EXPECT_EQ(m.name, "courier");
  EXPECT_EQ(m.chassis.mass_kg, 24);
  EXPECT_EQ(m.chassis.pitch_inertia_kgm2, 1.2);
  // Wheel inertias left to their defaults. Uniform disc ½ m r² (handbook, from memory):
  // ½ × 1.5 × 0.16² = 0.0192; uniform cylinder about a diameter m(3r² + w²)/12 (handbook, from
  // memory): 1.5 × (3 × 0.0256 + 0.0036) / 12 = 0.01005.
  EXPECT_DOUBLE_EQ(m.wheel.spin_inertia_kgm2, 0.0192);
  EXPECT_DOUBLE_EQ(m.wheel.diameter_inertia_kgm2, 0.01005);
  EXPECT_EQ(m.motor.gear_efficiency, 0.85);
  EXPECT_EQ(m.sensors.encoder_counts_per_rev, 81920);
  EXPECT_EQ(m.sensors.latency_s, 0.002);
  EXPECT_EQ(m.control_rate_hz, 200);
  EXPECT_TRUE(m.payload.present);
  EXPECT_EQ(m.payload.mass_kg, 5);
  EXPECT_EQ(m.payload.min_x_m, -0.15);
  EXPECT_EQ(m.payload.max_x_m, 0.15);
}

TEST(ModelFile, CourierDemoMotorsHoldATenDegreeTilt) {
  const model::RobotModel m = model::LoadModelFile(ModelPath("courier.xml")).value();
  const double current_A =
      std::min(m.motor.supply_V / m.motor.resistance_ohm, m.motor.current_limit_A);
  const double stall_both_Nm = 2 * m.motor.gear_ratio * m.motor.gear_efficiency *
                               m.motor.torque_constant_Nm_per_A * current_A;
  const double sin_10deg = 0.17364817766693033;  // sin(10°)
  const double gravity_Nm =
      (m.chassis.mass_kg * m.chassis.com_height_m + m.payload.mass_kg * m.payload.z_m) * 9.80665 *
      sin_10deg;
  EXPECT_NEAR(stall_both_Nm, 40.8, 1e-9);
  EXPECT_GT(stall_both_Nm, 2 * gravity_Nm);
  const double no_load_m_s =
      m.motor.supply_V / (m.motor.gear_ratio * m.motor.back_emf_V_s_per_rad) * m.wheel.radius_m;
  EXPECT_NEAR(no_load_m_s, 3.2, 1e-9);
}

TEST(ModelFile, LoadsTabletopDemo) {
  const auto result = model::LoadModelFile(ModelPath("tabletop.xml"));
  ASSERT_TRUE(result.has_value()) << result.error()[0].ToString();
  const model::RobotModel& m = *result;
  EXPECT_EQ(m.name, "tabletop");
  // From the 0.10 × 0.12 × 0.16 m block, uniform solid block m(a² + b²)/12 (handbook, from
  // memory).
  EXPECT_DOUBLE_EQ(m.chassis.pitch_inertia_kgm2, 1.2 * (0.01 + 0.0256) / 12);
  EXPECT_DOUBLE_EQ(m.chassis.roll_inertia_kgm2, 1.2 * (0.0144 + 0.0256) / 12);
  EXPECT_DOUBLE_EQ(m.chassis.yaw_inertia_kgm2, 1.2 * (0.01 + 0.0144) / 12);
  EXPECT_EQ(m.chassis.com_forward_m, 0);
  EXPECT_EQ(m.wheel.spin_inertia_kgm2, 2.8e-5);
  // Uniform cylinder about a diameter (handbook, from memory): 0.05 × (3 × 0.035² + 0.025²)/12.
  EXPECT_DOUBLE_EQ(m.wheel.diameter_inertia_kgm2, 0.05 * (3 * 0.001225 + 0.000625) / 12);
  EXPECT_EQ(m.sensors.encoder_counts_per_rev, 700);
  EXPECT_EQ(m.control_rate_hz, 100);
  EXPECT_FALSE(m.payload.present);
}

// Every field of both demo models, as their files state it or as its default follows: the file
// format may rename its elements, but what a file loads to must not move. The derived defaults are
// written as the loader's own arithmetic, so equality is exact: uniform disc ½ m r², uniform
// cylinder about a diameter m(3r² + w²)/12, uniform solid block m(a² + b²)/12 (handbook, from
// memory).
TEST(ModelFile, DemoModelsLoadToEveryFieldTheyState) {
  const model::RobotModel courier = model::LoadModelFile(ModelPath("courier.xml")).value();
  EXPECT_EQ(courier.name, "courier");
  EXPECT_EQ(courier.chassis, (model::ChassisModel{.mass_kg = 24,
                                                  .pitch_inertia_kgm2 = 1.20,
                                                  .roll_inertia_kgm2 = 1.05,
                                                  .yaw_inertia_kgm2 = 0.85,
                                                  .com_height_m = 0.30,
                                                  .com_forward_m = 0,
                                                  .outline_front_m = 0.32,
                                                  .outline_rear_m = -0.32,
                                                  .outline_bottom_m = -0.10,
                                                  .outline_top_m = 0.65,
                                                  .outline_width_m = 0.42}));
  EXPECT_EQ(courier.wheel, (model::WheelModel{.radius_m = 0.16,
                                              .width_m = 0.06,
                                              .mass_kg = 1.5,
                                              .spin_inertia_kgm2 = 0.5 * 1.5 * 0.16 * 0.16,
                                              .diameter_inertia_kgm2 =
                                                  1.5 * (3 * 0.16 * 0.16 + 0.06 * 0.06) / 12.0,
                                              .track_m = 0.50,
                                              .friction = 0.8,
                                              .rolling_resistance = 0.015}));
  EXPECT_EQ(courier.motor, (model::MotorModel{.torque_constant_Nm_per_A = 0.06,
                                              .back_emf_V_s_per_rad = 0.06,
                                              .resistance_ohm = 0.5,
                                              .gear_ratio = 20,
                                              .gear_efficiency = 0.85,
                                              .supply_V = 24,
                                              .current_limit_A = 20,
                                              .viscous_friction_Nm_s_per_rad = 0.02,
                                              .coulomb_friction_Nm = 0.15}));
  EXPECT_EQ(courier.sensors, (model::SensorModel{.imu_rate_hz = 1000,
                                                 .imu_x_m = 0.05,
                                                 .imu_y_m = 0,
                                                 .imu_z_m = 0.25,
                                                 .gyro_noise_rad_s_rthz = 8.7e-5,
                                                 .gyro_bias_x_rad_s = 0.002,
                                                 .gyro_bias_y_rad_s = -0.001,
                                                 .gyro_bias_z_rad_s = 0.0015,
                                                 .gyro_resolution_rad_s = 2.66e-4,
                                                 .accel_noise_m_s2_rthz = 1.47e-3,
                                                 .accel_bias_x_m_s2 = 0.05,
                                                 .accel_bias_y_m_s2 = -0.03,
                                                 .accel_bias_z_m_s2 = 0.08,
                                                 .accel_resolution_m_s2 = 2.39e-3,
                                                 .encoder_counts_per_rev = 81920,
                                                 .latency_s = 0.002}));
  EXPECT_EQ(courier.control_rate_hz, 200);
  EXPECT_EQ(courier.payload, (model::PayloadModel{.present = true,
                                                  .mass_kg = 5,
                                                  .length_m = 0.30,
                                                  .width_m = 0.30,
                                                  .height_m = 0.25,
                                                  .x_m = 0,
                                                  .z_m = 0.775,
                                                  .min_x_m = -0.15,
                                                  .max_x_m = 0.15}));

  const model::RobotModel tabletop = model::LoadModelFile(ModelPath("tabletop.xml")).value();
  EXPECT_EQ(tabletop.name, "tabletop");
  EXPECT_EQ(tabletop.chassis,
            (model::ChassisModel{.mass_kg = 1.2,
                                 .pitch_inertia_kgm2 = 1.2 * (0.10 * 0.10 + 0.16 * 0.16) / 12.0,
                                 .roll_inertia_kgm2 = 1.2 * (0.12 * 0.12 + 0.16 * 0.16) / 12.0,
                                 .yaw_inertia_kgm2 = 1.2 * (0.10 * 0.10 + 0.12 * 0.12) / 12.0,
                                 .com_height_m = 0.07,
                                 .com_forward_m = 0,
                                 .outline_front_m = 0.05,
                                 .outline_rear_m = -0.05,
                                 .outline_bottom_m = -0.02,
                                 .outline_top_m = 0.14,
                                 .outline_width_m = 0.12}));
  EXPECT_EQ(
      tabletop.wheel,
      (model::WheelModel{.radius_m = 0.035,
                         .width_m = 0.025,
                         .mass_kg = 0.05,
                         .spin_inertia_kgm2 = 2.8e-5,
                         .diameter_inertia_kgm2 = 0.05 * (3 * 0.035 * 0.035 + 0.025 * 0.025) / 12.0,
                         .track_m = 0.16,
                         .friction = 0.9,
                         .rolling_resistance = 0.01}));
  EXPECT_EQ(tabletop.motor, (model::MotorModel{.torque_constant_Nm_per_A = 0.0057,
                                               .back_emf_V_s_per_rad = 0.0057,
                                               .resistance_ohm = 3.0,
                                               .gear_ratio = 25,
                                               .gear_efficiency = 0.7,
                                               .supply_V = 7.4,
                                               .current_limit_A = 1.5,
                                               .viscous_friction_Nm_s_per_rad = 2e-4,
                                               .coulomb_friction_Nm = 0.005}));
  EXPECT_EQ(tabletop.sensors, (model::SensorModel{.imu_rate_hz = 500,
                                                  .imu_x_m = 0,
                                                  .imu_y_m = 0,
                                                  .imu_z_m = 0.04,
                                                  .gyro_noise_rad_s_rthz = 2.6e-4,
                                                  .gyro_bias_x_rad_s = 0.01,
                                                  .gyro_bias_y_rad_s = -0.008,
                                                  .gyro_bias_z_rad_s = 0.012,
                                                  .gyro_resolution_rad_s = 1.07e-3,
                                                  .accel_noise_m_s2_rthz = 2.9e-3,
                                                  .accel_bias_x_m_s2 = 0.15,
                                                  .accel_bias_y_m_s2 = -0.1,
                                                  .accel_bias_z_m_s2 = 0.2,
                                                  .accel_resolution_m_s2 = 1.2e-3,
                                                  .encoder_counts_per_rev = 700,
                                                  .latency_s = 0.005}));
  EXPECT_EQ(tabletop.control_rate_hz, 100);
  EXPECT_EQ(tabletop.payload, model::PayloadModel{});
}

TEST(ModelFile, TabletopDemoMotorsHoldATenDegreeTilt) {
  const model::RobotModel m = model::LoadModelFile(ModelPath("tabletop.xml")).value();
  const double current_A =
      std::min(m.motor.supply_V / m.motor.resistance_ohm, m.motor.current_limit_A);
  const double stall_both_Nm = 2 * m.motor.gear_ratio * m.motor.gear_efficiency *
                               m.motor.torque_constant_Nm_per_A * current_A;
  const double sin_10deg = 0.17364817766693033;  // sin(10°)
  const double gravity_Nm = m.chassis.mass_kg * m.chassis.com_height_m * 9.80665 * sin_10deg;
  EXPECT_GT(stall_both_Nm, 2 * gravity_Nm);
  const double no_load_m_s =
      m.motor.supply_V / (m.motor.gear_ratio * m.motor.back_emf_V_s_per_rad) * m.wheel.radius_m;
  EXPECT_GT(no_load_m_s, 0.8);
}

TEST(ModelFile, LoadsPayloadAndMarksItPresent) {
  const auto result = model::ParseModelText(WithPayload(), "mini.xml");
  ASSERT_TRUE(result.has_value()) << result.error()[0].ToString();
  EXPECT_TRUE(result->payload.present);
  EXPECT_EQ(result->payload.z_m, 0.7);
}

TEST(ModelFile, ReportsMissingFile) {
  const auto result = model::LoadModelFile("models/no_such_robot.xml");
  ASSERT_FALSE(result.has_value());
  ASSERT_EQ(result.error().size(), 1u);
  EXPECT_EQ(result.error()[0].ToString(),
            "models/no_such_robot.xml: cannot open file: No such file or directory");
}

TEST(ModelFile, ReportsMalformedXmlAtItsLine) {
  const std::vector<std::string> errors =
      Errors(Edit(R"(<control rate_hz="200"/>)", R"(<control rate_hz="200">)"));
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0],
            "mini.xml:13: malformed XML: mismatched closing tag: the element <control> opened on "
            "this line is closed by another element's closing tag (expected </control>, or "
            "<control .../> for an element with no content)");
}

TEST(ModelFile, ReportsUnclosedAttributeAtItsLine) {
  const std::vector<std::string> errors = Errors(Edit(R"(rate_hz="200"/>)", R"(rate_hz="200/>)"));
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0],
            "mini.xml:13: malformed XML: the value of attribute 'rate_hz' has no closing quote");
}

TEST(ModelFile, RejectsWrongRoot) {
  EXPECT_EQ(Errors("<scenario>\n</scenario>"),
            Lines{"mini.xml:1: root element is <scenario>, expected <balancer>"});
}

// A <robot> file of another format (it states no schema, as every upright model file did) is not
// an old upright model: it is told the root expected, not to rename its root.
TEST(ModelFile, RejectsARobotRootOfAnotherFormatWithoutCallingItAFormerName) {
  EXPECT_EQ(Errors("<robot name=\"arm\">\n  <link name=\"base\"/>\n</robot>"),
            Lines{"mini.xml:1: root element is <robot>, expected <balancer>"});
}

// kMinimal written in schema 1's names: root <robot>, <inertia> for <principal_moments>.
std::string InSchemaOne() {
  std::string text =
      Edit(R"(<balancer name="mini" schema="2">)", R"(<robot name="mini" schema="1">)");
  text = Edit("</balancer>", "</robot>", text);
  return Edit("<principal_moments ", "<inertia ", text);
}

TEST(ModelFile, NamesTheRootThatReplacedRobot) {
  std::string text =
      Edit(R"(<balancer name="mini" schema="2">)", R"(<robot name="mini" schema="2">)");
  EXPECT_EQ(Errors(Edit("</balancer>", "</robot>", text)),
            Lines{"mini.xml:1: <robot> is the former name of this file's root element: rename it "
                  "<balancer> (schema 2)"});
}

TEST(ModelFile, NamesTheElementThatReplacedInertia) {
  EXPECT_EQ(Errors(Edit("<principal_moments ", "<inertia ")),
            Lines{"mini.xml:3: chassis: <inertia> is the former name of this element: rename it "
                  "<principal_moments> (schema 2)"});
}

TEST(ModelFile, NamesTheElementThatReplacedBox) {
  EXPECT_EQ(Errors(Edit(R"(<principal_moments pitch_kgm2="0.5" roll_kgm2="0.4" yaw_kgm2="0.3"/>)",
                        R"(<box length_m="0.3" width_m="0.2" height_m="0.5"/>)")),
            Lines{"mini.xml:3: chassis: <box> is the former name of this element: rename it "
                  "<uniform_block> (schema 2)"});
}

TEST(ModelFile, NamesEveryFormerNameOfASchemaOneFileAndNothingElse) {
  EXPECT_EQ(Errors(InSchemaOne()),
            (Lines{"mini.xml:1: <robot> is the former name of this file's root element: rename it "
                   "<balancer> (schema 2)",
                   "mini.xml:3: chassis: <inertia> is the former name of this element: rename it "
                   "<principal_moments> (schema 2)"}));
}

TEST(ModelFile, RejectsUnsupportedSchemaVersion) {
  EXPECT_EQ(Errors(Edit(R"(schema="2")", R"(schema="3")")),
            Lines{"mini.xml:1: balancer schema = 3: unsupported schema version (expected 2)"});
  EXPECT_EQ(Errors(Edit(R"(schema="2")", R"(schema="1")")),
            Lines{"mini.xml:1: balancer schema = 1: unsupported schema version (expected 2)"});
}

TEST(ModelFile, RejectsMissingSchemaVersion) {
  EXPECT_EQ(Errors(Edit(R"( schema="2")", "")),
            Lines{"mini.xml:1: balancer: missing required attribute 'schema'"});
}

TEST(ModelFile, RejectsEmptyName) {
  EXPECT_EQ(Errors(Edit(R"(name="mini")", R"(name="")")),
            Lines{"mini.xml:1: balancer name = '': must not be empty"});
}

TEST(ModelFile, RejectsMissingRequiredElement) {
  EXPECT_EQ(Errors(Edit(R"(  <control rate_hz="200"/>
)",
                        "")),
            Lines{"mini.xml:1: balancer: missing required element <control>"});
}

TEST(ModelFile, RejectsMissingNestedElement) {
  EXPECT_EQ(Errors(Edit(R"(    <encoder counts_per_rev="1024"/>
)",
                        "")),
            Lines{"mini.xml:9: sensors: missing required element <encoder>"});
}

TEST(ModelFile, RejectsMissingRequiredAttribute) {
  EXPECT_EQ(Errors(Edit(R"( friction="0.8")", "")),
            Lines{"mini.xml:6: wheels: missing required attribute 'friction'"});
}

TEST(ModelFile, RejectsUnknownElement) {
  EXPECT_EQ(Errors(Edit("  <control", "  <lights on=\"1\"/>\n  <control")),
            Lines{"mini.xml:13: balancer: unknown element <lights> (expected one of: chassis, "
                  "wheels, motor, sensors, control, payload)"});
}

TEST(ModelFile, RejectsUnknownAttributeNamingTheExpectedOnes) {
  EXPECT_EQ(Errors(Edit(R"(mass_kg="10")", R"(masss_kg="10")")),
            (Lines{"mini.xml:2: chassis: missing required attribute 'mass_kg'",
                   "mini.xml:2: chassis: unknown attribute 'masss_kg' (expected one of: mass_kg, "
                   "com_height_m, com_forward_m)"}));
}

TEST(ModelFile, RejectsDuplicateElement) {
  EXPECT_EQ(Errors(Edit("</balancer>", "  <control rate_hz=\"100\"/>\n</balancer>")),
            Lines{"mini.xml:14: balancer: duplicate element <control> (first at line 13)"});
}

TEST(ModelFile, RejectsNonNumericValue) {
  EXPECT_EQ(Errors(Edit(R"(mass_kg="10")", R"(mass_kg="ten")")),
            Lines{"mini.xml:2: chassis mass_kg = 'ten': not a number (expected a finite decimal "
                  "number such as 0.25)"});
}

TEST(ModelFile, RejectsTrailingJunk) {
  EXPECT_EQ(Errors(Edit(R"(radius_m="0.1")", R"(radius_m="1.5x")")),
            Lines{"mini.xml:6: wheels radius_m = '1.5x': not a number (expected a finite decimal "
                  "number such as 0.25)"});
}

TEST(ModelFile, RejectsEmptyValue) {
  EXPECT_EQ(Errors(Edit(R"(supply_V="24")", R"(supply_V="")")),
            Lines{"mini.xml:7: motor supply_V = '': empty (expected a finite number)"});
}

TEST(ModelFile, RejectsNan) {
  EXPECT_EQ(Errors(Edit(R"(com_height_m="0.3")", R"(com_height_m="nan")")),
            Lines{"mini.xml:2: chassis com_height_m = 'nan': not finite (expected a finite "
                  "number)"});
}

TEST(ModelFile, RejectsInfinity) {
  EXPECT_EQ(Errors(Edit(R"(rate_hz="500")", R"(rate_hz="inf")")),
            Lines{"mini.xml:10: sensors/imu rate_hz = 'inf': not finite (expected a finite "
                  "number)"});
}

TEST(ModelFile, RejectsNegativeMass) {
  EXPECT_EQ(Errors(Edit(R"(mass_kg="10")", R"(mass_kg="-3")")),
            Lines{"mini.xml:2: chassis mass_kg = -3: must be in (0, 1000]"});
}

TEST(ModelFile, RejectsValueAboveMaximum) {
  EXPECT_EQ(Errors(Edit(R"(friction="0.8")", R"(friction="3.5")")),
            Lines{"mini.xml:6: wheels friction = 3.5: must be in (0, 3]"});
}

// A rate below 1 Hz is no balance controller and, at 1e-300 Hz, a period of more steps than any
// integer holds: the bound is 1 Hz.
TEST(ModelFile, RejectsAControlRateBelowOneHertz) {
  EXPECT_EQ(Errors(Edit(R"(<control rate_hz="200"/>)", R"(<control rate_hz="1e-300"/>)")),
            Lines{"mini.xml:13: control rate_hz = 1e-300: must be in [1, 100000]"});
  EXPECT_EQ(Errors(Edit(R"(<control rate_hz="200"/>)", R"(<control rate_hz="0.999"/>)")),
            Lines{"mini.xml:13: control rate_hz = 0.999: must be in [1, 100000]"});
}

TEST(ModelFile, RejectsGearEfficiencyAboveOne) {
  EXPECT_EQ(Errors(Edit(R"(gear_ratio="10")", R"(gear_ratio="10" gear_efficiency="1.05")")),
            Lines{"mini.xml:7: motor gear_efficiency = 1.05: must be in (0, 1]"});
}

TEST(ModelFile, RejectsValueAtOpenLowerBound) {
  EXPECT_EQ(Errors(Edit(R"(resistance_ohm="0.5")", R"(resistance_ohm="0")")),
            Lines{"mini.xml:7: motor resistance_ohm = 0: must be in (0, 1000]"});
}

TEST(ModelFile, RejectsValueAtOpenUpperBound) {
  EXPECT_EQ(Errors(Edit("<sensors>", R"(<sensors latency_s="0.5">)")),
            Lines{"mini.xml:9: sensors latency_s = 0.5: must be in [0, 0.5); the field is in "
                  "seconds: 0.5 ms is 0.0005"});
}

TEST(ModelFile, HintsThatALatencyTooLargeIsInSeconds) {
  // Refused by its range: 5 written for 5 ms.
  EXPECT_EQ(Errors(Edit("<sensors>", R"(<sensors latency_s="5">)")),
            Lines{"mini.xml:9: sensors latency_s = 5: must be in [0, 0.5); the field is in "
                  "seconds: 5 ms is 0.005"});
  // Refused by the rule across fields: 50 periods at 200 Hz = 0.25 s.
  EXPECT_EQ(Errors(Edit("<sensors>", R"(<sensors latency_s="0.3">)")),
            Lines{"mini.xml:9: sensors latency_s = 0.3: must be < 50 control periods = 0.25 s; "
                  "the field is in seconds: 0.3 ms is 0.0003"});
  // Too small is no unit slip: no hint.
  EXPECT_EQ(Errors(Edit("<sensors>", R"(<sensors latency_s="-0.002">)")),
            Lines{"mini.xml:9: sensors latency_s = -0.002: must be in [0, 0.5)"});
}

TEST(ModelFile, AcceptsValuesAtClosedBounds) {
  const auto result = model::ParseModelText(
      Edit(R"(gear_ratio="10")", R"(gear_ratio="1" gear_efficiency="1" coulomb_friction_Nm="0")"),
      "mini.xml");
  EXPECT_TRUE(result.has_value()) << result.error()[0].ToString();
}

TEST(ModelFile, RejectsNegativeNoiseDensity) {
  EXPECT_EQ(Errors(Edit("    <encoder", "    <gyro noise_rad_s_rthz=\"-1e-4\"/>\n    <encoder")),
            Lines{"mini.xml:11: sensors/gyro noise_rad_s_rthz = -1e-04: must be in [0, 1]"});
}

TEST(ModelFile, RejectsFractionalEncoderCounts) {
  EXPECT_EQ(Errors(Edit(R"(counts_per_rev="1024")", R"(counts_per_rev="1024.5")")),
            Lines{"mini.xml:11: sensors/encoder counts_per_rev = 1024.5: must be a whole number"});
}

TEST(ModelFile, RejectsZeroEncoderCounts) {
  EXPECT_EQ(Errors(Edit(R"(counts_per_rev="1024")", R"(counts_per_rev="0")")),
            Lines{"mini.xml:11: sensors/encoder counts_per_rev = 0: must be in [1, 1000000000]"});
}

TEST(ModelFile, RejectsBothPrincipalMomentsAndUniformBlock) {
  EXPECT_EQ(Errors(Edit("    <outline",
                        "    <uniform_block length_m=\"0.3\" width_m=\"0.2\" "
                        "height_m=\"0.5\"/>\n    <outline")),
            Lines{"mini.xml:4: chassis: <uniform_block> given together with <principal_moments> at "
                  "line 3 (give exactly one of <principal_moments> or <uniform_block>)"});
}

TEST(ModelFile, RejectsNeitherPrincipalMomentsNorUniformBlock) {
  EXPECT_EQ(Errors(Edit(R"(    <principal_moments pitch_kgm2="0.5" roll_kgm2="0.4" yaw_kgm2="0.3"/>
)",
                        "")),
            Lines{"mini.xml:2: chassis: needs one of <principal_moments> or <uniform_block> (found "
                  "neither)"});
}

TEST(ModelFile, RejectsOutlineFrontBehindRear) {
  EXPECT_EQ(Errors(Edit(R"(front_m="0.2" rear_m="-0.2")", R"(front_m="-0.3" rear_m="-0.2")")),
            (Lines{"mini.xml:4: chassis/outline front_m = -0.3, rear_m = -0.2: front_m must be > "
                   "rear_m"}));
}

TEST(ModelFile, RejectsOutlineTopBelowBottom) {
  // Only the outline is reported, not the centre of mass and IMU that no longer fit inside it.
  EXPECT_EQ(Errors(Edit(R"(top_m="0.6")", R"(top_m="-0.06")")),
            Lines{"mini.xml:4: chassis/outline top_m = -0.06, bottom_m = -0.05: top_m must be > "
                  "bottom_m"});
}

TEST(ModelFile, RejectsChassisReachingTheGroundUpright) {
  EXPECT_EQ(Errors(Edit(R"(bottom_m="-0.05")", R"(bottom_m="-0.1")")),
            Lines{"mini.xml:4: chassis/outline bottom_m = -0.1: must be > -(wheels radius_m) = "
                  "-0.1 so the chassis clears the ground when upright"});
}

TEST(ModelFile, RejectsCentreOfMassOutsideOutline) {
  EXPECT_EQ(Errors(Edit(R"(com_height_m="0.3")", R"(com_height_m="0.3" com_forward_m="0.25")")),
            Lines{"mini.xml:2: chassis com_forward_m = 0.25, com_height_m = 0.3: the centre of "
                  "mass must lie inside chassis/outline (x in [-0.2, 0.2], z in [-0.05, 0.6])"});
}

TEST(ModelFile, RejectsImuOutsideOutline) {
  EXPECT_EQ(Errors(Edit(R"(y_m="0")", R"(y_m="0.2")")),
            Lines{"mini.xml:10: sensors/imu x_m = 0, y_m = 0.2, z_m = 0.2: the IMU must lie "
                  "inside chassis/outline (x in [-0.2, 0.2], |y| <= 0.15, z in [-0.05, 0.6])"});
}

TEST(ModelFile, RejectsWheelWiderThanTrack) {
  EXPECT_EQ(Errors(Edit(R"(width_m="0.04")", R"(width_m="0.4")")),
            Lines{"mini.xml:6: wheels width_m = 0.4, track_m = 0.4: width_m must be < track_m"});
}

TEST(ModelFile, RejectsImuSlowerThanControl) {
  EXPECT_EQ(Errors(Edit(R"(rate_hz="500")", R"(rate_hz="100")")),
            Lines{"mini.xml:10: sensors/imu rate_hz = 100: must be >= control rate_hz = 200"});
}

TEST(ModelFile, RejectsLatencyOfFiftyControlPeriods) {
  // 50 periods at 200 Hz = 0.25 s.
  EXPECT_EQ(Errors(Edit("<sensors>", R"(<sensors latency_s="0.25">)")),
            Lines{"mini.xml:9: sensors latency_s = 0.25: must be < 50 control periods = 0.25 s; "
                  "the field is in seconds: 0.25 ms is 0.00025"});
  EXPECT_EQ(Errors(Edit("<sensors>", R"(<sensors latency_s="0.249">)")), Lines{});
}

TEST(ModelFile, RejectsChassisInertiaBreakingTriangleInequality) {
  EXPECT_EQ(Errors(Edit(R"(pitch_kgm2="0.5")", R"(pitch_kgm2="0.8")")),
            Lines{"mini.xml:3: chassis/principal_moments pitch_kgm2 = 0.8, roll_kgm2 = 0.4, "
                  "yaw_kgm2 = 0.3: "
                  "each moment must be <= the sum of the other two (no rigid body has these)"});
}

TEST(ModelFile, RejectsWheelSpinInertiaAboveTwiceDiameterInertia) {
  EXPECT_EQ(
      Errors(Edit(R"(mass_kg="1")",
                  R"(mass_kg="1" spin_inertia_kgm2="0.01" diameter_inertia_kgm2="0.004")")),
      Lines{"mini.xml:6: wheels spin_inertia_kgm2 = 0.01, diameter_inertia_kgm2 = 0.004: "
            "spin_inertia_kgm2 must be <= 2 * diameter_inertia_kgm2 (no rigid wheel has these)"});
}

TEST(ModelFile, RejectsPayloadHomeOutsideItsTravel) {
  EXPECT_EQ(Errors(WithPayload(Edit(R"(x_m="0")", R"(x_m="0.12")", kPayload))),
            Lines{"mini.xml:14: payload min_x_m = -0.1, x_m = 0.12, max_x_m = 0.1: must be "
                  "min_x_m <= x_m <= max_x_m"});
}

TEST(ModelFile, RejectsPayloadLeavingOutlineAtTravelLimit) {
  EXPECT_EQ(Errors(WithPayload(Edit(R"(max_x_m="0.1")", R"(max_x_m="0.15")", kPayload))),
            Lines{"mini.xml:14: payload min_x_m = -0.1, max_x_m = 0.15, length_m = 0.2: the box "
                  "spans x in [-0.2, 0.25] over its travel; must stay within chassis/outline "
                  "[-0.2, 0.2]"});
}

TEST(ModelFile, RejectsPayloadBelowOutlineBottom) {
  EXPECT_EQ(Errors(WithPayload(Edit(R"(z_m="0.7")", R"(z_m="0")", kPayload))),
            Lines{"mini.xml:14: payload z_m = 0, height_m = 0.2: the box underside at z = -0.1 "
                  "must be >= chassis/outline bottom_m = -0.05"});
}

// Values exactly on the edge of a rule that sums or halves fields are accepted, whatever the
// rounding of the arithmetic; values clearly past it are refused, printed exactly.
TEST(ModelFile, AcceptsPayloadExactlyAtTheOutlineEnds) {
  // -0.025 - 0.1/2 = -0.07500000000000001 and 0.025 + 0.1/2 = 0.07500000000000001 in binary.
  const std::string at_edges =
      Edit(R"(front_m="0.2" rear_m="-0.2")", R"(front_m="0.075" rear_m="-0.075")",
           WithPayload(Edit(R"(length_m="0.2")", R"(length_m="0.1")",
                            Edit(R"(min_x_m="-0.1" max_x_m="0.1")",
                                 R"(min_x_m="-0.025" max_x_m="0.025")", kPayload))));
  EXPECT_EQ(Errors(at_edges), Lines{});
  EXPECT_EQ(Errors(Edit(R"(min_x_m="-0.025")", R"(min_x_m="-0.0251")", at_edges)),
            Lines{"mini.xml:14: payload min_x_m = -0.0251, max_x_m = 0.025, length_m = 0.1: the "
                  "box spans x in [-0.0751, 0.07500000000000001] over its travel; must stay "
                  "within chassis/outline [-0.075, 0.075]"});
  EXPECT_EQ(Errors(Edit(R"(max_x_m="0.025")", R"(max_x_m="0.0251")", at_edges)),
            Lines{"mini.xml:14: payload min_x_m = -0.025, max_x_m = 0.0251, length_m = 0.1: the "
                  "box spans x in [-0.07500000000000001, 0.0751] over its travel; must stay "
                  "within chassis/outline [-0.075, 0.075]"});
}

TEST(ModelFile, AcceptsPayloadUndersideExactlyOnTheOutlineBottom) {
  // 0.01 - 0.17/2 = -0.07500000000000001 in binary, against a bottom of -0.075.
  const std::string on_bottom =
      Edit(R"(bottom_m="-0.05")", R"(bottom_m="-0.075")",
           WithPayload(Edit(R"(height_m="0.2" x_m="0" z_m="0.7")",
                            R"(height_m="0.17" x_m="0" z_m="0.01")", kPayload)));
  EXPECT_EQ(Errors(on_bottom), Lines{});
  EXPECT_EQ(Errors(Edit(R"(z_m="0.01")", R"(z_m="0.0099")", on_bottom)),
            Lines{"mini.xml:14: payload z_m = 0.0099, height_m = 0.17: the box underside at z = "
                  "-0.0751 must be >= chassis/outline bottom_m = -0.075"});
}

TEST(ModelFile, AcceptsChassisInertiaOfAFlatPlate) {
  // A lamina: pitch = roll + yaw exactly (perpendicular-axis theorem, from memory), yet
  // 0.3 + 0.6 = 0.8999999999999999 in binary.
  const std::string plate = Edit(R"(pitch_kgm2="0.5" roll_kgm2="0.4" yaw_kgm2="0.3")",
                                 R"(pitch_kgm2="0.9" roll_kgm2="0.3" yaw_kgm2="0.6")");
  EXPECT_EQ(Errors(plate), Lines{});
  EXPECT_EQ(
      Errors(Edit(R"(pitch_kgm2="0.9")", R"(pitch_kgm2="0.9001")", plate)),
      Lines{
          "mini.xml:3: chassis/principal_moments pitch_kgm2 = 0.9001, roll_kgm2 = 0.3, yaw_kgm2 = "
          "0.6: each moment must be <= the sum of the other two (no rigid body has "
          "these)"});
}

TEST(ModelFile, ImuPeriodMustFitTheDefaultPhysicsStep) {
  // 400 Hz is 2.5 steps of 1 ms; the nearest faster rate of whole steps is 500 Hz.
  EXPECT_EQ(Errors(Edit(R"(<imu rate_hz="500")", R"(<imu rate_hz="400")")),
            Lines{"mini.xml:10: sensors/imu rate_hz = 400: its period is 2.5 physics steps of the "
                  "default dt_s = 0.001 s; it must be a whole number of them, or the IMU at least "
                  "as fast as the physics (rate_hz >= 1000); 500 would work (2 steps)"});
  // 1500 Hz: 0.667 steps, so the IMU is sampled every step; 250 Hz: 4 steps.
  EXPECT_EQ(Errors(Edit(R"(<imu rate_hz="500")", R"(<imu rate_hz="1500")")), Lines{});
  EXPECT_EQ(Errors(Edit(R"(<imu rate_hz="500")", R"(<imu rate_hz="250")")), Lines{});
  // A scenario checks the robot against its own step instead.
  const auto own_step =
      model::ParseModelText(Edit(R"(<imu rate_hz="500")", R"(<imu rate_hz="400")"), "mini.xml",
                            model::ModelLoadOptions{.check_default_step = false});
  EXPECT_TRUE(own_step.has_value()) << own_step.error()[0].ToString();
}

TEST(ModelFile, ControlPeriodMustFitTheDefaultPhysicsStep) {
  EXPECT_EQ(Errors(Edit(R"(<control rate_hz="200"/>)", R"(<control rate_hz="400"/>)")),
            Lines{"mini.xml:13: control rate_hz = 400: its period is 2.5 physics steps of the "
                  "default dt_s = 0.001 s; it must be a whole number (>= 1) of them; 500 would "
                  "work (2 steps)"});
  // Faster than the physics: less than one step a period; one step (1000 Hz) would do, with an
  // IMU as fast.
  EXPECT_EQ(Errors(Edit(R"(<imu rate_hz="500")", R"(<imu rate_hz="2000")",
                        Edit(R"(<control rate_hz="200"/>)", R"(<control rate_hz="2000"/>)"))),
            Lines{"mini.xml:13: control rate_hz = 2000: its period is 0.5 physics steps of the "
                  "default dt_s = 0.001 s; it must be a whole number (>= 1) of them; 1000 would "
                  "work (1 step)"});
}

TEST(ModelFile, SkipsCrossFieldRulesWhileAFieldIsInvalid) {
  std::string text = Edit(R"(mass_kg="10")", R"(mass_kg="-1")");
  text = Edit(R"(front_m="0.2")", R"(front_m="-0.3")", text);
  EXPECT_EQ(Errors(text), Lines{"mini.xml:2: chassis mass_kg = -1: must be in (0, 1000]"});
}

TEST(ModelFile, ReportsSeveralErrorsInFileOrder) {
  std::string text = Edit(R"(<control rate_hz="200"/>)", R"(<control rate_hz="200" gain="3"/>)");
  text = Edit(R"(radius_m="0.1")", R"(radius_m="big")", text);
  text = Edit(R"(mass_kg="10")", R"(mass_kg="0")", text);
  text = Edit("    <encoder", "    <magnetometer/>\n    <encoder", text);
  EXPECT_EQ(Errors(text),
            (Lines{"mini.xml:2: chassis mass_kg = 0: must be in (0, 1000]",
                   "mini.xml:6: wheels radius_m = 'big': not a number (expected a finite decimal "
                   "number such as 0.25)",
                   "mini.xml:11: sensors: unknown element <magnetometer> (expected one of: imu, "
                   "gyro, accelerometer, encoder)",
                   "mini.xml:14: control: unknown attribute 'gain' (expected one of: rate_hz)"}));
}

}  // namespace
}  // namespace upright
