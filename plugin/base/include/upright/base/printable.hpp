// Text from a user's file made safe for a terminal line: control characters (U+0000–U+001F and
// DEL) written as escapes, so a value cannot move the cursor, set the terminal's title or split
// one problem over two lines. Other bytes (UTF-8 included) pass as they are.
#pragma once

#include <string>
#include <string_view>

namespace upright {

// `text` with newline, carriage return and tab written as \n, \r and \t, and every other control
// character as \xHH (escape as \x1b).
std::string Printable(std::string_view text);

}  // namespace upright
