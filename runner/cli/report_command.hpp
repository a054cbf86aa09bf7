// `upright report DIR`: a results folder in; DIR/report.html written and its path and size
// printed.
#pragma once

#include <CLI/CLI.hpp>
#include <string>

namespace upright::cli {

// Adds the `report` subcommand to `app`, parsing the folder into `dir`; returns it (parsed()
// tells whether it was chosen).
CLI::App* AddReportCommand(CLI::App* app, std::string* dir);

// Writes DIR/report.html. Exit 2 when DIR holds no results files (the message names what was
// looked for) or one cannot be parsed, 1 when the report cannot be written.
int RunReport(const std::string& dir);

}  // namespace upright::cli
