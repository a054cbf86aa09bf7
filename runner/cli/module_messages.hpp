// Controller modules' messages as the program shows them, after a batch: one line on stderr per
// message a run kept, at the message's level, naming the run and the simulated time ("create"
// before the first tick), and one line for the messages a run dropped.
#pragma once

#include <string>
#include <string_view>

#include "log.hpp"
#include "upright/runner/metrics/module_log.hpp"
#include "upright/runner/metrics/run_result.hpp"

namespace upright::cli {

// The message as one line: its lines trimmed and joined with " | ", other control characters
// read as spaces.
std::string OneLine(std::string_view text);

// Logs the messages of `log`, from the module at `where` ("courier-shove / lqr / seed 3"):
// "<where>, t = 0.250 s: module warning: <text>" and
// "<where>: module: 4980 more message(s) dropped (the first 20 of a run are kept)".
void LogModuleMessages(const Logger& logger, std::string_view where, const runner::ModuleLog& log);

// Every run's messages (and its linear twin's, "..., linear twin") in the batch's order.
void LogModuleMessages(const Logger& logger, const runner::BatchResult& batch);

}  // namespace upright::cli
