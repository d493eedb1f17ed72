#include "input/clock_time.hpp"

#include <cctype>
#include <charconv>
#include <chrono>

namespace oxystrat {
namespace {

// Reads `digits` digits (exactly) at s[pos], advancing pos; nothing when they are not there.
std::optional<int> fixed_digits(std::string_view s, size_t& pos, size_t digits) {
  if (pos + digits > s.size()) return std::nullopt;
  int v = 0;
  for (size_t i = 0; i < digits; ++i) {
    const char c = s[pos + i];
    if (!std::isdigit(static_cast<unsigned char>(c))) return std::nullopt;
    v = 10 * v + (c - '0');
  }
  pos += digits;
  return v;
}

}  // namespace

std::optional<double> clock_seconds(std::string_view text) {
  while (!text.empty() && std::isspace(static_cast<unsigned char>(text.front()))) text.remove_prefix(1);
  while (!text.empty() && std::isspace(static_cast<unsigned char>(text.back()))) text.remove_suffix(1);
  size_t pos = 0;
  double days = 0.0;
  // An optional date, YYYY-MM-DD, then a blank or 'T'.
  if (text.size() > 10 && text[4] == '-' && text[7] == '-') {
    const auto y = fixed_digits(text, pos, 4);
    ++pos;
    const auto mo = fixed_digits(text, pos, 2);
    ++pos;
    const auto d = fixed_digits(text, pos, 2);
    if (!y || !mo || !d) return std::nullopt;
    const std::chrono::year_month_day date{std::chrono::year{*y}, std::chrono::month{static_cast<unsigned>(*mo)},
                                           std::chrono::day{static_cast<unsigned>(*d)}};
    if (!date.ok() || (text[pos] != ' ' && text[pos] != 'T')) return std::nullopt;
    ++pos;
    days = static_cast<double>(std::chrono::sys_days{date}.time_since_epoch().count());
  }
  // hh:mm or h:mm, then optionally :ss and a fraction.
  size_t hour_digits = 0;
  while (pos + hour_digits < text.size() && std::isdigit(static_cast<unsigned char>(text[pos + hour_digits]))) ++hour_digits;
  if (hour_digits < 1 || hour_digits > 2) return std::nullopt;
  const auto h = fixed_digits(text, pos, hour_digits);
  if (pos >= text.size() || text[pos] != ':') return std::nullopt;
  ++pos;
  const auto mi = fixed_digits(text, pos, 2);
  if (!h || !mi || *h > 23 || *mi > 59) return std::nullopt;
  double seconds = 0.0;
  if (pos < text.size()) {
    if (text[pos] != ':') return std::nullopt;
    ++pos;
    const char* first = text.data() + pos;
    const char* last = text.data() + text.size();
    if (last - first < 2 || !std::isdigit(static_cast<unsigned char>(first[0])) ||
        !std::isdigit(static_cast<unsigned char>(first[1]))) {
      return std::nullopt;
    }
    const auto [end, ec] = std::from_chars(first, last, seconds);
    if (ec != std::errc() || end != last || !(seconds < 61.0)) return std::nullopt;  // 60: a leap second
  }
  return 86400.0 * days + 3600.0 * *h + 60.0 * *mi + seconds;
}

}  // namespace oxystrat
