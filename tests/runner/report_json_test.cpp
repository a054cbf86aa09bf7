// The manifest reader: JSON as RFC 8259 (IETF, December 2017) allows it and nothing else, errors
// with their line, nesting limited, the program's own writer read back exactly, and the fields
// the report takes from a manifest.
#include <gtest/gtest.h>

#include <bit>
#include <cmath>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <limits>
#include <string>

#include "json_reader.hpp"
#include "manifest_info.hpp"
#include "run_test_support.hpp"
#include "upright/runner/common/json_text.hpp"

namespace upright::runner::internal {
namespace {

using Json = nlohmann::ordered_json;

Json Parse(std::string_view text) {
  const Result<Json> parsed = ParseJson(text, "m.json");
  EXPECT_TRUE(parsed.has_value()) << text << "\n" << (parsed ? "" : parsed.error());
  return parsed.value_or(Json());
}

// Why `text` is refused; a test failure, and "", when it is not.
std::string ErrorOf(std::string_view text) {
  const Result<Json> parsed = ParseJson(text, "m.json");
  EXPECT_FALSE(parsed.has_value()) << text;
  return parsed ? "" : parsed.error();
}

TEST(JsonReader, ReadsEveryKindOfValueKeepingMemberOrder) {
  const Json v = Parse(
      " {\"s\": \"x\", \"n\": -1.5e2, \"t\": true, \"f\": false, \"z\": null,\n"
      "  \"a\": [1, [], {}], \"o\": {\"k\": 7}} ");
  ASSERT_TRUE(v.is_object());
  EXPECT_EQ(v["s"], "x");
  EXPECT_EQ(v["n"].get<double>(), -150.0);
  EXPECT_TRUE(v["t"].get<bool>());
  EXPECT_FALSE(v["f"].get<bool>());
  EXPECT_TRUE(v["z"].is_null());
  ASSERT_EQ(v["a"].size(), 3u);
  EXPECT_TRUE(v["a"][1].is_array());
  EXPECT_EQ(v["o"]["k"].get<int>(), 7);
  std::string keys;
  for (const auto& [key, value] : v.items()) keys += key;
  EXPECT_EQ(keys, "sntfzao");
}

// RFC 8259 §7: the two-character escapes, \u escapes, and a character outside the Basic
// Multilingual Plane as a surrogate pair — the RFC's own example, G clef U+1D11E as
// "\uD834\uDD1E" (UTF-8 F0 9D 84 9E).
TEST(JsonReader, DecodesEscapesToUtf8) {
  const Json v = Parse(R"(["a\"b\\c\/d\b\f\n\r\t", "\u00e9", "\uD834\uDD1E"])");
  EXPECT_EQ(v[0], "a\"b\\c/d\b\f\n\r\t");
  EXPECT_EQ(v[1], "\xC3\xA9");
  EXPECT_EQ(v[2], "\xF0\x9D\x84\x9E");
}

// What RFC 8259 allows, each read as the value it writes.
TEST(JsonReader, AcceptsTheRfcsValidForms) {
  // §6: number = [ minus ] int [ frac ] [ exp ]; int = zero / ( digit1-9 *DIGIT ); the exponent
  // with e or E and an optional sign.
  EXPECT_EQ(Parse("[0, -0, 10, 0.5, -0.5, 1E+2, 1e-2, 2.5e3]"),
            Json::parse("[0, 0, 10, 0.5, -0.5, 100.0, 0.01, 2500.0]"));
  EXPECT_TRUE(std::signbit(Parse("[-0.0]")[0].get<double>()));
  // §2: a JSON text is any value with insignificant white space (space, tab, LF, CR) around.
  EXPECT_EQ(Parse(" \t\r\n 42 \n"), 42);
  EXPECT_EQ(Parse("\"text\""), "text");
  EXPECT_EQ(Parse("null"), nullptr);
  // §4 and §5: empty containers; the value separator only between values.
  EXPECT_EQ(Parse("{\"a\": [], \"b\": {}}").size(), 2u);
  // §8.1: UTF-8 as is inside strings.
  EXPECT_EQ(Parse("\"\xC3\xA9 \xE2\x80\x94\""), "\xC3\xA9 \xE2\x80\x94");
}

// What RFC 8259 does not allow: each refused, at its line, with the path in front.
TEST(JsonReader, RefusesTheRfcsInvalidForms) {
  const char* invalid[] = {
      // §6, numbers: no leading zeros ("int = zero / ( digit1-9 *DIGIT )"), digits on both sides
      // of the decimal point, no plus sign in front, digits in the exponent; and "Numeric values
      // that cannot be represented in the grammar below (such as Infinity and NaN) are not
      // permitted".
      "[01]", "[-01]", "[1.]", "[.5]", "[+1]", "[1e]", "[1e+]", "[-]", "[NaN]", "[Infinity]",
      "[-Infinity]",
      // §4 and §5: a value separator only between two values.
      "[1,]", "{\"a\": 1,}", "[,1]", "[1 2]",
      // §4: names are strings, with a name separator.
      "{a: 1}", "{\"a\" 1}",
      // §7: strings in quotation marks (not apostrophes); control characters U+0000 to U+001F
      // escaped; only the escapes the RFC lists.
      "['a']", "[\"a\tb\"]", "[\"a\nb\"]", "[\"a\\x\"]", "[\"a\\u00g0\"]", "[\"open]",
      // §8.2: an unpaired surrogate in a \u escape ("the behavior of software that receives JSON
      // texts containing such values is unpredictable"); nlohmann-json refuses them.
      "[\"\\uD834\"]", "[\"\\uDD1E\"]", "[\"\\uD834x\"]",
      // §8.1: JSON text is UTF-8; a byte that cannot start a UTF-8 sequence is refused.
      "[\"\xFF\"]",
      // §3 (literal names in lowercase only) and §2 (exactly one value).
      "[True]", "[nul]", "", "{} x", "[1] [2]",
      // §9: an implementation may limit the range of numbers; beyond the double range is refused.
      "[1e400]"};
  for (const char* text : invalid) {
    const std::string error = ErrorOf(text);
    EXPECT_EQ(error.rfind("m.json:1: ", 0), 0u) << text << " → " << error;
    EXPECT_GT(error.size(), std::string("m.json:1: ").size()) << text;
  }
  // §7: U+0000 too, unescaped inside a string.
  EXPECT_EQ(ErrorOf(std::string("[\"a\0b\"]", 7)).rfind("m.json:1: ", 0), 0u);
}

TEST(JsonReader, NamesTheLineOfTheError) {
  const std::string error = ErrorOf("{\n\"a\": 1\n\"b\": 2}");
  EXPECT_EQ(error.rfind("m.json:3: syntax error while parsing object", 0), 0u) << error;
  EXPECT_NE(error.find("expected '}'"), std::string::npos) << error;
  EXPECT_EQ(ErrorOf("[1,\n\n 01]").rfind("m.json:3: ", 0), 0u);
  EXPECT_EQ(ErrorOf("[\n1e400]"), "m.json:2: number overflow parsing '1e400'");
  // The end of the text is on its last line.
  EXPECT_EQ(ErrorOf("[1,\n").rfind("m.json:2: ", 0), 0u);
}

TEST(JsonReader, LimitsNestingWithoutBuildingIt) {
  const std::string deepest = std::string(kMaxJsonDepth, '[') + std::string(kMaxJsonDepth, ']');
  EXPECT_EQ(Parse(deepest).size(), 1u);
  // One more, opened on line 2: refused there.
  EXPECT_EQ(ErrorOf(std::string(kMaxJsonDepth, '[') + "\n[" + std::string(kMaxJsonDepth + 1, ']')),
            "m.json:2: nesting deeper than 64 levels");
  // A million deep is refused at once, with no recursion that could exhaust the stack.
  EXPECT_EQ(ErrorOf(std::string(1000000, '[')), "m.json:1: nesting deeper than 64 levels");
  EXPECT_EQ(ErrorOf("{\"a\": " + std::string(100, '[')), "m.json:1: nesting deeper than 64 levels");
  // Brackets inside strings do not nest.
  EXPECT_EQ(Parse("[\"" + std::string(100, '[') + "\"]")[0].get<std::string>().size(), 100u);
}

// The program's one JSON writer and this reader agree: every double JsonText writes reads back
// as the same double ([charconv.to.chars] guarantees the shortest form round-trips), -0 as 0,
// and a value JSON cannot carry (NaN, infinity) as null (RFC 8259 §6).
TEST(JsonReader, ReadsBackWhatJsonTextWritesExactly) {
  const double values[] = {0.1,
                           0.1 + 0.2,
                           1e21,
                           -1e-7,
                           123456789012345678.0,
                           std::numeric_limits<double>::denorm_min(),
                           std::numeric_limits<double>::max(),
                           std::numeric_limits<double>::lowest(),
                           2.0 / 3};
  JsonText writer;
  writer.BeginObject();
  writer.BeginArray("values");
  for (const double v : values) writer.Number({}, v);
  writer.EndArray();
  writer.Number("negative_zero", -0.0);
  writer.Number("nan", std::numeric_limits<double>::quiet_NaN());
  writer.Number("inf", -std::numeric_limits<double>::infinity());
  writer.Unsigned("seed", 18446744073709551615u);
  writer.Integer("offset", -9007199254740993);
  writer.String("text", "quote \" backslash \\ tab \t nul " + std::string(1, '\0') + " é");
  writer.EndObject();
  const Json read = Parse(writer.text());
  ASSERT_EQ(read["values"].size(), std::size(values));
  for (std::size_t i = 0; i < std::size(values); ++i) {
    EXPECT_EQ(std::bit_cast<std::uint64_t>(read["values"][i].get<double>()),
              std::bit_cast<std::uint64_t>(values[i]))
        << i;
  }
  EXPECT_EQ(read["negative_zero"], 0);
  EXPECT_FALSE(std::signbit(read["negative_zero"].get<double>()));
  EXPECT_TRUE(read["nan"].is_null());
  EXPECT_TRUE(read["inf"].is_null());
  EXPECT_EQ(read["seed"].get<std::uint64_t>(), 18446744073709551615u);
  EXPECT_EQ(read["offset"].get<std::int64_t>(), -9007199254740993);
  EXPECT_EQ(read["text"], "quote \" backslash \\ tab \t nul " + std::string(1, '\0') + " é");
}

TEST(JsonReader, NumbersAsTextAsTheManifestsWriteThem) {
  const Json v = Parse("[160, -3, 0.1, 1e+21, 18446744073709551615, \"7\"]");
  EXPECT_EQ(NumberText(v[0]), "160");
  EXPECT_EQ(NumberText(v[1]), "-3");
  EXPECT_EQ(NumberText(v[2]), "0.1");
  EXPECT_EQ(NumberText(v[3]), "1e+21");
  EXPECT_EQ(NumberText(v[4]), "18446744073709551615");
  EXPECT_EQ(NumberText(v[5]), "");
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
                "lo": 40, "hi": 640.5}
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
  // A seed beyond 2^53 survives exactly: read as an integer, not through a double.
  EXPECT_EQ(info.runs[0].seed, 18446744073709551615u);
  ASSERT_EQ(info.parameters.size(), 1u);
  EXPECT_TRUE(info.parameters[0].has_scenario_value);
  EXPECT_EQ(info.parameters[0].scenario_value, 160.0);
  EXPECT_EQ(info.parameters[0].unit, "N");
  const std::vector<std::pair<std::string, std::string>> numbers = {
      {"scenario_value", "160"}, {"lo", "40"}, {"hi", "640.5"}};
  EXPECT_EQ(info.parameters[0].numbers, numbers);
}

TEST(Manifest, RefusesAMalformedOneAtItsLine) {
  const auto dir = runner::testing::ScratchDir("report-bad-manifest");
  std::ofstream(dir / "manifest.json") << "{\n  \"jobs\": 01\n}\n";
  const Result<ManifestInfo> leading_zero = ReadManifest(dir.string());
  ASSERT_FALSE(leading_zero);
  EXPECT_EQ(leading_zero.error().rfind((dir / "manifest.json").string() + ":2: ", 0), 0u)
      << leading_zero.error();
  std::ofstream(dir / "manifest.json") << "[1, 2]\n";
  const Result<ManifestInfo> array = ReadManifest(dir.string());
  ASSERT_FALSE(array);
  EXPECT_EQ(array.error(),
            (dir / "manifest.json").string() + ":1: the manifest is not a JSON object");
}

TEST(Manifest, AbsentIsNotAnError) {
  const auto dir = runner::testing::ScratchDir("report-no-manifest");
  const Result<ManifestInfo> info = ReadManifest(dir.string());
  ASSERT_TRUE(info) << info.error();
  EXPECT_FALSE(info->present);
}

}  // namespace
}  // namespace upright::runner::internal
