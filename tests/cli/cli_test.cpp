// End-to-end tests of the `upright` program: exit codes, messages with path:line, runs and the
// demo suite.
#include <gtest/gtest.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <nlohmann/json.hpp>
#include <string>
#include <utility>

#include "program_output.hpp"

namespace {

using Json = nlohmann::json;

struct Result {
  int exit_code = -1;
  std::string output;  // stdout and stderr together
};

// Runs `upright ARGS` (in folder `cwd` when given) and collects its output and exit code; stderr
// goes where `redirect` sends it (by default into the output too).
Result RunUpright(const std::string& args, const std::string& cwd = "",
                  const std::string& redirect = "2>&1") {
  const upright::test::ProgramOutput ran =
      upright::test::RunShell((cwd.empty() ? "" : "cd " + cwd + " && ") + std::string(UPRIGHT_EXE) +
                              " " + args + " " + redirect);
  return {ran.exit_code, ran.output};
}

std::string Models() { return std::string(UPRIGHT_SOURCE_DIR) + "/models/"; }

// Writes `text` to `name` in this test process's temporary folder; returns the path.
std::string WriteTemp(const std::string& name, const std::string& text) {
  const auto dir =
      std::filesystem::temp_directory_path() / ("upright_cli_" + std::to_string(getpid()));
  std::filesystem::create_directories(dir);
  const auto path = (dir / name).string();
  std::ofstream(path) << text;
  return path;
}

// A copy of a demo model with its first `from` replaced by `to`.
std::string BrokenCopy(const std::string& name, const std::string& from, const std::string& to) {
  std::ifstream in(Models() + name);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  const auto at = text.find(from);
  EXPECT_NE(at, std::string::npos) << from;
  if (at != std::string::npos) text.replace(at, from.size(), to);
  return WriteTemp(name, text);
}

// ":N:" for the line of `path` on which `needle` first stands, as a message gives it, so that a
// test does not depend on the layout of a demo file.
std::string LineOf(const std::string& path, const std::string& needle) {
  std::ifstream in(path);
  std::string line;
  for (int n = 1; std::getline(in, line); ++n) {
    if (line.find(needle) != std::string::npos) return ":" + std::to_string(n) + ":";
  }
  ADD_FAILURE() << needle << " not in " << path;
  return ":?:";
}

TEST(Cli, VersionPrintsTheToolVersion) {
  const Result r = RunUpright("--version");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.output.find("upright 0."), std::string::npos) << r.output;
}

TEST(Cli, HelpListsTheCommandsAndTheSafetyCaution) {
  const Result r = RunUpright("--help");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.output.find("check"), std::string::npos);
  EXPECT_NE(r.output.find("demo"), std::string::npos);
  EXPECT_NE(r.output.find("never certify"), std::string::npos);
}

TEST(Cli, NoCommandIsAUsageError) { EXPECT_EQ(RunUpright("").exit_code, 2); }

TEST(Cli, AnUnknownCommandIsNamedWithTheNearestAndTheList) {
  const Result r = RunUpright("desing " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("unknown command 'desing'; did you mean 'design'?"), std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find("commands: check, design, run, demo, sweep, envelope, tune, report"),
            std::string::npos)
      << r.output;
  // Nothing near enough: no suggestion, still the list.
  const Result far = RunUpright("xyz");
  EXPECT_EQ(far.exit_code, 2) << far.output;
  EXPECT_NE(far.output.find("unknown command 'xyz'\ncommands: check,"), std::string::npos)
      << far.output;
}

TEST(Cli, SweepSamplesDefaultsToOneHundred) {
  const Result help = RunUpright("sweep --help");
  EXPECT_NE(help.output.find("--samples INT:INT in [1 - 1000000]=100"), std::string::npos)
      << help.output;
}

TEST(Cli, CheckAcceptsTheDemoModels) {
  const Result r = RunUpright("check " + Models() + "courier.xml " + Models() + "tabletop.xml");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("courier.xml: ok"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("tabletop.xml: ok"), std::string::npos) << r.output;
}

TEST(Cli, CheckReportsABrokenModelWithItsLineAndExitsTwo) {
  const std::string bad = BrokenCopy("courier.xml", "mass_kg=\"24\"", "mass_kg=\"-24\"");
  const Result r = RunUpright("check " + Models() + "tabletop.xml " + bad);
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find(bad + LineOf(bad, "mass_kg=\"-24\"") + " chassis mass_kg = -24"),
            std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find("1 of 2 file(s) invalid"), std::string::npos) << r.output;
}

TEST(Cli, CheckRejectsAMissingFileAndAnUnknownRoot) {
  EXPECT_EQ(RunUpright("check /nonexistent/robot.xml").exit_code, 2);
  const std::string other = WriteTemp("vehicle.xml", "<vehicle name=\"x\"/>\n");
  const Result r = RunUpright("check " + other);
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find("<vehicle>"), std::string::npos) << r.output;
}

// A device would be read without end and a FIFO would block: check, run and design refuse both
// by what they are, before reading.
TEST(Cli, RefusesADeviceAndAFifoAsInputFiles) {
  const std::string fifo = WriteTemp("fifo.xml", "");
  std::filesystem::remove(fifo);
  ASSERT_EQ(::mkfifo(fifo.c_str(), 0600), 0);
  for (const char* command : {"check", "run", "design"}) {
    for (const auto& [path, kind] :
         {std::pair<std::string, std::string>{"/dev/zero", "a character device"},
          {fifo, "a FIFO"}}) {
      const Result r = RunUpright(std::string(command) + " " + path);
      EXPECT_EQ(r.exit_code, 2) << command << " " << path << ": " << r.output;
      EXPECT_NE(r.output.find(path + ": not a regular file (" + kind + ")"), std::string::npos)
          << command << ": " << r.output;
    }
  }
  std::filesystem::remove(fifo);
}

TEST(Cli, CheckTellsASchemaOneModelTheNamesThatReplacedItsOwn) {
  std::ifstream in(Models() + "courier.xml");
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  for (const auto& [from, to] : {std::pair<std::string, std::string>{"balancer", "robot"},
                                 {"balancer", "robot"},
                                 {"schema=\"2\"", "schema=\"1\""},
                                 {"<principal_moments ", "<inertia "}}) {
    const auto at = text.find(from);
    ASSERT_NE(at, std::string::npos) << from;
    text.replace(at, from.size(), to);
  }
  const std::string old = WriteTemp("courier-schema-1.xml", text);
  const Result r = RunUpright("check " + old);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(old + LineOf(old, "<robot ") +
                          " <robot> is the former name of this file's root element: "
                          "rename it <balancer> (schema 2)\n" +
                          old + LineOf(old, "<inertia ") +
                          " chassis: <inertia> is the former name of this element: "
                          "rename it <principal_moments> (schema 2)\n"),
            std::string::npos)
      << r.output;
  const std::string other = WriteTemp("vehicle.xml", "<vehicle name=\"x\"/>\n");
  EXPECT_NE(RunUpright("check " + other).output.find("(expected <balancer> or <scenario>)"),
            std::string::npos);
}

TEST(Cli, DesignPrintsEveryControllerForBothDemoRobots) {
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const Result r = RunUpright("design " + Models() + name);
    EXPECT_EQ(r.exit_code, 0) << r.output;
    for (const char* part :
         {"== LQR: ok", "== H-infinity state feedback: ok", "gamma_opt",
          "the hinf module's design, discrete at", "== LQG", "== PID cascade",
          "input margins (worst wheel)", "input margins (both wheels at once)", "push norm",
          "sampled as the module runs it", "s latency: max |z|", "sampled margins (worst wheel)",
          "sampled margins (both wheels at once)", "== LQR on the delay-augmented model",
          "note: the worst wheel's lower gain margin is 0"}) {
      EXPECT_NE(r.output.find(part), std::string::npos) << name << ": " << part;
    }
  }
}

// `upright design --json ARGS` parsed with nlohmann-json; stderr left out.
Json DesignJson(const std::string& args) {
  const Result r = RunUpright("design --json " + args, "", "2>/dev/null");
  Json value = Json::parse(r.output, nullptr, /*allow_exceptions=*/false);
  EXPECT_FALSE(value.is_discarded()) << r.output;
  return value;
}

// The member `key` of `object` (null when absent, which the checks below then refuse).
const Json& At(const Json& object, const char* key) {
  static const Json kAbsent;
  EXPECT_TRUE(object.is_object() && object.contains(key)) << key;
  return object.is_object() && object.contains(key) ? object.at(key) : kAbsent;
}

double NumberAt(const Json& object, const char* key) {
  const Json& v = At(object, key);
  EXPECT_TRUE(v.is_number()) << key << " = " << v.dump();
  return v.is_number() ? v.get<double>() : NAN;
}

bool BoolAt(const Json& object, const char* key) {
  const Json& v = At(object, key);
  EXPECT_TRUE(v.is_boolean()) << key << " = " << v.dump();
  return v.is_boolean() && v.get<bool>();
}

std::string StringAt(const Json& object, const char* key) {
  const Json& v = At(object, key);
  EXPECT_TRUE(v.is_string()) << key << " = " << v.dump();
  return v.is_string() ? v.get<std::string>() : "";
}

// A figure: a number, or null for an unbounded one (JSON has no infinity).
bool IsFigure(const Json& v) { return v.is_number() || v.is_null(); }

// A row-major matrix of numbers, `rows` × `cols`.
bool IsMatrix(const Json& v, std::size_t rows, std::size_t cols) {
  if (!v.is_array() || v.size() != rows) return false;
  for (const Json& row : v) {
    if (!row.is_array() || row.size() != cols) return false;
    for (const Json& x : row) {
      if (!x.is_number()) return false;
    }
  }
  return true;
}

// Poles as [re, im] pairs of numbers.
bool IsPoleList(const Json& v) { return v.is_array() && !v.empty() && IsMatrix(v, v.size(), 2); }

constexpr const char* kControllerKeys[] = {"lqr", "hinf", "lqg", "pid"};

// A margins object: every documented figure, a number or null.
void ExpectMargins(const Json& margins) {
  for (const char* figure : {"gain_low", "gain_high", "phase_deg", "disk_alpha", "disk_gain_low",
                             "disk_gain_high", "disk_phase_deg", "delay_s"}) {
    EXPECT_TRUE(IsFigure(At(margins, figure))) << figure;
  }
}

// A stable sampled loop with its latency and margins.
void ExpectSampled(const Json& sampled) {
  EXPECT_GT(NumberAt(sampled, "rate_hz"), 0);
  EXPECT_LT(NumberAt(sampled, "max_abs_z"), 1);
  EXPECT_TRUE(IsPoleList(At(sampled, "poles")));
  EXPECT_GE(NumberAt(sampled, "latency_s"), 0);
  ExpectMargins(At(sampled, "margins"));
  ExpectMargins(At(sampled, "margins_both_wheels"));
}

// Every key README.md documents for `upright design --json`, with its type: the courier robot as
// given (torque input, every design ok, a gain margin with no upper limit).
TEST(Cli, DesignJsonCarriesTheDocumentedKeys) {
  const Result r = RunUpright("design --json " + Models() + "courier.xml", "", "2>/dev/null");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  const Json json = Json::parse(r.output, nullptr, /*allow_exceptions=*/false);
  ASSERT_TRUE(json.is_object()) << r.output;
  EXPECT_EQ(StringAt(json, "robot"), "courier");
  EXPECT_EQ(StringAt(json, "input"), "torque");
  EXPECT_GT(NumberAt(json, "rate_hz"), 0);
  EXPECT_GE(NumberAt(json, "latency_s"), 0);
  EXPECT_EQ(At(json, "states").size(), 6u);
  EXPECT_TRUE(IsMatrix(At(json, "A"), 6, 6)) << At(json, "A").dump();
  EXPECT_TRUE(IsMatrix(At(json, "B"), 6, 2)) << At(json, "B").dump();
  EXPECT_TRUE(IsMatrix(At(json, "E"), 6, 2)) << At(json, "E").dump();
  // pitch row of A: d(pitch)/dt = pitch rate, so A[2][3] = 1 (row-major: rows are states).
  EXPECT_EQ(At(json, "A")[2][3], 1);
  int unbounded_gains = 0;
  for (const char* key : kControllerKeys) {
    SCOPED_TRACE(key);
    const Json& c = At(json, key);
    EXPECT_EQ(StringAt(c, "status"), "ok");
    EXPECT_TRUE(BoolAt(c, "ok"));
    StringAt(c, "message");
    EXPECT_TRUE(IsMatrix(At(c, "K"), 2, 6)) << At(c, "K").dump();
    EXPECT_TRUE(IsPoleList(At(c, "poles"))) << At(c, "poles").dump();
    EXPECT_TRUE(IsFigure(At(c, "push_norm")));
    const Json& margins = At(c, "margins");
    ExpectMargins(margins);
    ExpectMargins(At(c, "margins_both_wheels"));
    unbounded_gains += At(margins, "gain_high").is_null();
    if (std::string(key) == "pid") {
      EXPECT_FALSE(c.contains("sampled"));
    } else {
      ExpectSampled(At(c, "sampled"));
    }
    EXPECT_GE(NumberAt(c, "unanalysed_delay_s"), 0);
    BoolAt(c, "delay_margin_short");
  }
  EXPECT_GT(unbounded_gains, 0) << "an unbounded gain margin prints as null";
  const Json& hinf = At(json, "hinf");
  EXPECT_GE(NumberAt(hinf, "gamma"), NumberAt(hinf, "gamma_opt"));
  EXPECT_TRUE(IsFigure(At(hinf, "norm")));
  EXPECT_TRUE(IsMatrix(At(hinf, "K_discrete"), 2, 6)) << At(hinf, "K_discrete").dump();
  EXPECT_GT(NumberAt(hinf, "gamma_discrete"), NumberAt(hinf, "gamma_opt_discrete"));
  EXPECT_LT(NumberAt(hinf, "norm_discrete"), NumberAt(hinf, "gamma_discrete"));
  EXPECT_NEAR(NumberAt(hinf, "gamma_factor"), NumberAt(hinf, "gamma") / NumberAt(hinf, "gamma_opt"),
              1e-12);
  // The discrete design at the module's rate sits at the same factor of its own γ_opt.
  EXPECT_NEAR(NumberAt(hinf, "gamma_discrete") / NumberAt(hinf, "gamma_opt_discrete"),
              NumberAt(hinf, "gamma_factor"), 1e-12);
  EXPECT_EQ(StringAt(hinf, "gamma_source"), "rule");
  EXPECT_TRUE(BoolAt(hinf, "gamma_limits_met"));
  const Json& table = At(hinf, "gamma_table");
  ASSERT_TRUE(table.is_array());
  ASSERT_EQ(table.size(), 8u);
  for (const Json& row : table) {
    const bool lqr = BoolAt(row, "lqr");
    EXPECT_EQ(At(row, "gamma_factor").is_null(), lqr) << row.dump();  // infinite: null
    EXPECT_EQ(At(row, "gamma").is_null(), lqr) << row.dump();
    EXPECT_TRUE(BoolAt(row, "ok")) << row.dump();
    for (const char* figure :
         {"gain_norm", "push_norm", "push_peak_tilt_deg", "push_peak_current_A"}) {
      EXPECT_GT(NumberAt(row, figure), 0) << figure;
    }
    BoolAt(row, "within_limits");
  }
  EXPECT_TRUE(BoolAt(table.back(), "lqr"));
  const Json& limits = At(json, "limits");
  for (const char* figure : {"ground_contact_tilt_deg", "ground_contact_forward_deg",
                             "ground_contact_backward_deg", "input_limit", "current_limit_A"}) {
    EXPECT_GT(NumberAt(limits, figure), 0) << figure;
  }
  const Json& weights = At(json, "weights");
  EXPECT_NEAR(NumberAt(weights, "max_tilt_deg"), 0.2 * NumberAt(limits, "ground_contact_tilt_deg"),
              1e-12);
  EXPECT_NEAR(NumberAt(weights, "max_input"),
              NumberAt(weights, "max_input_fraction") * NumberAt(limits, "input_limit"), 1e-12);
  const Json& push = At(json, "design_push");
  EXPECT_NEAR(NumberAt(push, "impulse_Ns"), NumberAt(json, "push_scale_N") * 1.0, 1e-12);
  EXPECT_NEAR(NumberAt(push, "duration_s"), 2 / NumberAt(json, "fall_rate_1_s"), 1e-12);
  EXPECT_GT(NumberAt(push, "peak_N"), 0);
  EXPECT_EQ(NumberAt(push, "height_m"), NumberAt(json, "push_height_m"));
  EXPECT_GT(NumberAt(At(json, "lqg"), "estimator_fastest_1_s"), 0);
  // The PID's pole choices, the rule's defaults, and the pairs' frequencies they give.
  const Json& choices = At(At(json, "pid"), "pole_choices");
  const double fall_rate = NumberAt(json, "fall_rate_1_s");
  EXPECT_EQ(NumberAt(choices, "tilt_pole_factor"), 2);
  EXPECT_EQ(NumberAt(choices, "tilt_damping"), 0.7);
  EXPECT_EQ(NumberAt(choices, "speed_pole_factor"), 1.0 / 3);
  EXPECT_EQ(NumberAt(choices, "speed_damping"), 0.9);
  EXPECT_EQ(NumberAt(choices, "yaw_pole_factor"), 1);
  EXPECT_NEAR(NumberAt(choices, "tilt_bandwidth_rad_s"), 2 * fall_rate, 1e-12 * fall_rate);
  EXPECT_NEAR(NumberAt(choices, "speed_bandwidth_rad_s"), fall_rate / 3, 1e-12 * fall_rate);
  EXPECT_NEAR(NumberAt(choices, "yaw_bandwidth_rad_s"), fall_rate, 1e-12 * fall_rate);
  const Json& aware = At(json, "lqr_delay_aware");
  EXPECT_TRUE(BoolAt(aware, "ok"));
  StringAt(aware, "message");
  const double memory = NumberAt(aware, "memory");
  EXPECT_EQ(memory, 1);  // the courier's 2 ms latency is under one 5 ms period
  EXPECT_TRUE(IsMatrix(At(aware, "K"), 2, 6 + 2 * static_cast<std::size_t>(memory)));
  ExpectSampled(At(aware, "sampled"));
  EXPECT_EQ(r.output.front(), '{');
  EXPECT_EQ(r.output.back(), '\n');
}

TEST(Cli, DesignPrintsTheRobotsLimitsAndTheGammaTradeOff) {
  // The rule's γ sits between the table's rows: every row below it (by more than the rule's 1 %
  // resolution) lets the design push past a limit, every row above it keeps within them (the
  // peaks fall as γ grows).
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const Result text = RunUpright("design " + Models() + name);
    EXPECT_EQ(text.exit_code, 0) << text.output;
    for (const char* part :
         {"limits: the chassis outline meets the ground at ", "weights: max tilt ",
          "(a fifth of the ground-contact tilt), max input ", "(0.3 of the stall torque)",
          "design push: ", "gamma/gamma_opt", "inf (LQR)",
          "the smallest factor whose design at the module's rate keeps the design push within "
          "the ground-contact tilt and the current limit on the linear model",
          "gamma trade-off of the module's design at "}) {
      EXPECT_NE(text.output.find(part), std::string::npos) << name << ": " << part;
    }
    const Json json = DesignJson(Models() + name);
    const Json& hinf = At(json, "hinf");
    const double chosen = NumberAt(hinf, "gamma_factor");
    for (const Json& row : At(hinf, "gamma_table")) {
      if (BoolAt(row, "lqr") || NumberAt(row, "gamma_factor") >= chosen) {
        EXPECT_TRUE(BoolAt(row, "within_limits")) << name << ": " << row.dump();
      } else if (NumberAt(row, "gamma_factor") < chosen / 1.0101) {
        EXPECT_FALSE(BoolAt(row, "within_limits")) << name << ": " << row.dump();
      }
    }
  }
  const Result given =
      RunUpright("design --gamma-factor 1.5 --max-tilt-deg 4 " + Models() + "courier.xml");
  EXPECT_EQ(given.exit_code, 0) << given.output;
  EXPECT_NE(given.output.find("x gamma_opt"), std::string::npos) << given.output;
  EXPECT_NE(given.output.find("as given (--gamma-factor)"), std::string::npos) << given.output;
  EXPECT_NE(given.output.find("weights: max tilt 4 deg (as given)"), std::string::npos)
      << given.output;
  const Json json = DesignJson("--gamma-factor 1.5 " + Models() + "courier.xml");
  EXPECT_EQ(StringAt(At(json, "hinf"), "gamma_source"), "factor");
  EXPECT_NEAR(NumberAt(At(json, "hinf"), "gamma_factor"), 1.5, 1e-12);
  EXPECT_FALSE(At(json, "hinf").contains("gamma_limits_met"));
}

TEST(Cli, DesignNotesAnEstimatorFasterThanItsSamplingOnlyThen) {
  // The note appears exactly when the continuous estimator's fastest pole, printed in the JSON,
  // is beyond the Nyquist rate π · rate_hz of the control rate.
  for (const char* name : {"courier.xml", "tabletop.xml"}) {
    const Json json = DesignJson(Models() + name);
    const double fastest = NumberAt(At(json, "lqg"), "estimator_fastest_1_s");
    const double rate_hz = NumberAt(json, "rate_hz");
    const Result text = RunUpright("design " + Models() + name);
    const bool beyond = fastest > 3.141592653589793 * rate_hz;
    EXPECT_EQ(text.output.find("note: the continuous estimator reaches") != std::string::npos,
              beyond)
        << name << ": fastest " << fastest << " 1/s\n" << text.output;
  }
}

TEST(Cli, DesignWithAnInfeasibleGammaReportsItInPlaceAndExitsThree) {
  // One design failing leaves the others whole: each heading says its own status, and the exit
  // code (3) tells a script that some designs, not all, are usable.
  const Result r = RunUpright("design --gamma 0.001 " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("== H-infinity state feedback: FAILED: H-infinity at gamma = 0.001"),
            std::string::npos)
      << r.output;
  for (const char* part :
       {"== LQR: ok",
        "== LQG (LQR on a Kalman estimate from the model's "
        "sensors): ok",
        "== PID cascade (tilt PD inside speed PI, yaw-rate PI): ok",
        "design failed: H-infinity at gamma = 0.001", "3 of 4 design(s) usable"}) {
    EXPECT_NE(r.output.find(part), std::string::npos) << part << "\n" << r.output;
  }
}

TEST(Cli, DesignWithVoltageInputSaysPidIsNotOfferedAndExitsZero) {
  const Result r = RunUpright("design --input voltage " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("== PID cascade (tilt PD inside speed PI, yaw-rate PI): not offered: "
                          "the PID cascade is tuned for torque input only"),
            std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find("== LQR: ok"), std::string::npos) << r.output;
  const Json json = DesignJson("--input voltage " + Models() + "courier.xml");
  EXPECT_EQ(StringAt(At(json, "pid"), "status"), "unsupported");
  EXPECT_FALSE(BoolAt(At(json, "pid"), "ok"));
  EXPECT_EQ(StringAt(At(json, "lqr"), "status"), "ok");
}

TEST(Cli, DesignDoesNotCallALoopUnstableWhenSampledOk) {
  // At 5 Hz every law a module samples is designed for that rate (H-infinity's too), so without
  // latency each sampled loop is stable: the status follows the largest |z| (stable below 1), in
  // the JSON and in the text. (With the courier's 2 ms the lqg loop at 5 Hz is not, max |z|
  // 1.018: the latency's own checks are in DesignWarnsWhenADelayMarginIsBelowTheSensorLatency.)
  const std::string args =
      "--rate 5 " + BrokenCopy("courier.xml", "latency_s=\"0.002\"", "latency_s=\"0\"");
  const Json json = DesignJson(args);
  const Result text = RunUpright("design " + args);
  for (const char* key : kControllerKeys) {
    const Json& c = At(json, key);
    const bool diverges = c.contains("sampled") && !(NumberAt(c["sampled"], "max_abs_z") < 1);
    EXPECT_FALSE(diverges) << key;
    EXPECT_EQ(StringAt(c, "status"), diverges ? "unstable_sampled" : "ok") << key;
    EXPECT_EQ(BoolAt(c, "ok"), !diverges) << key;
  }
  EXPECT_EQ(text.exit_code, 0) << text.output;
  EXPECT_EQ(text.output.find("UNSTABLE"), std::string::npos) << text.output;
  EXPECT_NE(text.output.find("the hinf module's design, discrete at 5 Hz"), std::string::npos)
      << text.output;
}

TEST(Cli, DesignWarnsWhenADelayMarginIsBelowTheSensorLatency) {
  // The demo courier as given: the sampled loops include the latency, so nothing is left out of
  // them; PID's continuous figures leave out the latency and half a period (the hold), and a
  // warning comes exactly where its delay margin is below that.
  const Json as_given = DesignJson(Models() + "courier.xml");
  const double latency_s = NumberAt(as_given, "latency_s");
  const double period_s = 1 / NumberAt(as_given, "rate_hz");
  for (const char* key : kControllerKeys) {
    const Json& c = At(as_given, key);
    const double margin_s = NumberAt(At(c, "margins"), "delay_s");
    const double delay_s = NumberAt(c, "unanalysed_delay_s");
    EXPECT_NEAR(delay_s, c.contains("sampled") ? 0 : latency_s + period_s / 2, 1e-15) << key;
    EXPECT_EQ(BoolAt(c, "delay_margin_short"), margin_s < delay_s) << key;
  }
  // A latency of 0.2 s (within the model's limit of 50 control periods) outlasts every margin:
  // the sampled loops are unstable with it, and PID, whose loop is not sampled, is warned of.
  const std::string slow = BrokenCopy("courier.xml", "latency_s=\"0.002\"", "latency_s=\"0.2\"");
  const Json json = DesignJson(slow);
  for (const char* key : kControllerKeys) {
    EXPECT_LT(NumberAt(At(At(json, key), "margins"), "delay_s"), 0.2) << key;
    const bool sampled = std::string(key) != "pid";
    EXPECT_EQ(StringAt(At(json, key), "status"), sampled ? "unstable_sampled" : "ok") << key;
    EXPECT_EQ(BoolAt(At(json, key), "delay_margin_short"), !sampled) << key;
  }
  const Result text = RunUpright("design " + slow);
  std::size_t warnings = 0;
  for (auto at = text.output.find("warning: delay margin"); at != std::string::npos;
       at = text.output.find("warning: delay margin", at + 1)) {
    ++warnings;
  }
  EXPECT_EQ(warnings, 1u) << text.output;
  EXPECT_NE(text.output.find("of delay these figures leave out (sensors latency_s 0.2 s, plus "
                             "half a period of the hold at 200 Hz)"),
            std::string::npos)
      << text.output;
  EXPECT_NE(text.output.find("== LQR: designed, but UNSTABLE as the module samples it at 200 Hz "
                             "with the sensors' latency"),
            std::string::npos)
      << text.output;
}

TEST(Cli, DesignRejectsBadWeightsAsBadInput) {
  const Result r = RunUpright("design --max-tilt-deg -1 " + Models() + "courier.xml");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("--max-tilt-deg = -1: must be > 0"), std::string::npos) << r.output;
  EXPECT_EQ(r.output.find("DesignWeights"), std::string::npos) << r.output;
}

TEST(Cli, DesignPlacesThePidPolesItsFlagsAskForAndRefusesTheRestByFlag) {
  const Result r = RunUpright(
      "design --json --tilt-pole-factor 3 --speed-pole-factor 0.5 " + Models() + "courier.xml", "",
      "2>/dev/null");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  const Json json = Json::parse(r.output, nullptr, /*allow_exceptions=*/false);
  ASSERT_TRUE(json.is_object()) << r.output;
  const Json& choices = At(At(json, "pid"), "pole_choices");
  const double fall_rate = NumberAt(json, "fall_rate_1_s");
  EXPECT_EQ(NumberAt(choices, "tilt_pole_factor"), 3);
  EXPECT_EQ(NumberAt(choices, "speed_pole_factor"), 0.5);
  EXPECT_NEAR(NumberAt(choices, "tilt_bandwidth_rad_s"), 3 * fall_rate, 1e-12 * fall_rate);
  EXPECT_NEAR(NumberAt(choices, "speed_bandwidth_rad_s"), fall_rate / 2, 1e-12 * fall_rate);
  const Result text = RunUpright("design --tilt-pole-factor 3 " + Models() + "courier.xml");
  EXPECT_NE(text.output.find("poles placed: tilt pair "), std::string::npos) << text.output;
  EXPECT_NE(text.output.find("(3 × fall rate), damping 0.7"), std::string::npos) << text.output;
  for (const auto& [args, expected] :
       {std::pair<std::string, std::string>{"--speed-pole-factor 2",
                                            "--speed-pole-factor = 2: must be at most half of "
                                            "tilt_pole_factor = 2"},
        {"--tilt-damping 0.1", "--tilt-damping = 0.1: must be in [0.2, 1]"},
        {"--yaw-pole-factor 0", "--yaw-pole-factor = 0: must be > 0 and finite"}}) {
    const Result refused = RunUpright("design " + args + " " + Models() + "courier.xml");
    EXPECT_EQ(refused.exit_code, 2) << args << "\n" << refused.output;
    EXPECT_EQ(refused.output.rfind(expected, 0), 0u) << args << "\n" << refused.output;
  }
}

TEST(Cli, DesignRefusesARateOfZeroByItsFlag) {
  for (const char* args :
       {"--rate 0", "--rate -50", "--gamma 0", "--push-scale-N 0", "--push-height-m -0.1",
        "--gamma-factor 1", "--gamma-factor 0", "--max-tilt-deg 0"}) {
    const Result r = RunUpright(std::string("design ") + args + " " + Models() + "courier.xml");
    EXPECT_EQ(r.exit_code, 2) << args << "\n" << r.output;
    const std::string flag = std::string(args).substr(0, std::string(args).find(' '));
    EXPECT_EQ(r.output.rfind(flag + " = ", 0), 0u) << args << "\n" << r.output;
    EXPECT_NE(r.output.find(": must be "), std::string::npos) << args << "\n" << r.output;
  }
}

TEST(Cli, DesignRefusesAValueThatIsNoFiniteNumberSayingSo) {
  // "--rate = inf: must be > 0" would be false (infinity is > 0), and NaN printed as "-"
  // unreadable.
  for (const auto& [args, expected] :
       {std::pair<std::string, std::string>{"--rate inf", "--rate = inf: must be finite and > 0"},
        {"--gamma inf", "--gamma = inf: must be finite and > 0"},
        {"--push-height-m nan", "--push-height-m = nan: must be finite and >= 0"},
        {"--push-scale-N -inf", "--push-scale-N = -inf: must be finite and > 0"}}) {
    const Result r = RunUpright("design " + args + " " + Models() + "courier.xml");
    EXPECT_EQ(r.exit_code, 2) << args << "\n" << r.output;
    EXPECT_EQ(r.output.rfind(expected, 0), 0u) << args << "\n" << r.output;
  }
}

// A short scenario for the courier robot: two built-ins, a half-sine shove.
std::string ShortScenario(const std::string& name, const std::string& extra = "") {
  return WriteTemp(name + ".xml", R"(<scenario name=")" + name + R"(" schema="1" duration_s="2">
  <description>Test: a parked courier shoved once.</description>
  <robot file=")" + Models() + R"(courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N="80" duration_s="0.2"/>
  </timeline>
  <controllers baseline="lqr">
    <controller name="lqr" builtin="lqr"/>
    <controller name="pid" builtin="pid"/>)" +
                                      extra + R"(
  </controllers>
</scenario>)");
}

std::filesystem::path TempOut(const std::string& name) {
  const auto dir =
      std::filesystem::temp_directory_path() / ("upright_cli_" + std::to_string(getpid())) / name;
  std::filesystem::remove_all(dir);
  return dir;
}

std::size_t CountFiles(const std::filesystem::path& dir) {
  std::size_t n = 0;
  for (const auto& e : std::filesystem::recursive_directory_iterator(dir)) n += e.is_regular_file();
  return n;
}

TEST(Cli, CheckAcceptsEveryDemoScenario) {
  std::string args = "check";
  for (const auto& e :
       std::filesystem::directory_iterator(std::string(UPRIGHT_SOURCE_DIR) + "/scenarios")) {
    if (e.path().extension() == ".xml") args += " " + e.path().string();
  }
  const Result r = RunUpright(args);
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("ok (scenario 'courier-shove-half-sine', robot 'courier'"),
            std::string::npos)
      << r.output;
}

// A ground whose mesh the physics engine cannot hold (it crashed in the run before `check`
// refused it) is refused with its line, and nothing else in the file is blamed.
TEST(Cli, CheckRefusesAGroundBeyondThePhysicsEnginesMeshLimit) {
  const std::string demo = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios/courier-curb-up.xml";
  std::ifstream in(demo);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  for (const auto& [from, to] : {std::pair<std::string, std::string>{"../models/", Models()},
                                 {"<plateau length_m=\"10\"/>", "<plateau length_m=\"70000\"/>"}}) {
    const auto at = text.find(from);
    ASSERT_NE(at, std::string::npos) << from;
    text.replace(at, from.size(), to);
  }
  const std::string path = WriteTemp("long-plateau.xml", text);
  const Result r = RunUpright("check " + path);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  // At 0.2 m cells: 260 pieces over the 52 m lead-in from −50 m, the curb, 350000 over the
  // plateau and 1000 over the 200 m beyond, by 30 cells across its 6 m, two triangles each.
  EXPECT_NE(r.output.find(path + LineOf(demo, "<ground") +
                          " ground: Terrain: the profile's ground mesh would hold 21075660 "
                          "triangles at 0.2 m cells"),
            std::string::npos)
      << r.output;
}

// A controller element the short scenario ends with: it lands on line 10.
constexpr int kExtraControllerLine = 10;

// `upright check` on the short scenario with `extra` controllers: exit 2 and one problem, at the
// first extra controller's line, whose message starts with `message`; before it, only what the
// module logged while it was created (lines "<path>:<line>: controller '<name>', create: ...").
// The output, those lines included.
std::string ExpectCheckRefusesController(const std::string& name, const std::string& extra,
                                         const std::string& message) {
  const std::string path = ShortScenario(name, extra);
  const Result r = RunUpright("check " + path);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  const std::string at = path + ":" + std::to_string(kExtraControllerLine) + ": ";
  std::string output = r.output;
  while (output.rfind(at, 0) == 0 && output.find(", create: module ") < output.find('\n')) {
    output.erase(0, output.find('\n') + 1);
  }
  const std::string problem = at + message;
  EXPECT_EQ(output.substr(0, problem.size()), problem) << r.output;
  const std::string last = "\n1 of 1 file(s) invalid\n";
  EXPECT_GE(output.size(), last.size());
  if (output.size() >= last.size()) {
    EXPECT_EQ(output.find('\n'), output.size() - last.size()) << "one problem only:\n" << r.output;
  }
  return r.output;
}

TEST(Cli, CheckRefusesAMisspeltBuiltinSettingAsARunWould) {
  ExpectCheckRefusesController("typo", R"(
    <controller name="lqr-typo" builtin="lqr">
      <setting key="max_tilt" value="10"/>
    </controller>)",
                               "controller 'lqr-typo': create failed (status 2): unknown key "
                               "max_tilt (= 10); known keys: state, input, ");
}

TEST(Cli, CheckRefusesABadBuiltinSettingValue) {
  ExpectCheckRefusesController("badvalue", R"(
    <controller name="pid-slow" builtin="pid">
      <setting key="input" value="voltage"/>
    </controller>)",
                               "controller 'pid-slow': create failed (status 2): input = voltage: "
                               "this controller commands torque only");
}

TEST(Cli, CheckRefusesAModuleFileThatRefusesItsSettings) {
  const std::string module = std::string(UPRIGHT_TEST_MODULE_DIR) + "/faulty_5.so";
  const std::string output = ExpectCheckRefusesController("refusing", R"(
    <controller name="mine" file=")" + module + R"("/>)",
                                                          "controller 'mine': create failed "
                                                          "(status 2): gain = banana: must "
                                                          "be a number");
  // What the module logged before refusing reaches the user, at the controller's line.
  EXPECT_NE(output.find("refusing.xml:" + std::to_string(kExtraControllerLine) +
                        ": controller 'mine', create: module info: created\n"),
            std::string::npos)
      << output;
}

TEST(Cli, CheckRefusesAModuleFileThatWillNotLoad) {
  const std::string module = std::string(UPRIGHT_TEST_MODULE_DIR) + "/faulty_3.so";
  const std::string why =
      ": built for controller ABI version 99, this program speaks version 1; rebuild it against "
      "this version's upright/controller_abi.h";
  ExpectCheckRefusesController("unloadable", R"(
    <controller name="mine" file=")" + module + R"("/>)",
                               "controller 'mine': " + module + why);
}

TEST(Cli, CheckRefusesAMissingModuleFile) {
  ExpectCheckRefusesController("missing-module", R"(
    <controller name="mine" file="/nonexistent/mine.so"/>)",
                               "controllers/controller file = '/nonexistent/mine.so': no such "
                               "file (resolved to '/nonexistent/mine.so')");
}

TEST(Cli, CheckRefusesAModelWhoseImuMissesTheDefaultStep) {
  const std::string bad =
      BrokenCopy("courier.xml", R"(<imu rate_hz="1000")", R"(<imu rate_hz="400")");
  const Result r = RunUpright("check " + bad);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(bad + LineOf(bad, "<imu ") +
                          " sensors/imu rate_hz = 400: its period is 2.5 physics steps of the "
                          "default dt_s = 0.001 s"),
            std::string::npos)
      << r.output;
}

TEST(Cli, CheckOfAFolderChecksItsXmlFilesOnly) {
  namespace fs = std::filesystem;
  const auto folder = TempOut("folder");
  fs::create_directories(folder / "sub");
  fs::copy_file(Models() + "tabletop.xml", folder / "b.xml");
  fs::copy_file(BrokenCopy("courier.xml", "mass_kg=\"24\"", "mass_kg=\"-24\""), folder / "a.xml");
  std::ofstream(folder / "notes.txt") << "not a model\n";
  fs::copy_file(Models() + "tabletop.xml", folder / "sub" / "c.xml");  // not looked into
  const Result r = RunUpright("check " + folder.string());
  EXPECT_EQ(r.exit_code, 2) << r.output;
  const std::string a = (folder / "a.xml").string();
  EXPECT_NE(r.output.find(a + LineOf(a, "mass_kg=\"-24\"") + " chassis mass_kg = -24"),
            std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find((folder / "b.xml").string() + ": ok (robot model 'tabletop')\n"),
            std::string::npos)
      << r.output;
  EXPECT_EQ(r.output.find("c.xml"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("1 of 2 file(s) invalid"), std::string::npos) << r.output;

  const auto empty = TempOut("empty-folder");
  fs::create_directories(empty);
  const Result none = RunUpright("check " + empty.string());
  EXPECT_EQ(none.exit_code, 2) << none.output;
  EXPECT_EQ(none.output, empty.string() +
                             ": a folder with no .xml files (expected robot model or scenario "
                             "files, or a folder of them)\n1 of 1 file(s) invalid\n");
}

TEST(Cli, RunWritesEveryResultFileAndSaysWhere) {
  const auto out = TempOut("run");
  const Result r = RunUpright("run " + ShortScenario("short") + " --out " + out.string() +
                              " --jobs 2 --seeds 2");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("4 run(s)"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find(out.string() + "/summary.md"), std::string::npos) << r.output;
  const auto caution = r.output.find("Simulation only");
  EXPECT_NE(caution, std::string::npos) << r.output;
  EXPECT_EQ(r.output.find("Simulation only", caution + 1), std::string::npos) << r.output;
  for (const char* name : {"summary.csv", "summary.md", "compare.csv", "compare.md", "ranking.csv",
                           "ranking.md", "manifest.json"}) {
    EXPECT_TRUE(std::filesystem::is_regular_file(out / name)) << name;
  }
  // 2 controllers × 2 seeds: four traces, and nothing else (no temporary left behind).
  EXPECT_EQ(CountFiles(out / "traces"), 4u);
  EXPECT_EQ(CountFiles(out), 7u + 4u);
  std::ifstream summary(out / "summary.csv");
  std::string header;
  std::getline(summary, header);
  EXPECT_EQ(header.rfind("scenario,controller,seed,", 0), 0u) << header;
}

TEST(Cli, LinearTwinAddsTheGapTables) {
  const auto out = TempOut("twin");
  const Result r = RunUpright("run " + ShortScenario("twin") + " --out " + out.string() +
                              " --linear-twin --trace-rate 0");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find(out.string() + "/gap.md"), std::string::npos) << r.output;
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "gap.csv"));
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "gap.md"));
}

TEST(Cli, RunRejectsAnInvalidScenarioWithItsLineAndRunsNothing) {
  const auto out = TempOut("invalid");
  const std::string path = ShortScenario("invalid", R"(
    <controller name="lqr" builtin="lqr"/>)");
  const Result r = RunUpright("run " + path + " --out " + out.string());
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(path + ":"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("nothing was run"), std::string::npos) << r.output;
  EXPECT_FALSE(std::filesystem::exists(out));
}

TEST(Cli, SweepWithoutSamplesGoesOnToTheScenario) {
  // No --samples: not a usage error; the scenario is read (and this one has no dispersions).
  const std::string path = ShortScenario("nodispersions");
  const Result r = RunUpright("sweep " + path + " --out " + TempOut("nosamples").string());
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(path + ": the scenario declares no dispersions"), std::string::npos)
      << r.output;
}

TEST(Cli, RunTakesAFolderAsItsScenarioFilesByName) {
  const auto folder = TempOut("folder");
  std::filesystem::create_directories(folder);
  // Written as files of the folder: two scenarios (out of name order) and a robot model.
  std::filesystem::copy_file(ShortScenario("b-second"), folder / "b-second.xml");
  std::filesystem::copy_file(ShortScenario("a-first"), folder / "a-first.xml");
  std::filesystem::copy_file(Models() + "courier.xml", folder / "robot.xml");
  const auto out = TempOut("folder-out");
  const Result r = RunUpright("run " + folder.string() + "/ --out " + out.string() +
                              " --seeds 1 --trace-rate 0");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("2 scenario(s), 4 run(s)"), std::string::npos) << r.output;
  std::ifstream summary(out / "summary.csv");
  std::string line, order;
  std::getline(summary, line);
  while (std::getline(summary, line)) order += line.substr(0, line.find(',')) + " ";
  EXPECT_EQ(order, "a-first a-first b-second b-second ");

  const auto empty = TempOut("empty-folder");
  std::filesystem::create_directories(empty);
  const Result none = RunUpright("run " + empty.string());
  EXPECT_EQ(none.exit_code, 2) << none.output;
  EXPECT_NE(none.output.find(empty.string() +
                             ": a folder with no scenario files (*.xml whose root is <scenario>)"),
            std::string::npos)
      << none.output;
}

TEST(Cli, RunOfTheWorkingFolderWritesIntoResultsUnderItsName) {
  // `upright run .` in a folder of scenarios: the default results folder is named after the
  // folder ("results/<folder name>/"), not "results/." (the results folder itself).
  const auto folder = TempOut("here");
  std::filesystem::create_directories(folder);
  std::filesystem::copy_file(ShortScenario("one"), folder / "one.xml");
  std::filesystem::copy_file(ShortScenario("two"), folder / "two.xml");
  for (const char* arg : {".", "./"}) {
    std::filesystem::remove_all(folder / "results");
    const Result r =
        RunUpright(std::string("run ") + arg + " --seeds 1 --trace-rate 0", folder.string());
    ASSERT_EQ(r.exit_code, 0) << r.output;
    EXPECT_NE(r.output.find("2 scenario(s), 4 run(s) into results/here\n"), std::string::npos)
        << arg << "\n"
        << r.output;
    EXPECT_TRUE(std::filesystem::is_regular_file(folder / "results" / "here" / "summary.csv"))
        << arg;
    EXPECT_FALSE(std::filesystem::exists(folder / "results" / "summary.csv")) << arg;
  }
}

TEST(Cli, RunOffATerminalLogsPlainProgressLines) {
  // stderr into a file, as in a CI job: no carriage returns, and a plain line for the end.
  const auto out = TempOut("progress");
  const std::string log = WriteTemp("progress.log", "");
  const Result r = RunUpright(
      "run " + ShortScenario("progress") + " --out " + out.string() + " --seeds 2 --trace-rate 0",
      "", "2>" + log);
  ASSERT_EQ(r.exit_code, 0) << r.output;
  std::ifstream in(log);
  const std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  EXPECT_EQ(text.find('\r'), std::string::npos) << text;
  EXPECT_NE(text.find("upright run: 4/4 runs, 100 %, 0:"), std::string::npos) << text;
  EXPECT_EQ(r.output.find("upright run: 4/4 runs"), std::string::npos) << "stdout: " << r.output;
}

TEST(Cli, RunWithABrokenModuleFileExitsOneAndStillWritesTheTables) {
  const auto out = TempOut("missing");
  const std::string not_a_module = WriteTemp("not_a_module.so", "plain text\n");
  const Result r = RunUpright("run " + ShortScenario("missing", R"(
    <controller name="mine" file=")" + not_a_module + R"("/>)") +
                              " --out " + out.string() + " --trace-rate 0");
  EXPECT_EQ(r.exit_code, 1) << r.output;
  EXPECT_NE(r.output.find("missing / mine: "), std::string::npos) << r.output;
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "summary.csv"));
}

TEST(Cli, DemoHelpShowsItsOwnFolderAndNoLinearTwinFlag) {
  const Result r = RunUpright("demo --help");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("(default: results/demo;"), std::string::npos) << r.output;
  EXPECT_EQ(r.output.find("results/<scenario name>"), std::string::npos) << r.output;
  EXPECT_EQ(r.output.find("--linear-twin"), std::string::npos) << r.output;
  // The demo always plays the linear twins: the flag is not one of its options (a usage error
  // before anything runs, in a scratch folder in case it did run).
  const auto cwd = TempOut("demo-twin");
  std::filesystem::create_directories(cwd);
  const Result twin = RunUpright("demo --linear-twin --seeds 1 --trace-rate 0", cwd.string());
  EXPECT_EQ(twin.exit_code, 2) << twin.output;
  EXPECT_NE(twin.output.find("--linear-twin"), std::string::npos) << twin.output;
  EXPECT_FALSE(std::filesystem::exists(cwd / "results"));
}

TEST(Cli, DemoRunsTheWholeSuiteIntoResultsDemo) {
  const auto cwd = TempOut("demo");
  std::filesystem::create_directories(cwd);
  const Result demo = RunUpright("demo --jobs 2 --trace-rate 10 --seeds 1", cwd.string());
  ASSERT_EQ(demo.exit_code, 0) << demo.output;
  EXPECT_NE(demo.output.find("results/demo/summary.md"), std::string::npos) << demo.output;
  // The caution once, and the report named on the last line.
  const auto caution = demo.output.find("Simulation only");
  ASSERT_NE(caution, std::string::npos) << demo.output;
  EXPECT_EQ(demo.output.find("Simulation only", caution + 1), std::string::npos) << demo.output;
  const auto last = demo.output.rfind('\n', demo.output.size() - 2);
  EXPECT_EQ(demo.output.compare(last + 1, 8, "report: "), 0) << demo.output.substr(last + 1);
  const auto out = cwd / "results" / "demo";
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "ranking.md"));
  // Every demo scenario compares at least the four built-ins: one trace per scenario × controller.
  std::size_t scenarios = 0;
  for (const auto& e :
       std::filesystem::directory_iterator(std::string(UPRIGHT_SOURCE_DIR) + "/scenarios")) {
    scenarios += e.path().extension() == ".xml";
  }
  EXPECT_GE(CountFiles(out / "traces"), 4 * scenarios);
  // The tune, with the four built-ins ranked at their best and as designed on held-out seeds.
  EXPECT_TRUE(std::filesystem::is_regular_file(out / "tune" / "tune.md"));
  for (const char* replay : {"tuned", "defaults"}) {
    std::ifstream in(out / "tune" / replay / "ranking.csv");
    std::string ranking((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    for (const char* controller : {",lqr,", ",hinf,", ",lqg,", ",pid,"}) {
      EXPECT_NE(ranking.find(controller), std::string::npos) << replay << ": " << ranking;
    }
  }
}

// A one-controller shove of the courier, 2 s on one seed, for the tune tests.
std::string TuneScenario() {
  return WriteTemp("tune-shove.xml", R"(<scenario name="tune-shove" schema="1" duration_s="2">
  <description>Test: a parked courier shoved once.</description>
  <robot file=")" + Models() + R"(courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N="160" duration_s="0.3" height_m="0.45"/>
  </timeline>
  <controllers><controller name="lqr" builtin="lqr"/></controllers>
  <seeds list="1"/>
</scenario>
)");
}

TEST(Cli, TuneRefusesABadTuneFileWithItsLineBeforeRunning) {
  const std::string tune = WriteTemp("bad-tune.xml", R"(<tune schema="1">
  <controller name="lqr">
    <knob setting="max_tilt_deg" lo="5" hi="1"/>
  </controller>
</tune>
)");
  const std::string out = WriteTemp("tune-out-unused", "");
  std::filesystem::remove(out);
  const Result r = RunUpright("tune " + TuneScenario() + " --tune " + tune + " --out " + out);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find(tune + ":3: knob max_tilt_deg: lo = 5 must be below hi = 1"),
            std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find("nothing was run"), std::string::npos) << r.output;
  EXPECT_FALSE(std::filesystem::exists(out));
}

TEST(Cli, TuneRefusesAnUnknownControllerAndATooSmallBudget) {
  const Result unknown = RunUpright("tune " + TuneScenario() + " --controller pd");
  EXPECT_EQ(unknown.exit_code, 2) << unknown.output;
  EXPECT_NE(unknown.output.find("no controller named pd (its controllers: lqr)"), std::string::npos)
      << unknown.output;
  const Result small = RunUpright("tune " + TuneScenario() + " --budget 2");
  EXPECT_EQ(small.exit_code, 2) << small.output;
  EXPECT_NE(small.output.find("--budget 2 runs is too small"), std::string::npos) << small.output;
}

TEST(Cli, TuneWritesItsTablesAndPrintsEachController) {
  const std::string tune = WriteTemp("tilt-tune.xml", R"(<tune schema="1">
  <controller name="lqr"><knob setting="max_tilt_deg" lo="1" hi="6"/></controller>
</tune>
)");
  const auto out =
      std::filesystem::temp_directory_path() / ("upright_cli_tune_" + std::to_string(getpid()));
  std::filesystem::remove_all(out);
  const Result r = RunUpright("tune " + TuneScenario() + " --tune " + tune +
                              " --budget 5 --holdout 1 --jobs 2 --out " + out.string());
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("lqr: objective "), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("on held-out seeds: "), std::string::npos) << r.output;
  EXPECT_NE(r.output.find(" runs, best "), std::string::npos) << r.output;
  EXPECT_TRUE(std::filesystem::exists(out / "tune.csv"));
  std::ifstream md(out / "tune.md");
  const std::string text((std::istreambuf_iterator<char>(md)), std::istreambuf_iterator<char>());
  EXPECT_NE(text.find("<controller name=\"lqr\" builtin=\"lqr\""), std::string::npos) << text;
  std::filesystem::remove_all(out);
}

TEST(Cli, TuneResumesFromItsLogAndRefusesAnotherTunesLog) {
  const auto out = std::filesystem::temp_directory_path() /
                   ("upright_cli_tune_resume_" + std::to_string(getpid()));
  std::filesystem::remove_all(out);
  const std::string tune =
      "tune " + TuneScenario() + " --budget 4 --holdout 1 --jobs 1 --out " + out.string();
  const Result first = RunUpright(tune);
  ASSERT_EQ(first.exit_code, 0) << first.output;
  const auto read = [](const std::filesystem::path& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  };
  const std::string csv = read(out / "tune.csv");
  const std::string log = read(out / "tune.log");
  // The header and lqr's first two evaluations (one run each), then a line cut short.
  std::size_t end = 0;
  for (int i = 0; i < 3; ++i) end = log.find('\n', end) + 1;
  std::ofstream(out / "tune.log", std::ios::binary) << log.substr(0, end + 10);
  const Result resumed = RunUpright(tune + " --resume");
  EXPECT_EQ(resumed.exit_code, 0) << resumed.output;
  EXPECT_NE(resumed.output.find("resuming: 2 evaluation(s) in " + (out / "tune.log").string()),
            std::string::npos)
      << resumed.output;
  EXPECT_NE(resumed.output.find(" run(s) (2 replayed from tune.log); "), std::string::npos)
      << resumed.output;
  EXPECT_EQ(read(out / "tune.csv"), csv);
  EXPECT_EQ(read(out / "tune.log"), log);
  // Another seed is another tune: refused as bad input, nothing run or written.
  const Result other = RunUpright(tune + " --seed 2 --resume");
  EXPECT_EQ(other.exit_code, 2) << other.output;
  EXPECT_NE(other.output.find((out / "tune.log").string() +
                              ":1: the log is of another tune: seed is 2 here, 1 in the log"),
            std::string::npos)
      << other.output;
  EXPECT_EQ(read(out / "tune.log"), log);
}

TEST(Cli, TuneParetoRefusesAMetricItCannotTradeAndWritesTheFront) {
  const Result bad = RunUpright("tune " + TuneScenario() + " --pareto max_tilt_deg,fall_time_s");
  EXPECT_EQ(bad.exit_code, 2) << bad.output;
  EXPECT_NE(bad.output.find("fall_time_s is no metric a front can trade"), std::string::npos)
      << bad.output;
  EXPECT_NE(bad.output.find("nothing was run"), std::string::npos) << bad.output;
  const std::string tune = WriteTemp("pareto-tune.xml", R"(<tune schema="1">
  <controller name="lqr"><knob setting="max_tilt_deg" lo="1" hi="6"/></controller>
</tune>
)");
  const auto out =
      std::filesystem::temp_directory_path() / ("upright_cli_pareto_" + std::to_string(getpid()));
  std::filesystem::remove_all(out);
  const Result r =
      RunUpright("tune " + TuneScenario() + " --tune " + tune +
                 " --budget 5 --holdout 0 --pareto max_tilt_deg,energy_J --out " + out.string());
  EXPECT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("searched: the Pareto front of max_tilt_deg against energy_J"),
            std::string::npos)
      << r.output;
  EXPECT_NE(r.output.find("Pareto front: "), std::string::npos) << r.output;
  std::ifstream csv(out / "pareto.csv");
  std::string header;
  std::getline(csv, header);
  EXPECT_EQ(header, "controller,mean_max_tilt_deg,mean_energy_J,evaluation,settings");
  std::string row;
  EXPECT_TRUE(std::getline(csv, row) && row.rfind("lqr,", 0) == 0) << row;
  std::filesystem::remove_all(out);
}

}  // namespace
