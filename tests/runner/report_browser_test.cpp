// The report as a browser shows it: headless Chromium renders the small run's report to a PNG and
// logs the page's console. Skipped when /usr/bin/chromium is absent (scripts/setup.sh installs it).
//
// How console errors are detected: Chromium started with --enable-logging=stderr --v=0 writes
// every console message of the page to stderr as a line holding ":CONSOLE" — script errors, and
// also the errors it finds in SVG attributes ("Error: <path> attribute d: Expected number") and
// resources that fail to load. The report has no script, so any such line is a defect. A page
// made broken on purpose checks first that the detector does see them. Each run gets its own
// profile folder, and host names resolve to nothing, so no run can reach the network.
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "report_test_support.hpp"
#include "upright/runner/report/report.hpp"

namespace upright::runner {
namespace {

namespace fs = std::filesystem;
using testing::ReadFile;
using testing::ScratchDir;

constexpr const char* kChromium = "/usr/bin/chromium";

struct Browser {
  int code = -1;
  std::string out;                   // stdout (the DOM with --dump-dom)
  std::vector<std::string> console;  // stderr lines holding ":CONSOLE"
};

// Runs Chromium headless on `page` with `mode` ("--screenshot=FILE ..." or "--dump-dom").
Browser RunChromium(const fs::path& page, const std::string& mode, const fs::path& scratch) {
  Browser b;
  const fs::path err = scratch / "chromium.err";
  const std::string command =
      std::string(kChromium) +
      " --headless --no-sandbox --disable-gpu --no-first-run --user-data-dir=" +
      (scratch / "profile").string() +
      " --host-resolver-rules='MAP * ~NOTFOUND' --enable-logging=stderr --v=0 " + mode +
      " 'file://" + page.string() + "' 2>" + err.string();
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return b;
  char buffer[4096];
  for (std::size_t n; (n = fread(buffer, 1, sizeof buffer, pipe)) > 0;) b.out.append(buffer, n);
  const int status = pclose(pipe);
  b.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  std::istringstream lines(ReadFile(err));
  for (std::string line; std::getline(lines, line);) {
    if (line.find(":CONSOLE") != std::string::npos) b.console.push_back(line);
  }
  return b;
}

std::string Joined(const std::vector<std::string>& lines) {
  std::string text;
  for (const auto& l : lines) text += l + "\n";
  return text;
}

std::size_t Count(const std::string& text, const std::string& needle) {
  std::size_t n = 0;
  for (auto at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) ++n;
  return n;
}

TEST(ReportInBrowser, RendersWithoutConsoleErrors) {
  if (!fs::exists(kChromium)) {
    GTEST_SKIP() << kChromium << " is absent: install the chromium package (scripts/setup.sh) "
                 << "to check that the report renders";
  }
  const fs::path scratch = ScratchDir("report-browser");

  // The detector sees a broken page's errors.
  const fs::path broken = scratch / "broken.html";
  std::ofstream(broken) << "<!DOCTYPE html><html><body><svg width=\"10\" height=\"10\">"
                           "<path d=\"M1 2lx\"/></svg><script>console.error('seen')</script>"
                           "</body></html>";
  const Browser control = RunChromium(broken, "--dump-dom", scratch);
  ASSERT_EQ(control.code, 0) << control.out;
  ASSERT_GE(control.console.size(), 2u)
      << "Chromium did not log the broken page's console errors; the check below would be blind";

  const auto& run = testing::SmallRunFolder();
  const Result<ReportWritten, ReportFailure> made = MakeReport(run.dir.string());
  ASSERT_TRUE(made) << made.error().message;
  const ReportWritten& report = *made;
  const std::string html = ReadFile(report.path);

  const fs::path png = scratch / "report.png";
  const Browser shot =
      RunChromium(report.path, "--window-size=1280,2000 --screenshot=" + png.string(), scratch);
  EXPECT_EQ(shot.code, 0);
  EXPECT_TRUE(shot.console.empty()) << Joined(shot.console);

  // A PNG (signature and IHDR per the PNG specification, ISO/IEC 15948 §5.2 and §11.2.2) of the
  // window's size. A blank 1280 × 2000 page compresses to under 10 kB (measured with this
  // Chromium); the report's plots and tables take far more.
  const std::string bytes = ReadFile(png);
  ASSERT_GT(bytes.size(), 24u);
  EXPECT_EQ(bytes.substr(0, 8), std::string("\x89PNG\r\n\x1a\n", 8));
  const auto be32 = [&](std::size_t at) {
    return (static_cast<unsigned>(static_cast<unsigned char>(bytes[at])) << 24) |
           (static_cast<unsigned>(static_cast<unsigned char>(bytes[at + 1])) << 16) |
           (static_cast<unsigned>(static_cast<unsigned char>(bytes[at + 2])) << 8) |
           static_cast<unsigned>(static_cast<unsigned char>(bytes[at + 3]));
  };
  EXPECT_EQ(bytes.substr(12, 4), "IHDR");
  EXPECT_EQ(be32(16), 1280u);
  EXPECT_EQ(be32(20), 2000u);
  EXPECT_GT(bytes.size(), 50u * 1000) << "the screenshot looks blank: " << png;
  std::printf("screenshot: %s (%zu bytes)\n", png.c_str(), bytes.size());

  // The browser's own parse of the page holds every chart the file holds.
  const Browser dom = RunChromium(report.path, "--dump-dom", scratch);
  EXPECT_EQ(dom.code, 0);
  EXPECT_TRUE(dom.console.empty()) << Joined(dom.console);
  EXPECT_EQ(Count(dom.out, "<svg "), Count(html, "<svg "));
  EXPECT_EQ(Count(dom.out, "data-plot=\"tilt\""), 1u);
}

}  // namespace
}  // namespace upright::runner
