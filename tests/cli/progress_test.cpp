// The progress line off a terminal: plain lines into a file, one per update when the interval is
// 0, only the last one when it is long, and a closing line when the runs expected shrank.
#include "progress.hpp"

#include <gtest/gtest.h>

#include <cstdio>
#include <string>
#include <vector>

namespace upright::cli {
namespace {

// Everything written to `file` so far, as lines.
std::vector<std::string> Lines(std::FILE* file) {
  std::fflush(file);
  std::rewind(file);
  std::vector<std::string> lines;
  std::string line;
  for (int c = std::fgetc(file); c != EOF; c = std::fgetc(file)) {
    if (c == '\n') {
      lines.push_back(line);
      line.clear();
    } else {
      line += static_cast<char>(c);
    }
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

TEST(ProgressLine, OffATerminalEveryUpdatePrintsAPlainLineWhenTheIntervalIsZero) {
  std::FILE* log = std::tmpfile();
  ASSERT_NE(log, nullptr);
  {
    ProgressLine progress({.label = "upright run", .interval_s = 0, .stream = log});
    const runner::ProgressFn callback = progress.Callback();
    for (std::size_t done = 1; done <= 8; ++done) callback(done, 8);
    progress.Close();
  }
  const std::vector<std::string> lines = Lines(log);
  std::fclose(log);
  ASSERT_EQ(lines.size(), 8u);
  // "upright run: 2/8 runs, 25 %, 0:00 elapsed, ~0:00 left": no carriage return, no redraw.
  EXPECT_EQ(lines[1].rfind("upright run: 2/8 runs, 25 %, 0:", 0), 0u) << lines[1];
  EXPECT_NE(lines[1].find(" elapsed, ~0:"), std::string::npos) << lines[1];
  EXPECT_NE(lines[1].find(" left"), std::string::npos) << lines[1];
  EXPECT_EQ(lines[6].rfind("upright run: 7/8 runs, 88 %,", 0), 0u) << lines[6];  // 87.5 rounded
  EXPECT_EQ(lines[7].rfind("upright run: 8/8 runs, 100 %, 0:", 0), 0u) << lines[7];
  EXPECT_EQ(lines[7].find("left"), std::string::npos) << lines[7];
  for (const auto& line : lines) EXPECT_EQ(line.find('\r'), std::string::npos) << line;
}

TEST(ProgressLine, ANoteFollowsTheRuns) {
  std::FILE* log = std::tmpfile();
  ASSERT_NE(log, nullptr);
  {
    ProgressLine progress({.label = "upright tune", .interval_s = 0, .stream = log});
    progress.Show(1, 4, "best 17.76");
    progress.Show(4, 4, "best 16.5");
  }
  const std::vector<std::string> lines = Lines(log);
  std::fclose(log);
  ASSERT_EQ(lines.size(), 2u);
  EXPECT_EQ(lines[0].rfind("upright tune: 1/4 runs, best 17.76, 25 %, 0:", 0), 0u) << lines[0];
  EXPECT_EQ(lines[1].rfind("upright tune: 4/4 runs, best 16.5, 100 %, 0:", 0), 0u) << lines[1];
}

TEST(ProgressLine, OffATerminalALongIntervalLeavesOnlyTheFinalLine) {
  std::FILE* log = std::tmpfile();
  ASSERT_NE(log, nullptr);
  {
    ProgressLine progress({.label = "upright sweep", .interval_s = 1e9, .stream = log});
    for (std::size_t done = 1; done <= 40; ++done) progress.Show(done, 40);
  }
  const std::vector<std::string> lines = Lines(log);
  std::fclose(log);
  ASSERT_EQ(lines.size(), 1u);
  EXPECT_EQ(lines[0].rfind("upright sweep: 40/40 runs, 100 %, 0:", 0), 0u) << lines[0];
}

TEST(ProgressLine, CloseEndsWithTheRunsDoneWhenTheExpectedTotalShrank) {
  // An envelope's bisections can end early: the last update is not done == all.
  std::FILE* log = std::tmpfile();
  ASSERT_NE(log, nullptr);
  {
    ProgressLine progress({.label = "upright envelope", .interval_s = 1e9, .stream = log});
    for (std::size_t done = 1; done <= 30; ++done) progress.Show(done, 45);
    progress.Close();
    progress.Close();  // once only
  }
  const std::vector<std::string> lines = Lines(log);
  std::fclose(log);
  ASSERT_EQ(lines.size(), 1u);
  EXPECT_EQ(lines[0].rfind("upright envelope: 30 runs done, 0:", 0), 0u) << lines[0];
}

}  // namespace
}  // namespace upright::cli
