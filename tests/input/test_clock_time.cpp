// Clock times of logger exports: the forms read, their seconds, and what is not a clock time.
#include <gtest/gtest.h>

#include "input/clock_time.hpp"

namespace oxystrat {
namespace {

TEST(ClockTime, TimeOfDayForms) {
  EXPECT_EQ(clock_seconds("10:00"), 36000.0);
  EXPECT_EQ(clock_seconds("9:05:30"), 9 * 3600.0 + 5 * 60.0 + 30.0);
  EXPECT_EQ(clock_seconds(" 23:59:59.5 "), 86399.5);
  EXPECT_EQ(clock_seconds("00:00:00"), 0.0);
}

TEST(ClockTime, DateAndTimeCountDaysFrom1970) {
  // 2026-12-05 is day 20792 after 1970-01-01 (1970-2025: 56 years, 14 of them leap years, 20454
  // days; then 338 days to 5 December of a common year).
  EXPECT_EQ(clock_seconds("2026-12-05 10:00:05"), 20792 * 86400.0 + 36005.0);
  EXPECT_EQ(clock_seconds("2026-12-05T10:00:05"), 20792 * 86400.0 + 36005.0);
  EXPECT_EQ(*clock_seconds("2024-03-01 00:00") - *clock_seconds("2024-02-28 00:00"), 2 * 86400.0);  // a leap year
  EXPECT_EQ(*clock_seconds("1970-01-01 00:00"), 0.0);
}

TEST(ClockTime, OtherTextIsNotAClockTime) {
  for (const char* text : {"", "10", "12.5", "abc", "25:00", "10:60", "10:5", "10:00:5", "10:00:00x", "10:00:-1",
                           "2026-13-05 10:00", "2026-02-30 10:00", "2026-12-05", "2026-12-05_10:00", "1e3", ":30"}) {
    EXPECT_FALSE(clock_seconds(text).has_value()) << text;
  }
}

}  // namespace
}  // namespace oxystrat
