// The record of a module's messages: levels filtered, times kept, the first messages kept and the
// rest counted, long messages cut at a character boundary, bytes that are no UTF-8 replaced, and
// no allocation once the recorder is built.
#include "upright/runner/metrics/module_log.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>

#include "allocation_count.hpp"
#include "upright/controller_abi.h"

namespace upright::runner {
namespace {

constexpr double kBeforeFirstTick = std::numeric_limits<double>::quiet_NaN();

TEST(ModuleLog, LevelsAreTheAbisNumbers) {
  // The recorder takes upright_log_level's values as they cross the C ABI.
  EXPECT_EQ(LogLevelFromModule(UPRIGHT_LOG_DEBUG), LogLevel::kDebug);
  EXPECT_EQ(LogLevelFromModule(UPRIGHT_LOG_INFO), LogLevel::kInfo);
  EXPECT_EQ(LogLevelFromModule(UPRIGHT_LOG_WARNING), LogLevel::kWarning);
  EXPECT_EQ(LogLevelFromModule(UPRIGHT_LOG_ERROR), LogLevel::kError);
  // Out of range: below reads debug, above reads error.
  EXPECT_EQ(LogLevelFromModule(-4), LogLevel::kDebug);
  EXPECT_EQ(LogLevelFromModule(17), LogLevel::kError);
  EXPECT_STREQ(ToString(LogLevel::kDebug), "debug");
  EXPECT_STREQ(ToString(LogLevel::kInfo), "info");
  EXPECT_STREQ(ToString(LogLevel::kWarning), "warning");
  EXPECT_STREQ(ToString(LogLevel::kError), "error");
}

TEST(ModuleLog, KeepsMessagesAtOrAboveItsLevelWithTheirTimes) {
  ModuleLogRecorder recorder;  // info and above
  recorder.Add(UPRIGHT_LOG_DEBUG, kBeforeFirstTick, "gains ready");
  recorder.Add(UPRIGHT_LOG_INFO, kBeforeFirstTick, "created");
  recorder.Add(UPRIGHT_LOG_DEBUG, 0.005, "tick");
  recorder.Add(UPRIGHT_LOG_WARNING, 0.25, "estimator saturated");
  recorder.Add(UPRIGHT_LOG_ERROR, 1.5, "lost the encoder");
  const ModuleLog log = recorder.Log();
  ASSERT_EQ(log.messages.size(), 3u);
  EXPECT_TRUE(std::isnan(log.messages[0].time_s));
  EXPECT_EQ(log.messages[0].level, LogLevel::kInfo);
  EXPECT_EQ(log.messages[0].text, "created");
  EXPECT_EQ(log.messages[1].time_s, 0.25);
  EXPECT_EQ(log.messages[1].level, LogLevel::kWarning);
  EXPECT_EQ(log.messages[1].text, "estimator saturated");
  EXPECT_EQ(log.messages[2].time_s, 1.5);
  EXPECT_EQ(log.messages[2].level, LogLevel::kError);
  // Messages below the level are neither kept nor counted as dropped.
  EXPECT_EQ(log.dropped, 0);

  ModuleLogRecorder everything(LogLevel::kDebug);
  everything.Add(UPRIGHT_LOG_DEBUG, 0.005, "tick");
  ASSERT_EQ(everything.Log().messages.size(), 1u);
  EXPECT_EQ(everything.Log().messages[0].level, LogLevel::kDebug);

  ModuleLogRecorder errors_only(LogLevel::kError);
  errors_only.Add(UPRIGHT_LOG_WARNING, 0.1, "slipping");
  EXPECT_TRUE(errors_only.Log().messages.empty());
}

TEST(ModuleLog, AFloodKeepsTheFirstMessagesAndCountsTheRest) {
  ModuleLogRecorder recorder;
  const int total = 5000;
  for (int i = 0; i < total; ++i) {
    recorder.Add(i == 4000 ? UPRIGHT_LOG_WARNING : UPRIGHT_LOG_INFO, 0.001 * i,
                 "message " + std::to_string(i));
  }
  const ModuleLog log = recorder.Log();
  ASSERT_EQ(log.messages.size(), kModuleMessagesKept);
  EXPECT_EQ(kModuleMessagesKept, 20u);
  EXPECT_EQ(log.messages.front().text, "message 0");
  EXPECT_EQ(log.messages.back().text, "message 19");
  EXPECT_NEAR(log.messages.back().time_s, 0.019, 1e-15);
  EXPECT_EQ(log.dropped, total - 20);
  // The most severe of the dropped: the one warning among them.
  EXPECT_EQ(log.dropped_level, LogLevel::kWarning);
}

TEST(ModuleLog, AddNeverAllocatesEvenPastWhatItKeeps) {
  ModuleLogRecorder recorder;
  const std::string long_text(3 * kModuleMessageBytes, 'x');
  const long before = testing::AllocationCount();
  for (int i = 0; i < 1000; ++i) {
    recorder.Add(UPRIGHT_LOG_INFO, 0.001 * i, "a message longer than any short-string buffer");
    recorder.Add(UPRIGHT_LOG_WARNING, 0.001 * i, long_text);
  }
  EXPECT_EQ(testing::AllocationCount() - before, 0);
  EXPECT_EQ(recorder.Log().dropped, 2000 - 20);
}

TEST(ModuleLog, ALongMessageIsCutToItsByteLimitEndingInDots) {
  ModuleLogRecorder recorder;
  recorder.Add(UPRIGHT_LOG_INFO, 0, std::string(kModuleMessageBytes, 'a'));      // fits exactly
  recorder.Add(UPRIGHT_LOG_INFO, 0, std::string(kModuleMessageBytes + 1, 'b'));  // one too many
  const ModuleLog log = recorder.Log();
  ASSERT_EQ(log.messages.size(), 2u);
  EXPECT_EQ(kModuleMessageBytes, 512u);
  EXPECT_EQ(log.messages[0].text, std::string(512, 'a'));
  EXPECT_EQ(log.messages[1].text, std::string(509, 'b') + "...");
}

TEST(ModuleLog, ACutNeverSplitsACharacter) {
  // "é" is two bytes in UTF-8 (C3 A9): 508 ASCII bytes then "é" and more, cut to 509 bytes of
  // text, would end halfway through it; the cut falls before it instead.
  const std::string text = std::string(508, 'a') + "\xc3\xa9" + std::string(100, 'z');
  ModuleLogRecorder recorder;
  recorder.Add(UPRIGHT_LOG_INFO, 0, text);
  const std::string kept = recorder.Log().messages.at(0).text;
  EXPECT_EQ(kept, std::string(508, 'a') + "...");
}

TEST(ModuleLog, BytesThatAreNoUtf8ReadAsQuestionMarks) {
  // RFC 3629 §4: C0 (an overlong lead), a lone continuation byte 80, ED A0 80 (a surrogate,
  // U+D800), F4 90 80 80 (above U+10FFFF) and a sequence cut short (E2 82) are ill-formed; "€"
  // (E2 82 AC) and "𝄞" (F0 9D 84 9E) are well formed and kept.
  ModuleLogRecorder recorder;
  recorder.Add(UPRIGHT_LOG_INFO, 0,
               "a\xc0" "b\x80" "c\xed\xa0\x80" "d\xf4\x90\x80\x80" "e\xe2\x82\xac" "f"
               "\xf0\x9d\x84\x9e" "g\xe2\x82");
  EXPECT_EQ(recorder.Log().messages.at(0).text,
            "a?b?c???d????e\xe2\x82\xac" "f\xf0\x9d\x84\x9e" "g??");
}

}  // namespace
}  // namespace upright::runner
