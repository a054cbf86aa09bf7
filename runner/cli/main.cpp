// Entry point of the `upright` program: parses the command line and dispatches to a subcommand.
#include <CLI/CLI.hpp>

#include <iostream>

#include "commands.hpp"
#include "upright_version.hpp"

int main(int argc, char** argv) {
  CLI::App app{
      "upright: tests balance controllers for two-wheeled self-balancing robots on a rigid-body "
      "physics model.\nSimulation results never certify a real robot: validate on hardware with a "
      "tether or spotter, at low speed first, within local rules."};
  app.set_version_flag("--version", std::string("upright ") + UPRIGHT_VERSION);
  app.require_subcommand(1);

  std::vector<std::string> check_files;
  auto* check = app.add_subcommand("check", "Validate robot model files; exit 0 when all are valid");
  check->add_option("FILE", check_files, "Robot model files (.xml)")->required();

  upright::cli::PlantDemoOptions demo;
  demo.model_path = std::string(UPRIGHT_SOURCE_DIR) + "/models/courier.xml";
  auto* demo_cmd = app.add_subcommand(
      "demo", "Show the demo robot balancing under a simple state feedback while it is pushed");
  demo_cmd->add_option("--model", demo.model_path, "Robot model file")->capture_default_str();
  demo_cmd->add_option("--duration-s", demo.duration_s, "Simulated time, s")
      ->check(CLI::Range(0.5, 600.0))
      ->capture_default_str();
  demo_cmd->add_option("--push-N", demo.push_N,
                       "Half-sine push peak force, N (0: 15 % of the robot's weight)")
      ->check(CLI::Range(0.0, 1e5))
      ->capture_default_str();

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : upright::cli::kExitBadInput;
  }
  if (check->parsed()) return upright::cli::RunCheck(check_files);
  if (demo_cmd->parsed()) return upright::cli::RunPlantDemo(demo);
  return upright::cli::kExitBadInput;
}
