#include "input/numbers.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <string>

namespace oxystrat {
namespace {

std::string_view trimmed(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

}  // namespace

std::optional<double> parse_number(std::string_view text, bool decimal_comma) {
  std::string t(trimmed(text));
  if (decimal_comma) std::replace(t.begin(), t.end(), ',', '.');
  const char* first = t.data();
  const char* last = t.data() + t.size();
  if (first != last && *first == '+') ++first;  // from_chars rejects a leading '+'
  double v = 0.0;
  const auto [ptr, ec] = std::from_chars(first, last, v);
  if (first == last || ec != std::errc() || ptr != last || !std::isfinite(v)) return std::nullopt;
  return v;
}

std::optional<long long> parse_integer(std::string_view text) {
  const std::string_view t = trimmed(text);
  const char* first = t.data();
  const char* last = t.data() + t.size();
  if (first != last && *first == '+') ++first;
  long long v = 0;
  const auto [ptr, ec] = std::from_chars(first, last, v);
  if (first == last || ec != std::errc() || ptr != last) return std::nullopt;
  return v;
}

}  // namespace oxystrat
