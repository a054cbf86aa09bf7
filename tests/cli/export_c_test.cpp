// `upright design --export-c`: the header compiles as C99 with every warning an error (used in
// full, and included without using any gain), and each value it holds, printed back by the
// compiled program as a hexadecimal float (C99 %a, exact), equals the `--json` figure bit for bit.
// Refusals of an unusable path happen before anything is designed or written.
#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

#include "program_output.hpp"
#include "upright/design/weights.hpp"
#include "upright/model/model_file.hpp"
#include "upright/runner/common/sha256.hpp"

namespace {

namespace fs = std::filesystem;
using Json = nlohmann::json;

using Ran = upright::test::ProgramOutput;
using upright::test::RunShell;

fs::path Scratch(const std::string& name) {
  return upright::test::ScratchFolder("upright_export_c", name);
}

std::string Model(const std::string& name) {
  return std::string(UPRIGHT_SOURCE_DIR) + "/models/" + name;
}

// One `static const double` of the header: its name and, for an array, its size.
struct Declared {
  std::string name;
  int rows = 0, cols = 0;  // 0, 0: a scalar
};

std::vector<Declared> Declarations(const std::string& header) {
  static const std::regex kDeclaration(
      R"(static const double ([A-Za-z_0-9]+)(?:\[(\d+)\]\[(\d+)\])? [A-Z_0-9]+GAINS_UNUSED =)");
  std::vector<Declared> out;
  for (auto it = std::sregex_iterator(header.begin(), header.end(), kDeclaration);
       it != std::sregex_iterator(); ++it) {
    const std::smatch& m = *it;
    out.push_back({m[1], m[2].matched ? std::stoi(m[2]) : 0, m[3].matched ? std::stoi(m[3]) : 0});
  }
  return out;
}

// A C99 program that prints every declaration as "name v v v ..." with %a.
std::string Printer(const std::string& header_name, const std::vector<Declared>& declared) {
  std::string c = "#include <stdio.h>\n#include \"" + header_name +
                  "\"\n"
                  "static void Print(const char* name, const double* v, int n) {\n"
                  "  int i;\n  printf(\"%s\", name);\n"
                  "  for (i = 0; i < n; ++i) printf(\" %a\", v[i]);\n  printf(\"\\n\");\n}\n"
                  "int main(void) {\n";
  for (const Declared& d : declared) {
    c += d.rows ? "  Print(\"" + d.name + "\", &" + d.name + "[0][0], " +
                      std::to_string(d.rows * d.cols) + ");\n"
                : "  Print(\"" + d.name + "\", &" + d.name + ", 1);\n";
  }
  return c + "  return 0;\n}\n";
}

// The values the compiled program printed, by name.
std::map<std::string, std::vector<double>> Printed(const std::string& output) {
  std::map<std::string, std::vector<double>> out;
  std::istringstream lines(output);
  std::string line;
  while (std::getline(lines, line)) {
    std::istringstream words(line);
    std::string name, word;
    words >> name;
    while (words >> word) out[name].push_back(std::strtod(word.c_str(), nullptr));
  }
  return out;
}

std::vector<double> Flat(const Json& value) {
  std::vector<double> out;
  if (value.is_number()) return {value.get<double>()};
  for (const Json& row : value) {
    for (const Json& x : row) out.push_back(x.get<double>());
  }
  return out;
}

// Where `--json` holds each exported value (the prefix "courier_" taken off).
const std::map<std::string, std::vector<std::string>>& JsonPaths() {
  static const std::map<std::string, std::vector<std::string>> paths = {
      {"equilibrium_pitch_rad", {"equilibrium_pitch_rad"}},
      {"lqr_K", {"lqr", "K_discrete"}},
      {"hinf_K", {"hinf", "K_discrete"}},
      {"lqg_K", {"lqg", "K_discrete"}},
      {"lqg_Ad", {"lqg", "Ad"}},
      {"lqg_Bd", {"lqg", "Bd"}},
      {"lqg_C", {"lqg", "C"}},
      {"lqg_D", {"lqg", "D"}},
      {"lqg_L", {"lqg", "L_discrete"}},
      {"pid_tilt_kp_Nm_per_rad", {"pid", "gains", "tilt_kp_Nm_per_rad"}},
      {"pid_tilt_kd_Nm_s_per_rad", {"pid", "gains", "tilt_kd_Nm_s_per_rad"}},
      {"pid_speed_kp_rad_per_m_s", {"pid", "gains", "speed_kp_rad_per_m_s"}},
      {"pid_speed_ki_rad_per_m", {"pid", "gains", "speed_ki_rad_per_m"}},
      {"pid_yaw_kp_Nm_s_per_rad", {"pid", "gains", "yaw_kp_Nm_s_per_rad"}},
      {"pid_yaw_ki_Nm_per_rad", {"pid", "gains", "yaw_ki_Nm_per_rad"}},
      {"pid_max_tilt_ref_rad", {"pid", "gains", "max_tilt_ref_rad"}},
  };
  return paths;
}

const std::string kCompile =
    std::string(UPRIGHT_C_COMPILER) + " -std=c99 -pedantic -Wall -Wextra -Werror ";

// Exports the gains of `model` (with `flags`), compiles and runs the printer, and compares every
// value with --json. Returns the header's text.
std::string ExportAndCompare(const std::string& model, const std::string& prefix,
                             const std::string& flags, std::size_t expected_values) {
  const fs::path dir = Scratch(prefix + (flags.empty() ? "" : "flags"));
  const fs::path header = dir / "gains.h";
  const std::string program = std::string(UPRIGHT_EXE) + " design " + flags + " " + model;
  const Ran exported = RunShell(program + " --export-c " + header.string() + " 2>&1 >/dev/null");
  EXPECT_TRUE(exported.exit_code == 0 || exported.exit_code == 3) << exported.output;
  const Ran json_run = RunShell(program + " --json 2>/dev/null");
  const Json json = Json::parse(json_run.output, nullptr, /*allow_exceptions=*/false);
  EXPECT_TRUE(json.is_object()) << json_run.output;
  const std::string text = upright::test::ReadBytes(header);
  const std::vector<Declared> declared = Declarations(text);
  EXPECT_EQ(declared.size(), expected_values) << text;

  std::ofstream(dir / "print.c") << Printer("gains.h", declared);
  const Ran compiled = RunShell("cd " + dir.string() + " && " + kCompile + "print.c -o print 2>&1");
  EXPECT_EQ(compiled.exit_code, 0) << compiled.output;
  const Ran printed = RunShell((dir / "print").string());
  EXPECT_EQ(printed.exit_code, 0);
  const auto values = Printed(printed.output);

  for (const Declared& d : declared) {
    SCOPED_TRACE(d.name);
    const std::string key = d.name.substr(prefix.size());
    if (key == "input_limit") continue;  // not in --json: checked by the caller
    const auto path = JsonPaths().find(key);
    if (path == JsonPaths().end()) {
      ADD_FAILURE() << "no JSON counterpart for " << d.name;
      continue;
    }
    const Json* node = &json;
    for (const std::string& step : path->second) node = &node->at(step);
    const std::vector<double> expected = Flat(*node);
    if (values.count(d.name) == 0 || values.at(d.name).size() != expected.size()) {
      ADD_FAILURE() << "printed " << values.count(d.name) << " line(s) for it, expected "
                    << expected.size() << " values";
      continue;
    }
    for (std::size_t i = 0; i < expected.size(); ++i) {
      EXPECT_EQ(values.at(d.name)[i], expected[i]) << "element " << i;  // bit for bit
    }
  }
  return text;
}

TEST(ExportC, EveryValueCompilesAndEqualsTheJsonBitForBit) {
  // 2 scalars, 2 state-feedback gains, 6 LQG matrices, 7 PID gains.
  const std::string text = ExportAndCompare(Model("courier.xml"), "courier_", "", 17);
  const auto sha = upright::runner::Sha256OfFile(Model("courier.xml"));
  ASSERT_TRUE(sha.has_value());
  EXPECT_NE(text.find("model file SHA-256 " + *sha), std::string::npos);
  EXPECT_NE(text.find("#define COURIER_RATE_HZ 200.0\n"), std::string::npos) << text;
  EXPECT_NE(text.find("#define COURIER_STATES 6\n"), std::string::npos);
  // The input limit is the stall torque at the wheel, as the design library states it.
  const auto model = upright::model::LoadModelFile(Model("courier.xml"));
  ASSERT_TRUE(model.has_value());
  const double limit = upright::design::InputLimit(*model, upright::design::InputKind::kTorque);
  const std::string declaration = "courier_input_limit COURIER_GAINS_UNUSED = ";
  const std::size_t at = text.find(declaration);
  ASSERT_NE(at, std::string::npos) << text;
  EXPECT_EQ(std::strtod(text.c_str() + at + declaration.size(), nullptr), limit);
}

TEST(ExportC, AnotherRateAndVoltageInputLeaveOutWhatIsNotOffered) {
  // PID is not offered for voltage input: 2 scalars, 2 gains, 6 LQG matrices.
  const std::string text =
      ExportAndCompare(Model("tabletop.xml"), "tabletop_", "--input voltage --rate 250", 10);
  EXPECT_NE(text.find("#define TABLETOP_RATE_HZ 250.0\n"), std::string::npos) << text;
  EXPECT_NE(text.find("motor terminal voltage, V"), std::string::npos);
  EXPECT_NE(text.find("Not written: pid (unsupported"), std::string::npos) << text;
}

TEST(ExportC, TheHeaderCompilesWithNoGainUsed) {
  const fs::path dir = Scratch("unused");
  const Ran exported = RunShell(std::string(UPRIGHT_EXE) + " design " + Model("courier.xml") +
                                " --export-c " + (dir / "gains.h").string() + " >/dev/null 2>&1");
  ASSERT_EQ(exported.exit_code, 0);
  std::ofstream(dir / "none.c") << "#include \"gains.h\"\n#include \"gains.h\"\n"
                                   "int main(void) { return 0; }\n";
  const Ran compiled =
      RunShell("cd " + dir.string() + " && " + kCompile + "-c none.c -o none.o 2>&1");
  EXPECT_EQ(compiled.exit_code, 0) << compiled.output;
}

TEST(ExportC, APathThatCannotBeWrittenIsRefusedBeforeDesigning) {
  const fs::path dir = Scratch("refused");
  const std::string design = std::string(UPRIGHT_EXE) + " design " + Model("courier.xml");
  const Ran missing =
      RunShell(design + " --export-c " + (dir / "no/such/gains.h").string() + " 2>&1");
  EXPECT_EQ(missing.exit_code, 2);
  EXPECT_NE(missing.output.find("does not exist"), std::string::npos) << missing.output;
  EXPECT_EQ(missing.output.find("LQR"), std::string::npos) << "designed anyway";
  const Ran folder = RunShell(design + " --export-c " + dir.string() + " 2>&1");
  EXPECT_EQ(folder.exit_code, 2);
  EXPECT_NE(folder.output.find("is a folder"), std::string::npos) << folder.output;
  EXPECT_TRUE(fs::is_empty(dir));
}

}  // namespace
