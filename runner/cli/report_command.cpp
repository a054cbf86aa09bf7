// `upright report DIR`: the report of a results folder, and where it went.
#include "report_command.hpp"

#include "commands.hpp"
#include "log.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/report/report.hpp"

namespace upright::cli {

CLI::App* AddReportCommand(CLI::App* app, std::string* dir) {
  auto* cmd = app->add_subcommand(
      "report",
      "Write DIR/report.html: one self-contained page (no network) with time plots, the tables, "
      "envelope, sweep and gap charts of the results folder DIR and of results folders inside it");
  cmd->add_option("DIR", *dir, "Results folder (of upright run, demo, envelope or sweep)")
      ->required();
  return cmd;
}

int RunReport(const std::string& dir) {
  const Result<runner::ReportWritten, runner::ReportFailure> made = runner::MakeReport(dir);
  if (!made) {
    Log().Error(made.error().message);
    switch (made.error().problem) {
      case runner::ReportProblem::kNoResults:
      case runner::ReportProblem::kBadInput:
        return kExitBadInput;
      case runner::ReportProblem::kWriteFailed:
        return kExitFailed;
    }
    return kExitFailed;
  }
  Log().Info(Printf("upright report: %s (%s kB, %zu results folder(s))", made->path.c_str(),
                    FixedText(static_cast<double>(made->bytes) / 1000.0, 1).c_str(),
                    made->folders));
  Log().Caution(kCaution);
  return kExitOk;
}

}  // namespace upright::cli
