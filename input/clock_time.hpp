// Clock times as data loggers and plant historians export them: "10:00:05", "10:00",
// "10:00:05.250", or after a date, "2026-12-05 10:00:05" / "2026-12-05T10:00:05".
#pragma once

#include <optional>
#include <string_view>

namespace oxystrat {

//! Seconds since midnight of the time of day, plus 86400 per day since 1970-01-01 when a date is
//! given; nothing when the text is not a clock time (a plain number, a bad field).
std::optional<double> clock_seconds(std::string_view text);

}  // namespace oxystrat
