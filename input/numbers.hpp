// Strict number parsing for everything a user types outside TOML: the whole text must be the
// number (no trailing junk, no "nan" or "inf"), unlike std::stod and strtod.
#pragma once

#include <optional>
#include <string_view>

namespace oxystrat {

//! A finite decimal number spanning the whole of `text` (surrounding blanks and a leading '+'
//! allowed); with `decimal_comma`, ',' is the decimal separator.
std::optional<double> parse_number(std::string_view text, bool decimal_comma = false);

//! A whole number (optional sign) spanning the whole of `text`, surrounding blanks allowed.
std::optional<long long> parse_integer(std::string_view text);

}  // namespace oxystrat
