#include "upright/runner/scenario/scenario_file.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <limits>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "upright/model/model_file.hpp"
#include "upright/sim/plant.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using Lines = std::vector<std::string>;

constexpr double kInf = std::numeric_limits<double>::infinity();

// A small robot with a payload (invented test data): outline z in [-0.05, 0.6], COM 0.3 m above
// the axle, control 200 Hz, IMU 500 Hz, carriage travel [-0.1, 0.1] m from home 0.
constexpr std::string_view kTestRobot = R"(<balancer name="testbot" schema="2">
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
  <payload mass_kg="5" length_m="0.2" width_m="0.2" height_m="0.2" x_m="0" z_m="0.7"
           min_x_m="-0.1" max_x_m="0.1"/>
</balancer>
)";

// A small valid scenario on the test robot; its first line is line 1. The push is line 5, the
// controller line 8, and `</scenario>` line 10.
constexpr std::string_view kBase = R"(<scenario name="t" schema="1" duration_s="8" dt_s="0.001">
  <description>A test situation.</description>
  <robot file="robot.xml"/>
  <timeline>
    <push at_s="1" shape="impulse" peak_N="100" duration_s="0.1"/>
  </timeline>
  <controllers>
    <controller name="lqr" builtin="lqr"/>
  </controllers>
</scenario>
)";

constexpr std::string_view kPushLine =
    R"(    <push at_s="1" shape="impulse" peak_N="100" duration_s="0.1"/>)";
constexpr std::string_view kControllerLine = R"(    <controller name="lqr" builtin="lqr"/>)";

// `text` with `from` (which must occur exactly once) replaced by `to`.
std::string Edit(std::string_view from, std::string_view to, std::string_view text = kBase) {
  std::string edited(text);
  const std::size_t at = edited.find(from);
  EXPECT_NE(at, std::string::npos) << "no '" << from << "' in the test scenario";
  EXPECT_EQ(edited.find(from, at + 1), std::string::npos) << "'" << from << "' is not unique";
  if (at != std::string::npos) edited.replace(at, from.size(), to);
  return edited;
}

// The base with its push replaced by `events` (first event on line 5).
std::string Events(std::string_view events) { return Edit(kPushLine, events); }
// The base with `element` inserted before <timeline> (it lands on line 4).
std::string Before(std::string_view element) {
  return Edit("  <timeline>", std::string(element) + "\n  <timeline>");
}
// The base with its controller replaced by `controllers` (first on line 8).
std::string Controllers(std::string_view controllers) { return Edit(kControllerLine, controllers); }
// The base with `element` inserted before </scenario> (it lands on line 10).
std::string Tail(std::string_view element) {
  return Edit("</scenario>", std::string(element) + "\n</scenario>");
}
// The base (or `text`) with the root's run settings replaced.
std::string Root(std::string_view settings, std::string_view text = kBase) {
  return Edit(R"(duration_s="8" dt_s="0.001")", settings, text);
}

void WriteFile(const fs::path& path, std::string_view text) {
  fs::create_directories(path.parent_path());
  std::ofstream(path) << text;
}

// Each test gets its own folder (tests run as separate processes, possibly at once) holding the
// test robot, a robot without a payload, a broken robot and a stand-in module file.
class ScenarioFileTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::path(::testing::TempDir()) /
           (std::string("upright_scenario_") +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(dir_);
    WriteFile(dir_ / "robot.xml", kTestRobot);
    std::string bare(kTestRobot);
    bare.replace(bare.find("testbot"), 7, "barebot");
    bare.erase(bare.find("  <payload"), bare.find("</balancer>") - bare.find("  <payload"));
    WriteFile(dir_ / "bare.xml", bare);
    std::string broken(kTestRobot);
    broken.replace(broken.find(R"(mass_kg="10")"), 12, R"(mass_kg="-3")");
    WriteFile(dir_ / "broken.xml", broken);
    WriteFile(dir_ / "modules" / "mine.so", "stand-in");
  }
  void TearDown() override { fs::remove_all(dir_); }

  ScenarioLoadResult Parse(const std::string& text) const {
    return ParseScenarioText(text, "t.xml", dir_.string());
  }
  Lines Errors(const std::string& text) const {
    Lines texts;
    const ScenarioLoadResult result = Parse(text);
    if (result) return texts;
    for (const model::FileError& error : result.error()) texts.push_back(error.ToString());
    return texts;
  }
  std::string In(const std::string& file) const { return (dir_ / file).string(); }

  fs::path dir_;
};

// ---------------------------------------------------------------------------------------------
// Valid files.

TEST_F(ScenarioFileTest, ParsesMinimalFileWithDefaults) {
  const ScenarioLoadResult result = Parse(std::string(kBase));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  const Scenario& s = *result;
  EXPECT_EQ(s.name, "t");
  EXPECT_EQ(s.description, "A test situation.");
  EXPECT_EQ(s.path, "t.xml");
  EXPECT_EQ(s.model_path, In("robot.xml"));
  EXPECT_EQ(s.model.name, "testbot");
  EXPECT_EQ(s.duration_s, 8);
  EXPECT_EQ(s.dt_s, 0.001);
  EXPECT_EQ(s.solver_iterations, 10);
  EXPECT_TRUE(s.sensor_noise);
  EXPECT_EQ(s.terrain.kind, sim::TerrainKind::kFlat);
  EXPECT_TRUE(s.terrain.segments.empty());
  EXPECT_TRUE(s.terrain.friction_regions.empty());
  EXPECT_EQ(s.initial.x_m, 0);
  EXPECT_EQ(s.initial.pitch_rad, 0);
  EXPECT_EQ(s.initial.speed_m_s, 0);
  ASSERT_EQ(s.pushes.size(), 1u);
  EXPECT_EQ(s.pushes[0].shape, sim::PushShape::kImpulse);
  EXPECT_EQ(s.pushes[0].start_s, 1);
  EXPECT_EQ(s.pushes[0].duration_s, 0.1);
  EXPECT_EQ(s.pushes[0].peak_N, 100);
  EXPECT_EQ(s.pushes[0].direction_deg, 0);
  EXPECT_EQ(s.pushes[0].height_m, 0.3);  // the test robot's com_height_m
  EXPECT_TRUE(s.payload_shifts.empty());
  EXPECT_TRUE(s.drives.empty());
  EXPECT_TRUE(s.motor_faults.empty());
  EXPECT_TRUE(s.sensor_faults.empty());
  ASSERT_EQ(s.controllers.size(), 1u);
  EXPECT_EQ(s.controllers[0].name, "lqr");
  EXPECT_EQ(s.controllers[0].module, "lqr");
  EXPECT_TRUE(s.controllers[0].builtin);
  EXPECT_TRUE(s.controllers[0].config.empty());
  EXPECT_EQ(s.controllers[0].rate_hz, 0);
  EXPECT_FALSE(s.controllers[0].true_state);
  EXPECT_EQ(s.controllers[0].line, 8);
  EXPECT_EQ(s.baseline, 0u);
  EXPECT_EQ(s.seeds, (std::vector<std::uint64_t>{1}));
  const MetricSettings defaults;
  EXPECT_EQ(s.metrics.fall_tilt_deg, defaults.fall_tilt_deg);
  EXPECT_EQ(s.metrics.tilt_band_deg, defaults.tilt_band_deg);
  EXPECT_EQ(s.metrics.drift_band_m, defaults.drift_band_m);
  EXPECT_EQ(s.metrics.window_s, defaults.window_s);
  EXPECT_EQ(s.metrics.slip_threshold, defaults.slip_threshold);
}

TEST_F(ScenarioFileTest, ParsesFullFileIntoExactValues) {
  const std::string text = R"(<scenario name="full-1.a_b" schema="1" duration_s="6" dt_s="0.0005"
          solver_iterations="20" sensor_noise="false">
  <description>
    Every element,
    every attribute.
  </description>
  <robot file=")" + In("robot.xml") +
                           R"("/>
  <ground kind="profile" start_x_m="1.5" width_m="4">
    <ramp length_m="2" height_m="0.2"/> <plateau length_m="1"/> <bump length_m="0.5" height_m="0.03"/>
    <curb height_m="-0.04"/>
    <friction start_x_m="2" end_x_m="3.5" friction="0.2"/>
    <ramp length_m="1" height_m="-0.1"/>
    <friction start_x_m="5" end_x_m="6" friction="0.9"/>
  </ground>
  <start x_m="-0.5" pitch_deg="3" speed_m_s="0.25"/>
  <timeline>
    <push at_s="3" shape="step" peak_N="20" direction_deg="90" height_m="0.5"/>
    <push at_s="1" shape="half-sine" peak_N="-80" duration_s="0.25" height_m="-0.05"/>
    <push at_s="1" shape="impulse" peak_N="60" duration_s="0.05"/>
    <payload_shift at_s="2" distance_m="-0.1" duration_s="0.4"/>
    <payload_shift at_s="0.5" distance_m="0.1"/>
    <drive at_s="4" speed_m_s="-0.5"/>
    <drive at_s="0" speed_m_s="1.2" yaw_rate_deg_s="45" ramp_s="1.5"/>
    <motor_fault at_s="4.5" side="both" torque_scale="0"/>
    <motor_fault at_s="2.5" side="right" torque_scale="0.5"/>
    <sensor_fault at_s="3" channel="encoder_left" kind="stuck"/>
    <sensor_fault at_s="2" channel="gyro_y" kind="bias" value="0.02" duration_s="1"/>
  </timeline>
  <controllers baseline="mine">
    <controller name="lqr" builtin="lqr" rate_hz="100" true_state="true">
      <setting key="q_theta" value="10"/>
      <setting key="r" value=""/>
      <setting key="mode" value="fast"/>
    </controller>
    <controller name="mine" file="modules/mine.so"/>
  </controllers>
  <seeds count="3" first="7"/>
  <metrics fall_tilt_deg="30" tilt_band_deg="0.5" drift_band_m="0.1" window_s="2.5"
           slip_threshold="0.2"/>
</scenario>
)";
  const ScenarioLoadResult result = ParseScenarioText(text, "full.xml", dir_.string());
  ASSERT_TRUE(result) << result.error()[0].ToString();
  const Scenario& s = *result;
  EXPECT_EQ(s.name, "full-1.a_b");
  EXPECT_EQ(s.description, "Every element, every attribute.");
  EXPECT_EQ(s.path, "full.xml");
  EXPECT_EQ(s.model_path, In("robot.xml"));  // absolute: taken as it is
  EXPECT_EQ(s.duration_s, 6);
  EXPECT_EQ(s.dt_s, 0.0005);
  EXPECT_EQ(s.solver_iterations, 20);
  EXPECT_FALSE(s.sensor_noise);

  EXPECT_EQ(s.terrain.kind, sim::TerrainKind::kProfile);
  EXPECT_EQ(s.terrain.start_x_m, 1.5);
  EXPECT_EQ(s.terrain.width_m, 4);
  // Segments in file order, across the four element names and two on one line.
  ASSERT_EQ(s.terrain.segments.size(), 5u);
  const std::vector<std::pair<sim::SegmentKind, std::pair<double, double>>> segments = {
      {sim::SegmentKind::kRamp, {2, 0.2}},
      {sim::SegmentKind::kPlateau, {1, 0}},
      {sim::SegmentKind::kBump, {0.5, 0.03}},
      {sim::SegmentKind::kCurb, {0, -0.04}},
      {sim::SegmentKind::kRamp, {1, -0.1}}};
  for (std::size_t i = 0; i < segments.size(); ++i) {
    EXPECT_EQ(s.terrain.segments[i].kind, segments[i].first) << i;
    EXPECT_EQ(s.terrain.segments[i].length_m, segments[i].second.first) << i;
    EXPECT_EQ(s.terrain.segments[i].height_m, segments[i].second.second) << i;
  }
  ASSERT_EQ(s.terrain.friction_regions.size(), 2u);
  EXPECT_EQ(s.terrain.friction_regions[0].start_x_m, 2);
  EXPECT_EQ(s.terrain.friction_regions[0].end_x_m, 3.5);
  EXPECT_EQ(s.terrain.friction_regions[0].friction, 0.2);
  EXPECT_EQ(s.terrain.friction_regions[1].start_x_m, 5);
  EXPECT_EQ(s.terrain.friction_regions[1].end_x_m, 6);
  EXPECT_EQ(s.terrain.friction_regions[1].friction, 0.9);

  EXPECT_EQ(s.initial.x_m, -0.5);
  EXPECT_EQ(s.initial.speed_m_s, 0.25);
  EXPECT_NEAR(s.initial.pitch_rad, 0.05235987755982988, 1e-15);  // 3° = π/60 rad

  // Pushes in start order; the two at 1 s keep their file order.
  ASSERT_EQ(s.pushes.size(), 3u);
  EXPECT_EQ(s.pushes[0].shape, sim::PushShape::kHalfSine);
  EXPECT_EQ(s.pushes[0].start_s, 1);
  EXPECT_EQ(s.pushes[0].peak_N, -80);
  EXPECT_EQ(s.pushes[0].duration_s, 0.25);
  EXPECT_EQ(s.pushes[0].height_m, -0.05);  // the outline's bottom is allowed
  EXPECT_EQ(s.pushes[1].shape, sim::PushShape::kImpulse);
  EXPECT_EQ(s.pushes[1].peak_N, 60);
  EXPECT_EQ(s.pushes[1].height_m, 0.3);  // absent: the robot's com_height_m
  EXPECT_EQ(s.pushes[2].shape, sim::PushShape::kStep);
  EXPECT_EQ(s.pushes[2].start_s, 3);
  EXPECT_EQ(s.pushes[2].duration_s, kInf);  // a step without duration_s lasts to the end
  EXPECT_EQ(s.pushes[2].direction_deg, 90);
  EXPECT_EQ(s.pushes[2].height_m, 0.5);

  // The jump to 0.1 m reaches the front travel limit exactly, which is allowed.
  ASSERT_EQ(s.payload_shifts.size(), 2u);
  EXPECT_EQ(s.payload_shifts[0].start_s, 0.5);
  EXPECT_EQ(s.payload_shifts[0].distance_m, 0.1);
  EXPECT_EQ(s.payload_shifts[0].duration_s, 0);
  EXPECT_EQ(s.payload_shifts[1].start_s, 2);
  EXPECT_EQ(s.payload_shifts[1].distance_m, -0.1);
  EXPECT_EQ(s.payload_shifts[1].duration_s, 0.4);

  ASSERT_EQ(s.drives.size(), 2u);
  EXPECT_EQ(s.drives[0].start_s, 0);
  EXPECT_EQ(s.drives[0].speed_m_s, 1.2);
  EXPECT_NEAR(s.drives[0].yaw_rate_rad_s, 0.7853981633974483, 1e-15);  // 45°/s = π/4 rad/s
  EXPECT_EQ(s.drives[0].ramp_s, 1.5);
  EXPECT_EQ(s.drives[1].start_s, 4);
  EXPECT_EQ(s.drives[1].speed_m_s, -0.5);
  EXPECT_EQ(s.drives[1].yaw_rate_rad_s, 0);
  EXPECT_EQ(s.drives[1].ramp_s, 0);

  ASSERT_EQ(s.motor_faults.size(), 2u);
  EXPECT_EQ(s.motor_faults[0].start_s, 2.5);
  EXPECT_EQ(s.motor_faults[0].side, sim::MotorSide::kRight);
  EXPECT_EQ(s.motor_faults[0].torque_scale, 0.5);
  EXPECT_EQ(s.motor_faults[1].start_s, 4.5);
  EXPECT_EQ(s.motor_faults[1].side, sim::MotorSide::kBoth);
  EXPECT_EQ(s.motor_faults[1].torque_scale, 0);

  ASSERT_EQ(s.sensor_faults.size(), 2u);
  EXPECT_EQ(s.sensor_faults[0].start_s, 2);
  EXPECT_EQ(s.sensor_faults[0].channel, sim::SensorChannel::kGyroY);
  EXPECT_EQ(s.sensor_faults[0].kind, sim::SensorFaultKind::kBias);
  EXPECT_EQ(s.sensor_faults[0].value, 0.02);
  EXPECT_EQ(s.sensor_faults[0].duration_s, 1);
  EXPECT_EQ(s.sensor_faults[1].start_s, 3);
  EXPECT_EQ(s.sensor_faults[1].channel, sim::SensorChannel::kEncoderLeft);
  EXPECT_EQ(s.sensor_faults[1].kind, sim::SensorFaultKind::kStuck);
  EXPECT_EQ(s.sensor_faults[1].duration_s, kInf);  // absent: to the end

  ASSERT_EQ(s.controllers.size(), 2u);
  EXPECT_EQ(s.controllers[0].name, "lqr");
  EXPECT_EQ(s.controllers[0].module, "lqr");
  EXPECT_TRUE(s.controllers[0].builtin);
  EXPECT_EQ(s.controllers[0].rate_hz, 100);
  EXPECT_TRUE(s.controllers[0].true_state);
  EXPECT_EQ(s.controllers[0].config, (std::vector<std::pair<std::string, std::string>>{
                                         {"q_theta", "10"}, {"r", ""}, {"mode", "fast"}}));
  EXPECT_EQ(s.controllers[1].name, "mine");
  EXPECT_EQ(s.controllers[1].module, In("modules/mine.so"));
  EXPECT_FALSE(s.controllers[1].builtin);
  EXPECT_EQ(s.controllers[1].rate_hz, 0);
  EXPECT_FALSE(s.controllers[1].true_state);
  EXPECT_EQ(s.baseline, 1u);

  EXPECT_EQ(s.seeds, (std::vector<std::uint64_t>{7, 8, 9}));
  EXPECT_EQ(s.metrics.fall_tilt_deg, 30);
  EXPECT_EQ(s.metrics.tilt_band_deg, 0.5);
  EXPECT_EQ(s.metrics.drift_band_m, 0.1);
  EXPECT_EQ(s.metrics.window_s, 2.5);
  EXPECT_EQ(s.metrics.slip_threshold, 0.2);
}

TEST_F(ScenarioFileTest, LoadsADemoScenario) {
  const std::string path =
      std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/courier-shove-half-sine.xml";
  const ScenarioLoadResult result = LoadScenarioFile(path);
  ASSERT_TRUE(result) << result.error()[0].ToString();
  const Scenario& s = *result;
  EXPECT_EQ(s.name, "courier-shove-half-sine");
  EXPECT_EQ(s.path, path);
  EXPECT_EQ(s.model_path, std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/../models/courier.xml");
  EXPECT_EQ(s.model.name, "courier");
  EXPECT_EQ(s.duration_s, 8);
  ASSERT_EQ(s.pushes.size(), 1u);
  EXPECT_EQ(s.pushes[0].shape, sim::PushShape::kHalfSine);
  ASSERT_EQ(s.controllers.size(), 4u);
  const Lines names = {s.controllers[0].name, s.controllers[1].name, s.controllers[2].name,
                       s.controllers[3].name};
  EXPECT_EQ(names, (Lines{"lqr", "hinf", "lqg", "pid"}));
  EXPECT_EQ(s.baseline, 0u);
  EXPECT_FALSE(s.description.empty());
}

// Every file of the demo suite loads, names itself after its file, and compares at least the four
// built-ins with LQR as the baseline (what the README promises of the demo).
TEST_F(ScenarioFileTest, EveryDemoScenarioLoadsAndComparesTheFourBuiltIns) {
  int files = 0;
  for (const auto& entry :
       std::filesystem::directory_iterator(std::string(UPRIGHT_SOURCE_DIR) + "/scenarios")) {
    if (entry.path().extension() != ".xml") continue;
    ++files;
    const ScenarioLoadResult result = LoadScenarioFile(entry.path().string());
    ASSERT_TRUE(result) << result.error()[0].ToString();
    const Scenario& s = *result;
    EXPECT_EQ(s.name + ".xml", entry.path().filename().string());
    EXPECT_EQ(s.controllers.at(s.baseline).module, "lqr") << s.name;
    for (const char* builtin : {"lqr", "hinf", "lqg", "pid"}) {
      EXPECT_TRUE(std::any_of(s.controllers.begin(), s.controllers.end(),
                              [&](const ControllerEntry& c) { return c.module == builtin; }))
          << s.name << " lacks " << builtin;
    }
  }
  EXPECT_GE(files, 10);
}

// The short example in scenarios/README.md reads cleanly but for its module file, which is the
// reader's own to build.
TEST_F(ScenarioFileTest, ReadmeExampleIsValidButForItsModuleFile) {
  const std::string scenarios = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";
  std::ifstream readme(scenarios + "/README.md");
  ASSERT_TRUE(readme.good());
  const std::string text((std::istreambuf_iterator<char>(readme)),
                         std::istreambuf_iterator<char>());
  const std::size_t begin = text.find("```xml\n");
  ASSERT_NE(begin, std::string::npos);
  const std::size_t end = text.find("```", begin + 7);
  ASSERT_NE(end, std::string::npos);
  const std::string example = text.substr(begin + 7, end - begin - 7);
  const ScenarioLoadResult result = ParseScenarioText(example, "README.md", scenarios);
  ASSERT_FALSE(result);
  Lines errors;
  for (const model::FileError& error : result.error()) errors.push_back(error.ToString());
  EXPECT_EQ(errors, Lines{"README.md:16: controllers/controller file = '../build/my_module.so': "
                          "no such file (resolved to '" +
                          scenarios + "/../build/my_module.so')"});
}

TEST_F(ScenarioFileTest, ResolvesRelativePathsAgainstTheScenarioFolder) {
  WriteFile(dir_ / "sub" / "s.xml",
            Edit("robot.xml", "../robot.xml",
                 Controllers(R"(    <controller name="mine" file="mods/c.so"/>)")));
  WriteFile(dir_ / "sub" / "mods" / "c.so", "stand-in");
  const std::string path = In("sub/s.xml");
  const ScenarioLoadResult result = LoadScenarioFile(path);
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->path, path);
  EXPECT_EQ(result->model_path, In("sub/../robot.xml"));
  EXPECT_EQ(result->model.name, "testbot");
  EXPECT_EQ(result->controllers[0].module, In("sub/mods/c.so"));
}

TEST_F(ScenarioFileTest, TakesPathsFromTheWorkingFolderWithoutABaseFolder) {
  const ScenarioLoadResult result = ParseScenarioText(
      Edit(R"(file="robot.xml")", R"(file=")" + In("robot.xml") + R"(")"), "t.xml", "");
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->model_path, In("robot.xml"));
  const ScenarioLoadResult relative = ParseScenarioText(std::string(kBase), "t.xml", "");
  ASSERT_FALSE(relative);
  EXPECT_EQ(relative.error().at(0).ToString(),
            "t.xml:3: robot file = 'robot.xml': no such file (resolved to 'robot.xml')");
}

// ---------------------------------------------------------------------------------------------
// The root element and its run settings.

TEST_F(ScenarioFileTest, RejectsAnotherRootElement) {
  EXPECT_EQ(Errors(R"(<balancer name="x" schema="2"/>)"),
            Lines{"t.xml:1: root element is <balancer>, expected <scenario>"});
}

TEST_F(ScenarioFileTest, RejectsUnsupportedSchema) {
  EXPECT_EQ(Errors(Edit(R"(schema="1")", R"(schema="2")")),
            Lines{"t.xml:1: scenario schema = 2: unsupported schema version (supported: 1)"});
}

TEST_F(ScenarioFileTest, RequiresSchema) {
  EXPECT_EQ(Errors(Edit(R"( schema="1")", "")),
            Lines{"t.xml:1: scenario: missing required attribute 'schema'"});
}

TEST_F(ScenarioFileTest, RequiresName) {
  EXPECT_EQ(Errors(Edit(R"(name="t" )", "")),
            Lines{"t.xml:1: scenario: missing required attribute 'name'"});
}

TEST_F(ScenarioFileTest, RejectsNamesUnfitForFiles) {
  const std::string rule =
      ": must be letters, digits, '.', '_' or '-' (not '.' or '..'), since it names files";
  EXPECT_EQ(Errors(Edit(R"(name="t")", R"(name="a/b")")),
            Lines{"t.xml:1: scenario name = 'a/b'" + rule});
  EXPECT_EQ(Errors(Edit(R"(name="t")", R"(name="two words")")),
            Lines{"t.xml:1: scenario name = 'two words'" + rule});
  EXPECT_EQ(Errors(Edit(R"(name="t")", R"(name="..")")),
            Lines{"t.xml:1: scenario name = '..'" + rule});
  EXPECT_EQ(Errors(Edit(R"(name="t")", R"(name="")")), Lines{"t.xml:1: scenario name = ''" + rule});
  // A newline and a terminal's set-title sequence (character references) are printed escaped,
  // so the problem stays on its line and nothing reaches the terminal.
  EXPECT_EQ(Errors(Edit(R"(name="t")", R"(name="a&#10;b&#27;]0;x&#7;")")),
            Lines{"t.xml:1: scenario name = 'a\\nb\\x1b]0;x\\x07'" + rule});
}

TEST_F(ScenarioFileTest, RequiresPositiveDuration) {
  EXPECT_EQ(Errors(Root(R"(dt_s="0.001")")),
            Lines{"t.xml:1: scenario: missing required attribute 'duration_s'"});
  EXPECT_EQ(Errors(Root(R"(duration_s="0")")),
            Lines{"t.xml:1: scenario duration_s = 0: must be > 0"});
  EXPECT_EQ(Errors(Root(R"(duration_s="-2")")),
            Lines{"t.xml:1: scenario duration_s = -2: must be > 0"});
}

TEST_F(ScenarioFileTest, RequiresDurationOfWholeSteps) {
  EXPECT_EQ(Errors(Root(R"(duration_s="8.0005" dt_s="0.001")")),
            Lines{"t.xml:1: scenario duration_s = 8.0005: must be a whole number of physics "
                  "steps of dt_s = 0.001 (it is 8000.5 steps)"});
  // 2.3 / 0.005 = 459.99999999999994 in binary: within 1e-9 relative of 460, so accepted.
  const ScenarioLoadResult result = Parse(Root(R"(duration_s="2.3" dt_s="0.005")"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->duration_s, 2.3);
}

TEST_F(ScenarioFileTest, RequiresTimeStepUpToTenMilliseconds) {
  EXPECT_EQ(Errors(Root(R"(duration_s="8" dt_s="0.02")")),
            Lines{"t.xml:1: scenario dt_s = 0.02: must be in (0, 0.01]; the field is in seconds: "
                  "0.02 ms is 0.00002"});
  EXPECT_EQ(Errors(Root(R"(duration_s="8" dt_s="0")")),
            Lines{"t.xml:1: scenario dt_s = 0: must be in (0, 0.01]"});
  const ScenarioLoadResult result = Parse(Root(R"(duration_s="8")"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->dt_s, 0.001);  // default
}

TEST_F(ScenarioFileTest, HintsThatATimeStepTooLongIsInSeconds) {
  EXPECT_EQ(Errors(Root(R"(duration_s="8" dt_s="1")")),
            Lines{"t.xml:1: scenario dt_s = 1: must be in (0, 0.01]; the field is in seconds: 1 "
                  "ms is 0.001"});
}

TEST_F(ScenarioFileTest, DefaultStepIsTheOneModelFilesAreCheckedAgainst) {
  const Scenario defaults;  // a named object: GCC 12 warns falsely on a temporary's string members
  EXPECT_EQ(defaults.dt_s, model::kDefaultPhysicsStep_s);
  EXPECT_EQ(sim::PlantOptions{}.dt_s, model::kDefaultPhysicsStep_s);
}

TEST_F(ScenarioFileTest, ChecksTheRobotRatesAgainstItsOwnStep) {
  // An IMU at 400 Hz: 2.5 steps of the default 1 ms, which a model file alone is refused for;
  // 5 steps of a scenario's own 0.5 ms.
  std::string robot(kTestRobot);
  robot.replace(robot.find(R"(<imu rate_hz="500")"), 18, R"(<imu rate_hz="400")");
  WriteFile(dir_ / "robot400.xml", robot);
  const std::string scenario = Edit("robot.xml", "robot400.xml");
  const ScenarioLoadResult own = Parse(Root(R"(duration_s="8" dt_s="0.0005")", scenario));
  EXPECT_TRUE(own) << own.error()[0].ToString();
  EXPECT_EQ(Errors(scenario),
            Lines{"t.xml:1: scenario dt_s = 0.001: the IMU period of robot 'testbot' "
                  "(robot400.xml) (imu rate_hz = 400) must be a whole number of physics steps, or "
                  "the IMU at least as fast as the physics"});
}

TEST_F(ScenarioFileTest, BoundsARunToTenMillionSteps) {
  // Exactly 1e7 steps of 1 ms is a run; one step more is refused before any memory is taken
  // (1e5 s at 1 ms once ran without end, holding its whole trace).
  EXPECT_TRUE(Parse(Root(R"(duration_s="10000" dt_s="0.001")")).has_value());
  EXPECT_EQ(Errors(Root(R"(duration_s="10000.001" dt_s="0.001")")),
            Lines{"t.xml:1: scenario duration_s = 10000.001: is 10000001 physics steps of dt_s = "
                  "0.001; a run takes at most 1e7 (its metrics and trace are held in memory): "
                  "shorten it or lengthen dt_s"});
  EXPECT_EQ(Errors(Root(R"(duration_s="100000" dt_s="0.001")")).size(), 1u);
  // A tiny step makes as many steps of a short run.
  EXPECT_EQ(Errors(Root(R"(duration_s="8" dt_s="1e-10")")).size(), 1u);
}

TEST_F(ScenarioFileTest, RequiresRobotRatesOfWholeSteps) {
  // Control 200 Hz at 3 ms: 1.67 steps a period.
  EXPECT_EQ(Errors(Root(R"(duration_s="3" dt_s="0.003")")),
            Lines{"t.xml:1: scenario dt_s = 0.003: the control period of robot 'testbot' "
                  "(robot.xml) (control rate_hz = 200) must be a whole number of physics steps"});
  // Control 200 Hz at 1.25 ms: 4 steps; IMU 500 Hz: 1.6 steps, and slower than the physics.
  EXPECT_EQ(Errors(Root(R"(duration_s="8" dt_s="0.00125")")),
            Lines{"t.xml:1: scenario dt_s = 0.00125: the IMU period of robot 'testbot' "
                  "(robot.xml) (imu rate_hz = 500) must be a whole number of physics steps, or "
                  "the IMU at least as fast as the physics"});
}

TEST_F(ScenarioFileTest, RequiresSolverIterationsFromOneToAThousand) {
  EXPECT_EQ(Errors(Edit(R"(dt_s="0.001")", R"(dt_s="0.001" solver_iterations="0")")),
            Lines{"t.xml:1: scenario solver_iterations = 0: must be in [1, 1000]"});
  EXPECT_EQ(Errors(Edit(R"(dt_s="0.001")", R"(dt_s="0.001" solver_iterations="1001")")),
            Lines{"t.xml:1: scenario solver_iterations = 1001: must be in [1, 1000]"});
  EXPECT_EQ(Errors(Edit(R"(dt_s="0.001")", R"(dt_s="0.001" solver_iterations="2.5")")),
            Lines{"t.xml:1: scenario solver_iterations = '2.5': not a whole number (expected "
                  "digits such as 42)"});
}

TEST_F(ScenarioFileTest, RequiresBooleanSensorNoise) {
  EXPECT_EQ(Errors(Edit(R"(dt_s="0.001")", R"(dt_s="0.001" sensor_noise="yes")")),
            Lines{"t.xml:1: scenario sensor_noise = 'yes': not a known value (expected one of: "
                  "false, true)"});
}

TEST_F(ScenarioFileTest, RequiresDescriptionText) {
  EXPECT_EQ(Errors(Edit("  <description>A test situation.</description>\n", "")),
            Lines{"t.xml:1: scenario: missing required element <description>"});
  EXPECT_EQ(Errors(Edit("A test situation.", "  ")),
            Lines{"t.xml:2: description: empty (expected one or two sentences saying what the "
                  "scenario represents)"});
  EXPECT_EQ(Errors(Edit("A test situation.", "A <b>bold</b> claim.")),
            Lines{"t.xml:2: description: unknown element <b> (this element takes no child "
                  "elements)"});
}

TEST_F(ScenarioFileTest, ReportsUnknownAttributesAndElements) {
  EXPECT_EQ(Errors(Edit(R"(dt_s="0.001")", R"(dt_s="0.001" colour="red")")),
            Lines{"t.xml:1: scenario: unknown attribute 'colour' (expected one of: schema, name, "
                  "dt_s, duration_s, solver_iterations, sensor_noise)"});
  EXPECT_EQ(Errors(Before("  <weather rain=\"1\"/>")),
            Lines{"t.xml:4: scenario: unknown element <weather> (expected one of: description, "
                  "robot, ground, start, timeline, controllers, seeds, metrics, dispersions)"});
  EXPECT_EQ(Errors(Edit(R"(duration_s="0.1"/>)", R"(duration_s="0.1" force_N="3"/>)")),
            Lines{"t.xml:5: timeline/push: unknown attribute 'force_N' (expected one of: at_s, "
                  "shape, peak_N, duration_s, direction_deg, height_m)"});
  EXPECT_EQ(Errors(Events(R"(    <brake at_s="1"/>)")),
            Lines{"t.xml:5: timeline: unknown element <brake> (expected one of: push, "
                  "payload_shift, drive, motor_fault, sensor_fault)"});
  EXPECT_EQ(
      Errors(Edit("</scenario>", "  <seeds list=\"1\"/>\n  <seeds list=\"2\"/>\n</scenario>")),
      Lines{"t.xml:11: scenario: duplicate element <seeds> (first at line 10)"});
}

TEST_F(ScenarioFileTest, ReportsMalformedXml) {
  const Lines errors = Errors(Edit(R"(<robot file="robot.xml"/>)", R"(<robot file="robot.xml">)"));
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].rfind("t.xml:", 0), 0u) << errors[0];
  EXPECT_NE(errors[0].find(": malformed XML: "), std::string::npos) << errors[0];
}

TEST_F(ScenarioFileTest, ReportsMissingFile) {
  const ScenarioLoadResult result = LoadScenarioFile(In("none.xml"));
  ASSERT_FALSE(result);
  ASSERT_EQ(result.error().size(), 1u);
  EXPECT_EQ(result.error()[0].ToString(),
            In("none.xml") + ": cannot open file: No such file or directory");
}

TEST_F(ScenarioFileTest, ReportsEveryProblemInOnePass) {
  std::string text = Edit(R"(name="t")", R"(name="a b")");
  text = Edit(R"(duration_s="8")", R"(duration_s="0")", text);
  text = Edit(R"(shape="impulse")", R"(shape="sine")", text);
  text = Edit(R"(builtin="lqr")", R"(builtin="mpc")", text);
  EXPECT_EQ(Errors(text),
            (Lines{"t.xml:1: scenario name = 'a b': must be letters, digits, '.', '_' or '-' (not "
                   "'.' or '..'), since it names files",
                   "t.xml:1: scenario duration_s = 0: must be > 0",
                   "t.xml:5: timeline/push shape = 'sine': not a known value (expected one of: "
                   "impulse, step, half-sine)",
                   "t.xml:8: controllers/controller builtin = 'mpc': not a known value (expected "
                   "one of: lqr, hinf, lqg, pid)"}));
}

// ---------------------------------------------------------------------------------------------
// The robot.

TEST_F(ScenarioFileTest, RequiresRobot) {
  EXPECT_EQ(Errors(Edit("  <robot file=\"robot.xml\"/>\n", "")),
            Lines{"t.xml:1: scenario: missing required element <robot>"});
  EXPECT_EQ(Errors(Edit(R"(<robot file="robot.xml"/>)", "<robot/>")),
            Lines{"t.xml:3: robot: missing required attribute 'file'"});
}

TEST_F(ScenarioFileTest, ReportsMissingRobotFileWithResolvedPath) {
  EXPECT_EQ(Errors(Edit("robot.xml", "nope.xml")),
            Lines{"t.xml:3: robot file = 'nope.xml': no such file (resolved to '" + In("nope.xml") +
                  "')"});
}

TEST_F(ScenarioFileTest, PassesRobotModelErrorsThroughAfterItsOwn) {
  std::string text = Edit("robot.xml", "broken.xml");
  text = Edit(R"(builtin="lqr")", R"(builtin="mpc")", text);
  EXPECT_EQ(Errors(text),
            (Lines{"t.xml:3: robot file = 'broken.xml': the robot model has 1 problem (listed "
                   "after this file's)",
                   "t.xml:8: controllers/controller builtin = 'mpc': not a known value (expected "
                   "one of: lqr, hinf, lqg, pid)",
                   In("broken.xml") + ":2: chassis mass_kg = -3: must be in (0, 1000]"}));
}

// ---------------------------------------------------------------------------------------------
// The ground.

TEST_F(ScenarioFileTest, ReadsSlope) {
  const ScenarioLoadResult result = Parse(Before(R"(  <ground kind="slope" slope_deg="-5"/>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->terrain.kind, sim::TerrainKind::kSlope);
  EXPECT_EQ(result->terrain.slope_deg, -5);
}

TEST_F(ScenarioFileTest, RequiresSlopeAngleOnlyWithSlope) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="slope"/>)")),
            Lines{"t.xml:4: ground: missing attribute 'slope_deg' (required with kind = 'slope')"});
  EXPECT_EQ(Errors(Before(R"(  <ground slope_deg="5"/>)")),
            Lines{"t.xml:4: ground slope_deg = 5: only with kind = 'slope' (kind is 'flat')"});
  EXPECT_EQ(
      Errors(Before(R"(  <ground kind="profile" slope_deg="5"><plateau length_m="1"/></ground>)")),
      Lines{"t.xml:4: ground slope_deg = 5: only with kind = 'slope' (kind is 'profile')"});
}

TEST_F(ScenarioFileTest, AllowsProfilePlacementOnlyWithProfile) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="slope" slope_deg="5" start_x_m="2"/>)")),
            Lines{"t.xml:4: ground start_x_m = 2: only with kind = 'profile' (kind is 'slope')"});
  EXPECT_EQ(Errors(Before(R"(  <ground width_m="3"/>)")),
            Lines{"t.xml:4: ground width_m = 3: only with kind = 'profile' (kind is 'flat')"});
}

TEST_F(ScenarioFileTest, ReportsTerrainRulesOfTheSim) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="slope" slope_deg="50"/>)")),
            Lines{"t.xml:4: ground: Terrain::slope_deg = 50, must be in (-45, 45)"});
  EXPECT_EQ(
      Errors(Before(R"(  <ground kind="profile" width_m="0"><plateau length_m="1"/></ground>)")),
      Lines{"t.xml:4: ground: Terrain::width_m = 0, must be > 0"});
}

TEST_F(ScenarioFileTest, RejectsUnknownTerrainKind) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="hill" slope_deg="5"/>)")),
            Lines{"t.xml:4: ground kind = 'hill': not a known value (expected one of: flat, "
                  "slope, profile)"});
}

TEST_F(ScenarioFileTest, RequiresSegmentsForProfileAndOnlyThere) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="profile"/>)")),
            Lines{"t.xml:4: ground: kind = 'profile' needs at least one segment: <ramp>, "
                  "<plateau>, <bump> or <curb>"});
  EXPECT_EQ(Errors(Before(R"(  <ground kind="slope" slope_deg="3">
    <plateau length_m="1"/>
    <ramp length_m="1" height_m="0.1"/>
  </ground>)")),
            Lines{"t.xml:5: ground/plateau: profile segments need kind = 'profile' on <ground> "
                  "(kind is 'slope')"});
}

TEST_F(ScenarioFileTest, ReportsSegmentRulesAtTheSegmentLine) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="profile">
    <plateau length_m="1"/> <ramp length_m="0.5" height_m="0.6"/>
    <curb height_m="0.05"/>
    <bump length_m="0" height_m="0.05"/>
  </ground>)")),
            (Lines{"t.xml:5: ground/ramp: Terrain::segments[1].height_m = 0.6, a ramp must be "
                   "less steep than 45 degrees",
                   "t.xml:7: ground/bump: Terrain::segments[3].length_m = 0, must be > 0"}));
}

TEST_F(ScenarioFileTest, ReadsOnlyTheAttributesEachSegmentHas) {
  EXPECT_EQ(Errors(Before(R"(  <ground kind="profile">
    <bump length_m="0.5"/>
    <curb length_m="0.1" height_m="0.05"/>
    <plateau length_m="1" height_m="0.1"/>
  </ground>)")),
            (Lines{"t.xml:5: ground/bump: missing required attribute 'height_m'",
                   "t.xml:6: ground/curb: unknown attribute 'length_m' (expected one of: "
                   "height_m)",
                   "t.xml:7: ground/plateau: unknown attribute 'height_m' (expected one of: "
                   "length_m)"}));
  EXPECT_EQ(Errors(Before(R"(  <ground><hill/></ground>)")),
            Lines{"t.xml:4: ground: unknown element <hill> (expected one of: ramp, plateau, "
                  "bump, curb, friction)"});
}

TEST_F(ScenarioFileTest, ReadsFrictionRegionsOnAnyGroundAndChecksThem) {
  const ScenarioLoadResult result =
      Parse(Before(R"(  <ground><friction start_x_m="1" end_x_m="2" friction="0.1"/></ground>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  ASSERT_EQ(result->terrain.friction_regions.size(), 1u);
  EXPECT_EQ(result->terrain.friction_regions[0].friction, 0.1);
  EXPECT_EQ(Errors(Before(R"(  <ground>
    <friction start_x_m="2" end_x_m="1" friction="0.5"/>
    <friction start_x_m="3" end_x_m="4" friction="4"/>
    <friction start_x_m="5" friction="0.5"/>
  </ground>)")),
            (Lines{"t.xml:5: ground/friction: Terrain::friction_regions[0].end_x_m = 1, must be "
                   "finite and > start_x_m = 2",
                   "t.xml:6: ground/friction: Terrain::friction_regions[1].friction = 4, must be "
                   "in [0, 3]",
                   "t.xml:7: ground/friction: missing required attribute 'end_x_m'"}));
}

// ---------------------------------------------------------------------------------------------
// The start.

TEST_F(ScenarioFileTest, RequiresStartPitchWithinAQuarterTurn) {
  EXPECT_EQ(Errors(Before(R"(  <start pitch_deg="90"/>)")),
            Lines{"t.xml:4: start pitch_deg = 90: must be in (-90, 90)"});
  const ScenarioLoadResult result = Parse(Before(R"(  <start pitch_deg="-10"/>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_NEAR(result->initial.pitch_rad, -0.17453292519943295, 1e-15);  // -π/18
}

// ---------------------------------------------------------------------------------------------
// The timeline.

TEST_F(ScenarioFileTest, RequiresEventTimesWithinTheRun) {
  EXPECT_EQ(Errors(Events(R"(    <push at_s="8" shape="impulse" peak_N="1" duration_s="0.1"/>
    <payload_shift at_s="8.5" distance_m="0.01"/>
    <drive at_s="-1"/>
    <motor_fault at_s="9" side="left" torque_scale="0"/>
    <sensor_fault at_s="8" channel="gyro_y" kind="dropout"/>)")),
            (Lines{"t.xml:5: timeline/push at_s = 8: must be in [0, 8) (the scenario's duration_s)",
                   "t.xml:6: timeline/payload_shift at_s = 8.5: must be in [0, 8) (the "
                   "scenario's duration_s)",
                   "t.xml:7: timeline/drive at_s = -1: must be in [0, 8) (the scenario's "
                   "duration_s)",
                   "t.xml:8: timeline/motor_fault at_s = 9: must be in [0, 8) (the scenario's "
                   "duration_s)",
                   "t.xml:9: timeline/sensor_fault at_s = 8: must be in [0, 8) (the scenario's "
                   "duration_s)"}));
  EXPECT_EQ(Errors(Events(R"(    <drive speed_m_s="1"/>)")),
            Lines{"t.xml:5: timeline/drive: missing required attribute 'at_s'"});
}

TEST_F(ScenarioFileTest, ChecksPushFields) {
  EXPECT_EQ(Errors(Events(R"(    <push at_s="1" shape="sine" peak_N="1" duration_s="0.1"/>)")),
            Lines{"t.xml:5: timeline/push shape = 'sine': not a known value (expected one of: "
                  "impulse, step, half-sine)"});
  EXPECT_EQ(Errors(Events(R"(    <push at_s="1" shape="half-sine" peak_N="1"/>)")),
            Lines{"t.xml:5: timeline/push: missing required attribute 'duration_s'"});
  EXPECT_EQ(Errors(Events(R"(    <push at_s="1" shape="impulse" duration_s="0.1"/>)")),
            Lines{"t.xml:5: timeline/push: missing required attribute 'peak_N'"});
  EXPECT_EQ(Errors(Events(R"(    <push at_s="1" shape="impulse" peak_N="1" duration_s="0"/>)")),
            Lines{"t.xml:5: timeline/push: Push::duration_s = 0, must be > 0"});
}

TEST_F(ScenarioFileTest, RequiresPushHeightWithinTheOutline) {
  const std::string rule =
      ": must be within the chassis outline [-0.05, 0.6] of robot 'testbot' (robot.xml) "
      "(bottom_m to top_m, above the axle)";
  EXPECT_EQ(Errors(Events(R"(    <push at_s="1" shape="step" peak_N="1" height_m="0.61"/>)")),
            Lines{"t.xml:5: timeline/push height_m = 0.61" + rule});
  EXPECT_EQ(Errors(Events(R"(    <push at_s="1" shape="step" peak_N="1" height_m="-0.06"/>)")),
            Lines{"t.xml:5: timeline/push height_m = -0.06" + rule});
  EXPECT_TRUE(
      Parse(Events(R"(    <push at_s="1" shape="step" peak_N="1" height_m="0.6"/>)")).has_value());
}

TEST_F(ScenarioFileTest, RequiresPayloadForPayloadShift) {
  EXPECT_EQ(
      Errors(Edit("robot.xml", "bare.xml", Events(R"(    <payload_shift at_s="1" distance_m="0.05"/>
    <payload_shift at_s="2" distance_m="-0.05"/>)"))),
      Lines{"t.xml:5: timeline/payload_shift: robot 'barebot' (bare.xml) has no payload to "
            "shift"});
}

TEST_F(ScenarioFileTest, RejectsPayloadTargetBeyondTheTravel) {
  const std::string rule =
      " m of robot 'testbot' (robot.xml) (the plant would clamp it; the scenario is refused "
      "instead)";
  // Ends back at home, but reaches 0.12 m once the second shift is done.
  EXPECT_EQ(Errors(Events(R"(    <payload_shift at_s="0" distance_m="0.06" duration_s="1"/>
    <payload_shift at_s="1" distance_m="0.06" duration_s="1"/>
    <payload_shift at_s="2" distance_m="-0.12" duration_s="1"/>)")),
            Lines{"t.xml:6: timeline/payload_shift distance_m = 0.06: the carriage target "
                  "reaches 0.12 m at t = 2 s, outside the travel [-0.1, 0.1]" +
                  rule});
  // A slide to 0.15 m over the first second, undone by a jump at 1 s (listed first): the
  // target is 0.15 m just before the jump.
  EXPECT_EQ(Errors(Events(R"(    <payload_shift at_s="1" distance_m="-0.1"/>
    <payload_shift at_s="0" distance_m="0.15" duration_s="1"/>)")),
            Lines{"t.xml:6: timeline/payload_shift distance_m = 0.15: the carriage target "
                  "reaches 0.15 m at t = 1 s, outside the travel [-0.1, 0.1]" +
                  rule});
  // -0.09 - 0.01 + 0.1 + 0.1 = 0.10000000000000002 in binary: at the limit, accepted.
  EXPECT_TRUE(Parse(Events(R"(    <payload_shift at_s="0" distance_m="-0.09"/>
    <payload_shift at_s="1" distance_m="-0.01"/>
    <payload_shift at_s="2" distance_m="0.1"/>
    <payload_shift at_s="3" distance_m="0.1"/>)"))
                  .has_value());
  // Just past the limit: the target is printed exactly, not rounded back onto the limit.
  EXPECT_EQ(Errors(Events(R"(    <payload_shift at_s="1" distance_m="0.1000001"/>)")),
            Lines{"t.xml:5: timeline/payload_shift distance_m = 0.1000001: the carriage target "
                  "reaches 0.1000001 m at t = 1 s, outside the travel [-0.1, 0.1]" +
                  rule});
}

TEST_F(ScenarioFileTest, ChecksPayloadShiftFields) {
  EXPECT_EQ(Errors(Events(R"(    <payload_shift at_s="1" distance_m="0.05" duration_s="-1"/>)")),
            Lines{"t.xml:5: timeline/payload_shift duration_s = -1: must be >= 0"});
  EXPECT_EQ(Errors(Events(R"(    <payload_shift at_s="1"/>)")),
            Lines{"t.xml:5: timeline/payload_shift: missing required attribute 'distance_m'"});
}

TEST_F(ScenarioFileTest, ChecksDriveFields) {
  EXPECT_EQ(Errors(Events(R"(    <drive at_s="1" speed_m_s="1" ramp_s="-1"/>)")),
            Lines{"t.xml:5: timeline/drive ramp_s = -1: must be >= 0"});
  EXPECT_EQ(Errors(Events(R"(    <drive at_s="1" yaw_rate_rad_s="1"/>)")),
            Lines{"t.xml:5: timeline/drive: unknown attribute 'yaw_rate_rad_s' (expected one of: "
                  "at_s, speed_m_s, yaw_rate_deg_s, ramp_s)"});
}

TEST_F(ScenarioFileTest, ChecksMotorFaultFields) {
  EXPECT_EQ(Errors(Events(R"(    <motor_fault at_s="1" side="middle" torque_scale="0"/>)")),
            Lines{"t.xml:5: timeline/motor_fault side = 'middle': not a known value (expected "
                  "one of: left, right, both)"});
  EXPECT_EQ(Errors(Events(R"(    <motor_fault at_s="1" side="left" torque_scale="1.5"/>)")),
            Lines{"t.xml:5: timeline/motor_fault torque_scale = 1.5: must be in [0, 1] (1 "
                  "healthy, 0 dead)"});
  EXPECT_EQ(Errors(Events(R"(    <motor_fault at_s="1" side="left"/>)")),
            Lines{"t.xml:5: timeline/motor_fault: missing required attribute 'torque_scale'"});
}

TEST_F(ScenarioFileTest, ChecksSensorFaultFields) {
  EXPECT_EQ(Errors(Events(R"(    <sensor_fault at_s="1" channel="gyro_w" kind="dropout"/>)")),
            Lines{"t.xml:5: timeline/sensor_fault channel = 'gyro_w': not a known value "
                  "(expected one of: gyro_x, gyro_y, gyro_z, accel_x, accel_y, accel_z, "
                  "encoder_left, encoder_right)"});
  EXPECT_EQ(Errors(Events(R"(    <sensor_fault at_s="1" channel="gyro_y" kind="drift"/>)")),
            Lines{"t.xml:5: timeline/sensor_fault kind = 'drift': not a known value (expected "
                  "one of: bias, dropout, stuck)"});
  EXPECT_EQ(
      Errors(Events(R"(    <sensor_fault at_s="1" channel="gyro_y" kind="dropout" value="0.1"/>)")),
      Lines{"t.xml:5: timeline/sensor_fault value = 0.1: only with kind = 'bias' (kind is "
            "'dropout')"});
  EXPECT_EQ(Errors(Events(R"(    <sensor_fault at_s="1" channel="gyro_y" kind="bias"/>)")),
            Lines{"t.xml:5: timeline/sensor_fault: missing required attribute 'value'"});
  EXPECT_EQ(Errors(Events(
                R"(    <sensor_fault at_s="1" channel="accel_x" kind="stuck" duration_s="0"/>)")),
            Lines{"t.xml:5: timeline/sensor_fault duration_s = 0: must be > 0 (leave it out for "
                  "a fault that lasts to the end)"});
}

// ---------------------------------------------------------------------------------------------
// The controllers.

TEST_F(ScenarioFileTest, RequiresAtLeastOneController) {
  EXPECT_EQ(Errors(Edit(std::string(kControllerLine) + "\n", "")),
            Lines{"t.xml:7: controllers: needs at least one <controller>"});
  EXPECT_EQ(
      Errors(Edit("  <controllers>\n" + std::string(kControllerLine) + "\n  </controllers>\n", "")),
      Lines{"t.xml:1: scenario: missing required element <controllers>"});
}

TEST_F(ScenarioFileTest, RequiresUniqueSafeControllerNames) {
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="lqr" builtin="lqr"/>
    <controller name="lqr" builtin="hinf"/>)")),
            Lines{"t.xml:9: controllers/controller name = 'lqr': given twice (first at line 8)"});
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="my ctrl" builtin="lqr"/>)")),
            Lines{"t.xml:8: controllers/controller name = 'my ctrl': must be letters, digits, "
                  "'.', '_' or '-' (not '.' or '..'), since it names files"});
  EXPECT_EQ(Errors(Controllers(R"(    <controller builtin="lqr"/>)")),
            Lines{"t.xml:8: controllers/controller: missing required attribute 'name'"});
}

TEST_F(ScenarioFileTest, RequiresExactlyOneOfBuiltinOrFile) {
  EXPECT_EQ(
      Errors(Controllers(R"(    <controller name="x" builtin="lqr" file="modules/mine.so"/>)")),
      Lines{"t.xml:8: controllers/controller: give exactly one of builtin or file (both given)"});
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x"/>)")),
            Lines{"t.xml:8: controllers/controller: give exactly one of builtin or file (neither "
                  "given)"});
}

TEST_F(ScenarioFileTest, AcceptsTheFourBuiltinNamesOnly) {
  const ScenarioLoadResult result = Parse(Controllers(R"(    <controller name="a" builtin="lqr"/>
    <controller name="b" builtin="hinf"/>
    <controller name="c" builtin="lqg"/>
    <controller name="d" builtin="pid"/>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  ASSERT_EQ(result->controllers.size(), 4u);
  EXPECT_EQ(result->controllers[1].module, "hinf");
  EXPECT_EQ(result->controllers[3].module, "pid");
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" builtin="mpc"/>)")),
            Lines{"t.xml:8: controllers/controller builtin = 'mpc': not a known value (expected "
                  "one of: lqr, hinf, lqg, pid)"});
}

TEST_F(ScenarioFileTest, ReportsMissingModuleFileWithResolvedPath) {
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" file="modules/none.so"/>)")),
            Lines{"t.xml:8: controllers/controller file = 'modules/none.so': no such file "
                  "(resolved to '" +
                  In("modules/none.so") + "')"});
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" file="modules"/>)")),
            Lines{"t.xml:8: controllers/controller file = 'modules': no such file (resolved to '" +
                  In("modules") + "')"});
}

TEST_F(ScenarioFileTest, ChoosesBaselineByNameOrTheFirst) {
  const std::string two = R"(    <controller name="a" builtin="lqr"/>
    <controller name="b" builtin="pid"/>)";
  EXPECT_EQ(Parse(Controllers(two)).value().baseline, 0u);
  const ScenarioLoadResult named =
      Parse(Edit("<controllers>", R"(<controllers baseline="b">)", Controllers(two)));
  ASSERT_TRUE(named) << named.error()[0].ToString();
  EXPECT_EQ(named->baseline, 1u);
  EXPECT_EQ(Errors(Edit("<controllers>", R"(<controllers baseline="c">)", Controllers(two))),
            Lines{"t.xml:7: controllers baseline = 'c': names no controller (expected one of: a, "
                  "b)"});
}

TEST_F(ScenarioFileTest, RequiresControllerRateOfWholeSteps) {
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" builtin="lqr" rate_hz="0"/>)")),
            Lines{"t.xml:8: controllers/controller rate_hz = 0: must be > 0 (leave it out for the "
                  "robot's control rate)"});
  const std::string rule =
      ": its period must be a whole number (>= 1) of physics steps of dt_s = 0.001";
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" builtin="lqr" rate_hz="300"/>)")),
            Lines{"t.xml:8: controllers/controller rate_hz = 300" + rule});
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" builtin="lqr" rate_hz="2000"/>)")),
            Lines{"t.xml:8: controllers/controller rate_hz = 2000" + rule});
  EXPECT_TRUE(
      Parse(Controllers(R"(    <controller name="x" builtin="lqr" rate_hz="250"/>)")).has_value());
  // A period as long as the 8 s run acts once; a longer one never would.
  EXPECT_TRUE(Parse(Controllers(R"(    <controller name="x" builtin="lqr" rate_hz="0.125"/>)"))
                  .has_value());
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" builtin="lqr" rate_hz="1e-300"/>)")),
            Lines{"t.xml:8: controllers/controller rate_hz = 1e-300: its period is longer than "
                  "the run (duration_s = 8): the controller would never act"});
}

TEST_F(ScenarioFileTest, RequiresUniqueSettingKeys) {
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="a" builtin="lqr">
      <setting key="r" value="1"/>
      <setting key="r" value="2"/>
    </controller>
    <controller name="b" builtin="lqr">
      <setting key="r" value="1"/>
    </controller>)")),
            Lines{"t.xml:10: controllers/controller/setting key = 'r': given twice in this "
                  "controller (first at line 9)"});
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="a" builtin="lqr">
      <setting key="" value="1"/>
      <setting key="q"/>
    </controller>)")),
            (Lines{"t.xml:9: controllers/controller/setting key = '': must not be empty",
                   "t.xml:10: controllers/controller/setting: missing required attribute "
                   "'value'"}));
}

TEST_F(ScenarioFileTest, RequiresBooleanTrueState) {
  EXPECT_EQ(Errors(Controllers(R"(    <controller name="x" builtin="lqr" true_state="1"/>)")),
            Lines{"t.xml:8: controllers/controller true_state = '1': not a known value (expected "
                  "one of: false, true)"});
}

// ---------------------------------------------------------------------------------------------
// Seeds and metric settings.

TEST_F(ScenarioFileTest, ReadsSeedList) {
  const ScenarioLoadResult result =
      Parse(Tail("  <seeds list=\" 5\n   3  18446744073709551615\"/>"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->seeds,
            (std::vector<std::uint64_t>{5, 3, 18446744073709551615ull}));  // in the order given
}

TEST_F(ScenarioFileTest, RequiresPositiveUniqueSeeds) {
  EXPECT_EQ(Errors(Tail(R"(  <seeds list="1 2 1"/>)")),
            Lines{"t.xml:10: seeds list = '1 2 1': seed 1 is given twice"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds list="1 0"/>)")),
            Lines{"t.xml:10: seeds list = '1 0': '0' is not a whole number >= 1"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds list="1 -2"/>)")),
            Lines{"t.xml:10: seeds list = '1 -2': '-2' is not a whole number >= 1"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds list="1,2"/>)")),
            Lines{"t.xml:10: seeds list = '1,2': '1,2' is not a whole number >= 1"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds list=" "/>)")),
            Lines{"t.xml:10: seeds list = ' ': must hold at least one seed"});
}

TEST_F(ScenarioFileTest, ReadsSeedCountFromFirst) {
  const ScenarioLoadResult result = Parse(Tail(R"(  <seeds count="4" first="10"/>)"));
  ASSERT_TRUE(result) << result.error()[0].ToString();
  EXPECT_EQ(result->seeds, (std::vector<std::uint64_t>{10, 11, 12, 13}));
  EXPECT_EQ(Parse(Tail(R"(  <seeds count="2"/>)")).value().seeds,
            (std::vector<std::uint64_t>{1, 2}));
}

TEST_F(ScenarioFileTest, RequiresEitherSeedListOrCount) {
  EXPECT_EQ(Errors(Tail(R"(  <seeds list="1" count="2"/>)")),
            Lines{"t.xml:10: seeds: give either list or count (with first), not both"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds/>)")),
            Lines{"t.xml:10: seeds: needs list=\"1 2 3\" or count=\"N\" (with first=\"K\", "
                  "default 1)"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds list="1" first="3"/>)")),
            Lines{"t.xml:10: seeds first = 3: only with count"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds count="0"/>)")),
            Lines{"t.xml:10: seeds count = 0: must be in [1, 10000]"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds count="10001"/>)")),
            Lines{"t.xml:10: seeds count = 10001: must be in [1, 10000]"});
  EXPECT_EQ(Errors(Tail(R"(  <seeds count="2" first="0"/>)")),
            Lines{"t.xml:10: seeds first = 0: must be >= 1"});
}

TEST_F(ScenarioFileTest, ReportsMetricSettingsRules) {
  EXPECT_EQ(Errors(Tail(R"(  <metrics window_s="0"/>)")),
            Lines{"t.xml:10: metrics: MetricSettings::window_s = 0, must be > 0"});
  EXPECT_EQ(Errors(Tail(R"(  <metrics fall_tilt_deg="95"/>)")),
            Lines{"t.xml:10: metrics: MetricSettings::fall_tilt_deg = 95, must be in (0, 90]"});
  EXPECT_EQ(Parse(Tail(R"(  <metrics drift_band_m="0.2"/>)")).value().metrics.drift_band_m, 0.2);
}

}  // namespace
}  // namespace upright::runner
