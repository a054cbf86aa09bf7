#include <gtest/gtest.h>

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "upright/model/model_file.hpp"

namespace upright {
namespace {

std::string SourcePath(const std::string& relative) {
  return std::string(UPRIGHT_SOURCE_DIR) + "/" + relative;
}

std::string ReadText(const std::string& path) {
  std::ifstream file(path);
  std::stringstream text;
  text << file.rdbuf();
  return text.str();
}

model::RobotModel LoadedDemo(const char* file) {
  const auto result = model::LoadModelFile(SourcePath(std::string("models/") + file));
  EXPECT_TRUE(result.has_value()) << file;
  return result.value_or(model::RobotModel{});
}

// ValidateModel's messages, none for a valid model.
std::vector<std::string> Problems(const model::RobotModel& model) {
  const auto valid = model::ValidateModel(model);
  return valid ? std::vector<std::string>{} : valid.error();
}

TEST(ModelSchema, ValidateModelAcceptsLoadedDemoModels) {
  EXPECT_EQ(Problems(LoadedDemo("courier.xml")), std::vector<std::string>{});
  EXPECT_EQ(Problems(LoadedDemo("tabletop.xml")), std::vector<std::string>{});
}

TEST(ModelSchema, ValidateModelFlagsOutOfRangeField) {
  model::RobotModel model = LoadedDemo("courier.xml");
  model.chassis.mass_kg = -1;
  EXPECT_EQ(Problems(model),
            std::vector<std::string>{"chassis mass_kg = -1: must be in (0, 1000]"});
}

TEST(ModelSchema, ValidateModelFlagsEveryBrokenField) {
  model::RobotModel model = LoadedDemo("tabletop.xml");
  model.motor.gear_efficiency = 0;
  model.sensors.encoder_counts_per_rev = 700.5;
  EXPECT_EQ(
      Problems(model),
      (std::vector<std::string>{"motor gear_efficiency = 0: must be in (0, 1]",
                                "sensors/encoder counts_per_rev = 700.5: must be a whole number"}));
}

TEST(ModelSchema, ValidateModelFlagsCrossFieldRule) {
  model::RobotModel model = LoadedDemo("tabletop.xml");
  model.control_rate_hz = 1000;
  EXPECT_EQ(Problems(model), std::vector<std::string>{
                                 "sensors/imu rate_hz = 500: must be >= control rate_hz = 1000"});
}

TEST(ModelSchema, ValidateModelChecksPayloadOnlyWhenPresent) {
  model::RobotModel model = LoadedDemo("tabletop.xml");
  model.payload = model::PayloadModel{};
  EXPECT_EQ(Problems(model), std::vector<std::string>{});
  model.payload.present = true;
  const std::vector<std::string> problems = Problems(model);
  ASSERT_EQ(problems.size(), 4u);
  EXPECT_EQ(problems[0], "payload mass_kg = 0: must be in (0, 1000]");
}

TEST(ModelSchema, ValidateModelRejectsDefaultConstructedModel) {
  const std::vector<std::string> problems = Problems(model::RobotModel{});
  ASSERT_FALSE(problems.empty());
  EXPECT_EQ(problems[0], "balancer name = '': must not be empty");
  EXPECT_EQ(problems[1], "chassis mass_kg = 0: must be in (0, 1000]");
}

TEST(ModelSchema, MarkdownStatesDerivedDefaultsAndRanges) {
  const std::string markdown = model::ModelSchemaMarkdown();
  EXPECT_NE(markdown.find("| `wheels` | `spin_inertia_kgm2` | kg·m² | ½ m r² (uniform disc) | > 0 "
                          "| one wheel about the axle |"),
            std::string::npos)
      << markdown;
  EXPECT_NE(markdown.find("| `motor` | `gear_efficiency` | — | 1 | (0, 1] |"), std::string::npos);
  EXPECT_NE(markdown.find("| `sensors/encoder` | `counts_per_rev` | counts | required | whole, "
                          "[1, 1000000000] |"),
            std::string::npos);
  EXPECT_NE(markdown.find("| `chassis/uniform_block` | exactly one of `chassis/principal_moments` "
                          "or `chassis/uniform_block` |"),
            std::string::npos);
}

TEST(ModelSchema, ReadmeEmbedsTheGeneratedSchema) {
  const std::string readme = ReadText(SourcePath("models/README.md"));
  ASSERT_FALSE(readme.empty()) << "cannot read models/README.md";
  EXPECT_NE(readme.find(model::ModelSchemaMarkdown()), std::string::npos)
      << "models/README.md is out of date; replace its generated section with:\n"
      << model::ModelSchemaMarkdown();
}

TEST(ModelSchema, ReadmeMinimalExampleLoads) {
  const std::string readme = ReadText(SourcePath("models/README.md"));
  const std::string fence = "```xml\n";
  const std::size_t start = readme.find(fence);
  ASSERT_NE(start, std::string::npos) << "no xml example in models/README.md";
  const std::size_t end = readme.find("```", start + fence.size());
  ASSERT_NE(end, std::string::npos);
  const std::string example = readme.substr(start + fence.size(), end - start - fence.size());
  const auto result = model::ParseModelText(example, "README example");
  EXPECT_TRUE(result.has_value()) << result.error()[0].ToString();
}

}  // namespace
}  // namespace upright
