// Numbers to text at their edges: -0, infinities, NaN, denormals, the largest and smallest
// doubles, halfway cases, and the shortest form's round trip.
#include "upright/base/number_text.hpp"

#include <gtest/gtest.h>

#include <bit>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <limits>
#include <random>
#include <regex>
#include <string>
#include <utility>
#include <vector>

namespace upright {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kDenormMin = std::numeric_limits<double>::denorm_min();  // 2^-1074
constexpr double kMax = std::numeric_limits<double>::max();

// Every form, so that the rules for zero, infinity and NaN are checked on all of them.
std::vector<std::string> AllForms(double value, NanAs nan) {
  return {ShortestText(value, nan), SignificantText(value, 6, nan), FixedText(value, 2, nan),
          ReadableText(value, nan)};
}

TEST(NumberText, NegativeZeroReadsAsZeroInEveryForm) {
  EXPECT_EQ(ShortestText(-0.0), "0");
  EXPECT_EQ(SignificantText(-0.0, 6), "0");
  EXPECT_EQ(FixedText(-0.0, 2), "0.00");
  EXPECT_EQ(ReadableText(-0.0), "0");
  EXPECT_EQ(ShortestFixedText(-0.0), "0");
  EXPECT_EQ(WholeOrShortestText(-0.0), "0");
  EXPECT_EQ(SignedSignificantText(-0.0, 3), "+0");
  EXPECT_EQ(ComplexText({-0.0, -0.0}, 6), "0");
}

TEST(NumberText, ANegativeValueThatRoundsToZeroHasNoSign) {
  EXPECT_EQ(FixedText(-0.001, 2), "0.00");
  EXPECT_EQ(FixedText(-0.4, 0), "0");
  EXPECT_EQ(FixedText(-0.005, 3), "-0.005");
  // Significant digits never round a value that is not zero to zero.
  EXPECT_EQ(SignificantText(-1e-300, 3), "-1e-300");
}

TEST(NumberText, InfinityReadsInfInEveryForm) {
  for (const NanAs nan : {NanAs::kWord, NanAs::kEmpty, NanAs::kDash}) {
    for (const std::string& text : AllForms(kInf, nan)) EXPECT_EQ(text, "inf");
    for (const std::string& text : AllForms(-kInf, nan)) EXPECT_EQ(text, "-inf");
  }
  EXPECT_EQ(ShortestFixedText(kInf), "inf");
  EXPECT_EQ(WholeOrShortestText(-kInf), "-inf");
  EXPECT_EQ(SignedSignificantText(kInf, 3), "+inf");
}

TEST(NumberText, NanReadsAsTheOutputsMark) {
  for (const double nan : {kNaN, -kNaN}) {
    for (const std::string& text : AllForms(nan, NanAs::kWord)) EXPECT_EQ(text, "nan");
    for (const std::string& text : AllForms(nan, NanAs::kEmpty)) EXPECT_EQ(text, "");
    for (const std::string& text : AllForms(nan, NanAs::kDash)) EXPECT_EQ(text, "—");
    EXPECT_EQ(WholeOrShortestText(nan), "nan");
    EXPECT_EQ(ShortestFixedText(nan), "nan");
  }
  std::string csv = "a,";
  AppendShortest(&csv, kNaN, NanAs::kEmpty);
  AppendSignificant(&csv, kNaN, 6, NanAs::kEmpty);
  EXPECT_EQ(csv, "a,");
}

// The shortest form: [charconv.to.chars] guarantees that std::from_chars reads the text back as
// exactly the same double, with as few characters as that allows (plain digits winning a tie
// with the exponent form).
TEST(NumberText, ShortestFormReadsBackExactly) {
  EXPECT_EQ(ShortestText(0.1), "0.1");
  EXPECT_EQ(ShortestText(0.1 + 0.2), "0.30000000000000004");
  EXPECT_EQ(ShortestText(123456), "123456");
  EXPECT_EQ(ShortestText(100000), "1e+05");
  EXPECT_EQ(ShortestText(1e21), "1e+21");
  EXPECT_EQ(ShortestText(kDenormMin), "5e-324");
  EXPECT_EQ(ShortestText(kMax), "1.7976931348623157e+308");
  EXPECT_EQ(ShortestText(std::numeric_limits<double>::min()), "2.2250738585072014e-308");
  // Random bit patterns (a fixed seed), denormals and the extremes included.
  std::mt19937_64 bits(20240611);
  std::vector<double> values = {kDenormMin, -kDenormMin, 3 * kDenormMin, kMax, -kMax,
                                1e21,       1e-7,        5e-324,         0.1,  2.0 / 3};
  for (int i = 0; i < 20000; ++i) {
    const double v = std::bit_cast<double>(bits());
    if (std::isfinite(v)) values.push_back(v);
  }
  for (const double v : values) {
    const std::string text = ShortestText(v);
    double back = 0;
    const auto result = std::from_chars(text.data(), text.data() + text.size(), back);
    ASSERT_EQ(result.ptr, text.data() + text.size()) << text;
    EXPECT_EQ(std::bit_cast<std::uint64_t>(back), std::bit_cast<std::uint64_t>(v)) << text;
  }
}

// RFC 8259 §6: number = [ minus ] int [ frac ] [ exp ]; int = zero / ( digit1-9 *DIGIT );
// frac = decimal-point 1*DIGIT; exp = e [ minus / plus ] 1*DIGIT. The shortest form of every
// finite double is a JSON number as it stands.
TEST(NumberText, ShortestFormIsAJsonNumber) {
  const std::regex json_number(R"(-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][-+]?[0-9]+)?)");
  std::mt19937_64 bits(7);
  std::vector<double> values = {0.0, -0.0, kDenormMin, -kMax, 1e21, 1e-7, 123456, 0.5};
  for (int i = 0; i < 2000; ++i) {
    const double v = std::bit_cast<double>(bits());
    if (std::isfinite(v)) values.push_back(v);
  }
  for (const double v : values) {
    EXPECT_TRUE(std::regex_match(ShortestText(v), json_number)) << ShortestText(v);
  }
}

TEST(NumberText, ShortestFixedFormHasNoExponent) {
  EXPECT_EQ(ShortestFixedText(0.0005), "0.0005");
  EXPECT_EQ(ShortestFixedText(1e21), "1000000000000000000000");
  EXPECT_EQ(ShortestFixedText(-2.5), "-2.5");
}

TEST(NumberText, WholeNumbersInPlainDigits) {
  EXPECT_EQ(WholeOrShortestText(100000), "100000");
  EXPECT_EQ(WholeOrShortestText(-3), "-3");
  EXPECT_EQ(WholeOrShortestText(0.25), "0.25");
  EXPECT_EQ(WholeOrShortestText(1e-5), "1e-05");
  EXPECT_EQ(WholeOrShortestText(999999999999999), "999999999999999");
  EXPECT_EQ(WholeOrShortestText(1e15), "1e+15");
}

// printf's %.Ng and %.Nf (C17 7.21.6.1, from memory): N significant digits with trailing zeros
// removed and an exponent below 10^-4 or from 10^N; N decimals. The value is rounded as it is in
// binary, in the default rounding mode, to nearest with ties to even (IEEE 754-2008 §4.3.1, from
// memory): 0.125 and 2.5 are exact halves and go to the even digit; 1.005 is stored as
// 1.00499999999999989... and goes down.
TEST(NumberText, SignificantAndFixedRoundAsPrintf) {
  EXPECT_EQ(SignificantText(1.0 / 3, 6), "0.333333");
  EXPECT_EQ(SignificantText(1e6, 6), "1e+06");
  EXPECT_EQ(SignificantText(123456, 6), "123456");
  EXPECT_EQ(SignificantText(1.5e-5, 6), "1.5e-05");
  EXPECT_EQ(SignificantText(0.0001, 6), "0.0001");
  EXPECT_EQ(SignificantText(0.125, 2), "0.12");
  EXPECT_EQ(SignificantText(0.375, 2), "0.38");
  EXPECT_EQ(SignificantText(kDenormMin, 3), "4.94e-324");
  EXPECT_EQ(SignificantText(kMax, 17), "1.7976931348623157e+308");
  EXPECT_EQ(FixedText(2.5, 0), "2");
  EXPECT_EQ(FixedText(3.5, 0), "4");
  EXPECT_EQ(FixedText(1.005, 2), "1.00");
  EXPECT_EQ(FixedText(1.2345678, 3), "1.235");
  EXPECT_EQ(FixedText(kMax, 0).size(), 309u);
  EXPECT_EQ(FixedText(kDenormMin, 30), "0.000000000000000000000000000000");
  EXPECT_EQ(SignedSignificantText(0.5, 3), "+0.5");
  EXPECT_EQ(SignedSignificantText(-0.25, 3), "-0.25");
  EXPECT_EQ(ComplexText({1.5, -0.25}, 6), "1.5-0.25i");
  EXPECT_EQ(ComplexText({-1, 2}, 6), "-1+2i");
  EXPECT_EQ(ComplexText({2, 0}, 6), "2");
}

TEST(NumberText, ReadableFormKeepsThreeDigitsWithoutExponentInItsRange) {
  EXPECT_EQ(ReadableText(1234), "1234");
  EXPECT_EQ(ReadableText(1234.5), "1234");  // an exact half, to even
  EXPECT_EQ(ReadableText(0.012345), "0.0123");
  EXPECT_EQ(ReadableText(9.996), "10.0");
  EXPECT_EQ(ReadableText(999.6), "1000");
  EXPECT_EQ(ReadableText(3), "3.00");
  EXPECT_EQ(ReadableText(-42.42), "-42.4");
  EXPECT_EQ(ReadableText(0.001), "0.00100");
  EXPECT_EQ(ReadableText(0.00099949), "0.000999");
  EXPECT_EQ(ReadableText(1.2345e-5), "1.23e-05");
  EXPECT_EQ(ReadableText(1e15), "1e+15");
  EXPECT_EQ(ReadableText(999499999999999), "999499999999999");
  EXPECT_EQ(ReadableText(999999999999999), "1e+15");  // the range is the rounded value's
}

TEST(NumberText, TenthsAsTheShortestDecimal) {
  const std::pair<long, const char*> cases[] = {{123, "12.3"}, {120, "12"}, {5, ".5"},
                                                {-5, "-.5"},   {0, "0"},    {-120, "-12"}};
  for (const auto& [tenths, expected] : cases) {
    std::string text;
    AppendTenths(&text, tenths);
    EXPECT_EQ(text, expected) << tenths;
  }
  std::string text;
  AppendTenths(&text, std::numeric_limits<long>::min());
  EXPECT_EQ(text, "-922337203685477580.8");
}

TEST(NumberText, RoundsToSignificantDigits) {
  EXPECT_EQ(RoundToSignificant(0.1 + 0.2, 12), 0.3);
  EXPECT_EQ(RoundToSignificant(123.456789, 4), 123.5);
  EXPECT_EQ(RoundToSignificant(kInf, 3), kInf);
  EXPECT_TRUE(std::isnan(RoundToSignificant(kNaN, 3)));
}

}  // namespace
}  // namespace upright
