// Numbers to text: every table, file, message and page of the program turns a double into
// characters here, one function per form. Locale-independent (std::to_chars: with a precision its
// fixed and general forms are printf's %.Nf and %.Ng in the "C" locale, [charconv.to.chars]), so
// the same value always gives the same bytes.
//
// Every function follows one rule for each value that is no ordinary number:
//  - Zero has no sign: -0, and a negative value that rounds to zero at the precision asked, read
//    "0" ("0.00" to two decimals). The sign of a zero is an accident of arithmetic, and a table
//    holding both "0" and "-0" seems to hold two values.
//  - Infinity reads "inf" and "-inf", as printf and std::to_chars write it.
//  - NaN, in this program a figure that does not apply, reads as the output's mark for "no value"
//    (NanAs below): the word "nan" in messages and the program's own text; nothing in a CSV field
//    (RFC 4180 §2 allows an empty field; the README's empty cell) and in an HTML page; "—" in a
//    Markdown table, where an empty cell is easily missed.
// JSON has no NaN or infinity (RFC 8259 §6): upright::runner::JsonText writes null for both and
// the shortest form for every other number.
#pragma once

#include <complex>
#include <string>

namespace upright {

// How NaN reads; every other value reads the same whatever is chosen.
enum class NanAs {
  kWord,   // "nan": messages, the program's text
  kEmpty,  // "": a CSV field, an HTML page
  kDash,   // "—" (U+2014): a Markdown table cell
};

// The shortest text that reads back as the same double ([charconv.to.chars]; plain digits when
// they are no longer than the exponent form): 0.1, 1e+21, 5e-324, 123456, 1e+05.
void AppendShortest(std::string* out, double value, NanAs nan = NanAs::kWord);
std::string ShortestText(double value, NanAs nan = NanAs::kWord);

// The shortest text that reads back as the same double, never with an exponent: 0.0005, not 5e-04.
std::string ShortestFixedText(double value);

// Whole numbers below 10^15 in plain digits (100000, not 1e+05), others in the shortest form:
// numbers quoted back to a user in messages and in the documentation.
std::string WholeOrShortestText(double value);

// `digits` (1 to 17; others are taken as the nearer end) significant digits, as printf
// "%.<digits>g": 6 → 0.333333, 1e+06, 1.5e-05.
void AppendSignificant(std::string* out, double value, int digits, NanAs nan = NanAs::kWord);
std::string SignificantText(double value, int digits, NanAs nan = NanAs::kWord);

// The same with a sign always, as printf "%+.<digits>g": +0.5, -0.5, +inf, +nan; +0 (zero has no
// minus).
std::string SignedSignificantText(double value, int digits);

// A complex number with `digits` significant digits per part: "1.5-0.25i", "2" when the
// imaginary part is zero.
std::string ComplexText(std::complex<double> value, int digits);

// `decimals` (0 to 30; others are taken as the nearer end) digits after the point, as printf
// "%.<decimals>f": 2 → 3.14, 0.00.
std::string FixedText(double value, int decimals, NanAs nan = NanAs::kWord);

// For reading in tables: 3 significant digits in plain digits while the value so rounded is from
// 0.001 up to 10^15 (0.012345 → 0.0123, 9.996 → 10.0, 3 → 3.00), from 100 up every digit of the
// whole part and no decimals (1234.5 → 1234); with an exponent outside that range (1.23e-05).
std::string ReadableText(double value, NanAs nan = NanAs::kWord);

// A length counted in tenths of a unit as the shortest decimal: 123 → 12.3, 120 → 12, 5 → .5,
// -5 → -.5. Coordinates in SVG paths, where every byte counts.
void AppendTenths(std::string* out, long tenths);

// `value` rounded to `digits` significant digits (the double nearest its SignificantText), so a
// value computed as 0.1 + 0.2 runs, prints and reads back as 0.3; non-finite values unchanged.
double RoundToSignificant(double value, int digits);

}  // namespace upright
