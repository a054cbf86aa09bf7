// Text for a terminal line: control characters escaped (an escape sequence cannot reach the
// terminal, a newline cannot split a problem in two), everything else as it is.
#include "upright/base/printable.hpp"

#include <gtest/gtest.h>

#include <string>

namespace upright {
namespace {

TEST(Printable, EscapesControlCharactersAndKeepsTheRest) {
  EXPECT_EQ(Printable("plain text, 3.5 m/s"), "plain text, 3.5 m/s");
  EXPECT_EQ(Printable("two\nlines\r\tand"), "two\\nlines\\r\\tand");
  // ESC ] 0 ; ... BEL sets a terminal's title (ECMA-48 operating system command; from memory).
  EXPECT_EQ(Printable("\x1b]0;owned\x07"), "\\x1b]0;owned\\x07");
  EXPECT_EQ(Printable(std::string("nul\0del\x7f", 8)), "nul\\x00del\\x7f");
  EXPECT_EQ(Printable("tilt 5\xc2\xb0"), "tilt 5\xc2\xb0");  // UTF-8 kept: "tilt 5°"
  EXPECT_EQ(Printable(""), "");
}

}  // namespace
}  // namespace upright
