// The CSV reader against the rules of RFC 4180 §2: quoted fields with commas, doubled quotes and
// line breaks, empty fields, CRLF or LF records, an optional last line break, and every malformed
// case refused with its line.
#include <gtest/gtest.h>

#include <cmath>

#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner {
namespace {

CsvTable Parse(std::string_view text) {
  const Result<CsvTable> table = ParseCsv(text, "t.csv");
  EXPECT_TRUE(table) << table.error();
  return table.value_or(CsvTable{});
}

// Why `text` is refused; a test failure, and "", when it is not.
std::string ErrorOf(std::string_view text) {
  const Result<CsvTable> table = ParseCsv(text, "t.csv");
  EXPECT_FALSE(table);
  return table ? "" : table.error();
}

TEST(CsvReader, ReadsHeaderAndRows) {
  const CsvTable t = Parse("a,b,c\n1,2,3\n4,5,6\n");
  ASSERT_EQ(t.header, (std::vector<std::string>{"a", "b", "c"}));
  ASSERT_EQ(t.rows.size(), 2u);
  EXPECT_EQ(t.rows[1], (std::vector<std::string>{"4", "5", "6"}));
  EXPECT_EQ(t.lines, (std::vector<int>{2, 3}));
  EXPECT_EQ(t.Column("c"), 2);
  EXPECT_EQ(t.Column("d"), -1);
}

// RFC 4180 §2 rule 6: fields with commas, quotes or line breaks are enclosed in double quotes.
TEST(CsvReader, QuotedFieldHoldsCommas) {
  const CsvTable t = Parse("label,t\n\"drive 1 m/s, 0 deg/s\",2\n");
  EXPECT_EQ(t.rows[0][0], "drive 1 m/s, 0 deg/s");
  EXPECT_EQ(t.rows[0][1], "2");
}

// RFC 4180 §2 rule 7: a double quote inside a quoted field is escaped by another one.
TEST(CsvReader, DoubledQuotesAreOneQuote) {
  const CsvTable t = Parse("m\n\"she said \"\"fell\"\"\"\n\"\"\"\"\n");
  EXPECT_EQ(t.rows[0][0], "she said \"fell\"");
  EXPECT_EQ(t.rows[1][0], "\"");
}

TEST(CsvReader, LineBreaksInsideQuotesStayInTheFieldAndCountAsLines) {
  const CsvTable t = Parse("a,b\n\"one\ntwo\r\nthree\",x\nlast,y\n");
  ASSERT_EQ(t.rows.size(), 2u);
  EXPECT_EQ(t.rows[0][0], "one\ntwo\r\nthree");
  EXPECT_EQ(t.rows[1][0], "last");
  // The second record starts after the three lines the first one spans.
  EXPECT_EQ(t.lines, (std::vector<int>{2, 5}));
}

TEST(CsvReader, EmptyFieldsAnywhere) {
  const CsvTable t = Parse("a,b,c\n,,\n1,,\n,\"\",3\n");
  ASSERT_EQ(t.rows.size(), 3u);
  EXPECT_EQ(t.rows[0], (std::vector<std::string>{"", "", ""}));
  EXPECT_EQ(t.rows[1], (std::vector<std::string>{"1", "", ""}));
  EXPECT_EQ(t.rows[2], (std::vector<std::string>{"", "", "3"}));
}

// RFC 4180 §2 rules 1 and 2: CRLF ends a record; the last record may lack a line break.
TEST(CsvReader, CrlfAndNoFinalLineBreak) {
  const CsvTable t = Parse("a,b\r\n1,2\r\n3,4");
  ASSERT_EQ(t.rows.size(), 2u);
  EXPECT_EQ(t.rows[0][1], "2");
  EXPECT_EQ(t.rows[1][1], "4");
}

TEST(CsvReader, HeaderOnlyGivesNoRows) { EXPECT_TRUE(Parse("a,b\n").rows.empty()); }

TEST(CsvReader, RefusesAnUnclosedQuoteNamingWhereItOpened) {
  EXPECT_EQ(ErrorOf("a\nok\n\"open\nmore\n"),
            "t.csv:3: a quoted field is never closed (expected a closing '\"')");
}

TEST(CsvReader, RefusesTextAfterAClosingQuote) {
  EXPECT_EQ(ErrorOf("a,b\n\"x\"y,2\n"),
            "t.csv:2: 'y' after a closing quote (expected ',' or the end of the line)");
}

TEST(CsvReader, RefusesAQuoteInsideAnUnquotedField) {
  EXPECT_EQ(ErrorOf("a\nab\"c\n"),
            "t.csv:2: a quote inside an unquoted field (expected the whole field in quotes)");
}

TEST(CsvReader, RefusesARowOfTheWrongWidth) {
  EXPECT_EQ(ErrorOf("a,b\n1,2\n3\n"), "t.csv:3: 1 field(s) (expected 2, as in the header)");
  EXPECT_EQ(ErrorOf("a,b\n1,2,3\n"), "t.csv:2: 3 field(s) (expected 2, as in the header)");
}

TEST(CsvReader, RefusesAnEmptyFile) {
  EXPECT_EQ(ErrorOf(""), "t.csv:1: empty file (expected a header line)");
}

TEST(CsvReader, ReadFileNamesAMissingFile) {
  const Result<CsvTable> table = ReadCsvFile("/nonexistent/summary.csv");
  ASSERT_FALSE(table);
  EXPECT_EQ(table.error().rfind("cannot read /nonexistent/summary.csv: ", 0), 0u) << table.error();
}

TEST(CsvReader, NumbersAsTheTablesWriteThem) {
  EXPECT_DOUBLE_EQ(CsvNumber("6.21125"), 6.21125);
  EXPECT_DOUBLE_EQ(CsvNumber("-7.5012e-05"), -7.5012e-05);
  EXPECT_DOUBLE_EQ(CsvNumber("+3"), 3.0);
  EXPECT_TRUE(std::isinf(CsvNumber("inf")));
  EXPECT_LT(CsvNumber("-inf"), 0);
  EXPECT_TRUE(std::isnan(CsvNumber("")));
  EXPECT_TRUE(std::isnan(CsvNumber("fell")));
  EXPECT_TRUE(std::isnan(CsvNumber("1.5 s")));
}

// Yes/no cells read "true" or "false"; anything else (a "1" of another writer, a typo) is an
// error at its line, never read as false.
TEST(CsvReader, YesNoCellsAreTrueOrFalseAndNothingElse) {
  const CsvTable table = Parse("controller,survived\nlqr,true\npid,false\nhinf,1\n");
  const Result<bool> lqr = CsvBoolAt(table, 0, 1, "t.csv");
  ASSERT_TRUE(lqr) << lqr.error();
  EXPECT_TRUE(*lqr);
  const Result<bool> pid = CsvBoolAt(table, 1, 1, "t.csv");
  ASSERT_TRUE(pid) << pid.error();
  EXPECT_FALSE(*pid);
  const Result<bool> hinf = CsvBoolAt(table, 2, 1, "t.csv");
  ASSERT_FALSE(hinf);
  EXPECT_EQ(hinf.error(), "t.csv:4: survived = '1': expected true or false");
}

}  // namespace
}  // namespace upright::runner
