// The program's logger on its own: which lines each verbosity shows and on which stream, and
// module messages made into single lines that name their run, time and level.
#include "log.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <limits>
#include <string>

#include "module_messages.hpp"

namespace upright::cli {
namespace {

// Everything written to `file` so far.
std::string Text(std::FILE* file) {
  std::fflush(file);
  std::rewind(file);
  std::string text;
  for (int c = std::fgetc(file); c != EOF; c = std::fgetc(file)) text += static_cast<char>(c);
  return text;
}

// What a logger of `verbosity` writes to its stdout and stderr for one line of each kind.
struct Written {
  std::string out, err;
};

Written WriteOneOfEach(Verbosity verbosity) {
  std::FILE* out = std::tmpfile();
  std::FILE* err = std::tmpfile();
  const Logger log(verbosity, out, err);
  log.Error("an error");
  log.Warning("a warning");
  log.Info("some information");
  log.Debug("a detail");
  log.Out(LogLevel::kError, "a failed run among the results");
  log.Caution("the caution");
  Written w{Text(out), Text(err)};
  std::fclose(out);
  std::fclose(err);
  return w;
}

TEST(Logger, NormalShowsErrorsWarningsAndInformationEachOnItsStream) {
  const Written w = WriteOneOfEach(Verbosity::kNormal);
  EXPECT_EQ(w.out, "some information\na failed run among the results\nthe caution\n");
  EXPECT_EQ(w.err, "an error\na warning\n");
}

TEST(Logger, QuietKeepsErrorsWarningsAndTheCaution) {
  const Written w = WriteOneOfEach(Verbosity::kQuiet);
  EXPECT_EQ(w.out, "a failed run among the results\nthe caution\n");
  EXPECT_EQ(w.err, "an error\na warning\n");
  EXPECT_FALSE(Logger(Verbosity::kQuiet, stdout, stderr).ShowsProgress());
  EXPECT_TRUE(Logger(Verbosity::kNormal, stdout, stderr).ShowsProgress());
}

TEST(Logger, VerboseAddsDebugLinesOnStderr) {
  const Written w = WriteOneOfEach(Verbosity::kVerbose);
  EXPECT_EQ(w.out, "some information\na failed run among the results\nthe caution\n");
  EXPECT_EQ(w.err, "an error\na warning\ndebug: a detail\n");
}

TEST(Logger, PrintfFormatsAsPrintfDoes) {
  EXPECT_EQ(Printf("%zu of %zu run(s) survived; %.1f s on %d job(s)", std::size_t{3},
                   std::size_t{4}, 1.25, 2),
            "3 of 4 run(s) survived; 1.2 s on 2 job(s)");  // 1.25 is exact: ties to even
  EXPECT_EQ(Printf("%s", ""), "");
  EXPECT_EQ(Printf("%s", std::string(5000, 'x').c_str()).size(), 5000u);
}

TEST(ModuleMessages, AMessageOfSeveralLinesReadsAsOne) {
  EXPECT_EQ(OneLine("K =\n  -8.0 -17.6\n  -8.0  17.6\n"), "K = | -8.0 -17.6 | -8.0  17.6");
  EXPECT_EQ(OneLine("tab\there\r\n"), "tab here");
  EXPECT_EQ(OneLine("bell\x07 and escape\x1b[31m"), "bell  and escape [31m");
  EXPECT_EQ(OneLine("\n\n"), "");
}

TEST(ModuleMessages, EachKeptMessageAndTheDroppedCountAtTheirLevels) {
  runner::ModuleLog log;
  log.messages = {{std::numeric_limits<double>::quiet_NaN(), LogLevel::kInfo, "created"},
                  {0.25, LogLevel::kWarning, "saturated\nat both wheels"},
                  {1.5, LogLevel::kDebug, "gain step"}};
  log.dropped = 7;
  log.dropped_level = LogLevel::kInfo;
  for (const Verbosity verbosity : {Verbosity::kQuiet, Verbosity::kNormal, Verbosity::kVerbose}) {
    std::FILE* out = std::tmpfile();
    std::FILE* err = std::tmpfile();
    LogModuleMessages(Logger(verbosity, out, err), "ramp / lqr / seed 3", log);
    const std::string created = "ramp / lqr / seed 3, create: module info: created\n";
    const std::string saturated =
        "ramp / lqr / seed 3, t = 0.250 s: module warning: saturated | at both wheels\n";
    const std::string gain = "ramp / lqr / seed 3, t = 1.500 s: module debug: gain step\n";
    const std::string dropped =
        "ramp / lqr / seed 3: module: 7 more message(s) dropped (the first 20 of a run are "
        "kept)\n";
    switch (verbosity) {
      case Verbosity::kQuiet:
        EXPECT_EQ(Text(err), saturated);
        break;
      case Verbosity::kNormal:
        EXPECT_EQ(Text(err), created + saturated + dropped);
        break;
      case Verbosity::kVerbose:
        EXPECT_EQ(Text(err), created + saturated + gain + dropped);
        break;
    }
    EXPECT_EQ(Text(out), "");
    std::fclose(out);
    std::fclose(err);
  }
}

}  // namespace
}  // namespace upright::cli
