// The manifest reader: JSON values and escapes per RFC 8259, refusals with their line, and the
// fields the report takes from a manifest.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>

#include "json_reader.hpp"
#include "manifest_info.hpp"
#include "run_test_support.hpp"

namespace upright::runner::report {
namespace {

JsonValue Parse(std::string_view text) {
  const Result<JsonValue> value = ParseJson(text, "m.json");
  EXPECT_TRUE(value) << value.error();
  return value.value_or(JsonValue{});
}

// Why `text` is refused; a test failure, and "", when it is not.
std::string ErrorOf(std::string_view text) {
  const Result<JsonValue> value = ParseJson(text, "m.json");
  EXPECT_FALSE(value);
  return value ? "" : value.error();
}

TEST(JsonReader, ReadsEveryKindOfValue) {
  const JsonValue v = Parse(
      " {\"s\": \"x\", \"n\": -1.5e2, \"t\": true, \"f\": false, \"z\": null,\n"
      "  \"a\": [1, [], {}], \"o\": {\"k\": 7}} ");
  ASSERT_EQ(v.kind, JsonKind::kObject);
  EXPECT_EQ(v.StringOr("s", "?"), "x");
  EXPECT_DOUBLE_EQ(v.Find("n")->number, -150.0);
  EXPECT_EQ(v.Find("n")->text, "-1.5e2");
  EXPECT_TRUE(v.Find("t")->boolean);
  EXPECT_FALSE(v.Find("f")->boolean);
  EXPECT_EQ(v.Find("z")->kind, JsonKind::kNull);
  ASSERT_EQ(v.Find("a")->items.size(), 3u);
  EXPECT_EQ(v.Find("a")->items[1].kind, JsonKind::kArray);
  EXPECT_DOUBLE_EQ(v.Find("o")->Find("k")->number, 7.0);
  EXPECT_EQ(v.Find("missing"), nullptr);
  EXPECT_EQ(v.StringOr("n", "fallback"), "fallback");
  // Members keep their file order.
  EXPECT_EQ(v.members.front().first, "s");
  EXPECT_EQ(v.members.back().first, "o");
}

// RFC 8259 §7: the two-character escapes, \u escapes, and a character outside the Basic
// Multilingual Plane as a surrogate pair — the RFC's own example, G clef U+1D11E as
// "\uD834\uDD1E" (UTF-8 F0 9D 84 9E).
TEST(JsonReader, DecodesEscapesToUtf8) {
  const JsonValue v = Parse(R"(["a\"b\\c\/d\b\f\n\r\t", "\u00e9", "\uD834\uDD1E"])");
  EXPECT_EQ(v.items[0].text, "a\"b\\c/d\b\f\n\r\t");
  EXPECT_EQ(v.items[1].text, "\xC3\xA9");
  EXPECT_EQ(v.items[2].text, "\xF0\x9D\x84\x9E");
}

TEST(JsonReader, RefusesMalformedTextNamingTheLine) {
  EXPECT_EQ(ErrorOf("{\n\"a\": 1\n\"b\": 2}"), "m.json:3: expected ',' or '}' in an object");
  EXPECT_EQ(ErrorOf("[1, "), "m.json:1: the file ends early (expected a value)");
  EXPECT_EQ(ErrorOf("[1, 2"), "m.json:1: expected ',' or ']' in an array");
  EXPECT_EQ(ErrorOf("{\"a\": \"open}"), "m.json:1: a string is never closed (expected '\"')");
  EXPECT_EQ(ErrorOf("[\"\\uD834\"]"), "m.json:1: a lone high surrogate in \\u escapes");
  EXPECT_EQ(ErrorOf("{} x"), "m.json:1: text after the document (expected the end of the file)");
  EXPECT_EQ(ErrorOf("[nul]").rfind("m.json:1: unknown word", 0), 0u);
  EXPECT_EQ(ErrorOf("[\"a\tb\"]"),
            "m.json:1: a control character inside a string (expected it escaped)");
  EXPECT_EQ(ErrorOf(std::string(100, '[')), "m.json:1: nesting deeper than 64 levels");
}

TEST(Manifest, TakesInputsRunsAndParameters) {
  const auto dir = runner::testing::ScratchDir("report-manifest");
  std::ofstream(dir / "manifest.json") << R"({
  "tool_version": "9.9",
  "command": "envelope",
  "wall_s": 3.5,
  "scenario": {"name": "s", "path": "a/s.xml", "sha256": "ab", "model_name": "m",
               "model_path": "a/../m.xml", "model_sha256": "cd", "baseline": "lqr"},
  "runs": [{"scenario": "s", "controller": "lqr", "seed": 18446744073709551615,
            "trace": "traces/s__lqr__seed1.csv"}],
  "parameter": {"path": "timeline/push[1].peak_N", "unit": "N", "scenario_value": 160,
                "lo": 40, "hi": 640}
})";
  const Result<ManifestInfo> read = ReadManifest(dir.string());
  ASSERT_TRUE(read) << read.error();
  const ManifestInfo& info = *read;
  EXPECT_TRUE(info.present);
  EXPECT_EQ(info.tool_version, "9.9");
  EXPECT_EQ(info.command, "envelope");
  ASSERT_EQ(info.scenarios.size(), 1u);
  EXPECT_EQ(info.scenarios[0].model_path, "a/../m.xml");
  EXPECT_EQ(info.scenarios[0].sha256, "ab");
  ASSERT_EQ(info.runs.size(), 1u);
  // A seed beyond 2^53 survives exactly: read from its text, not through a double.
  EXPECT_EQ(info.runs[0].seed, 18446744073709551615u);
  ASSERT_EQ(info.parameters.size(), 1u);
  EXPECT_TRUE(info.parameters[0].has_scenario_value);
  EXPECT_DOUBLE_EQ(info.parameters[0].scenario_value, 160.0);
  EXPECT_EQ(info.parameters[0].unit, "N");
}

TEST(Manifest, AbsentIsNotAnError) {
  const auto dir = runner::testing::ScratchDir("report-no-manifest");
  const Result<ManifestInfo> info = ReadManifest(dir.string());
  ASSERT_TRUE(info) << info.error();
  EXPECT_FALSE(info->present);
}

}  // namespace
}  // namespace upright::runner::report
