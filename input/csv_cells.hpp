// The cell-level grammar shared by the CSV files oxystrat reads (DO traces, calibration data):
// trimmed cells, optional double quotes, ',' or ';' between cells, and with ';' a decimal comma.
#pragma once

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace oxystrat::csv {

inline std::string_view trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

//! Spreadsheets quote header cells: "time [s]".
inline std::string_view unquote(std::string_view s) {
  s = trim(s);
  if (s.size() >= 2 && s.front() == '"' && s.back() == '"') s = trim(s.substr(1, s.size() - 2));
  return s;
}

//! The content of one line of a data file: trimmed, without the UTF-8 byte-order mark on line 1;
//! empty for blank lines and `#` comments (which carry nothing).
inline std::string_view content_line(std::string_view raw, int line_no) {
  if (line_no == 1 && raw.substr(0, 3) == "\xEF\xBB\xBF") raw.remove_prefix(3);
  raw = trim(raw);
  return !raw.empty() && raw.front() == '#' ? std::string_view{} : raw;
}

//! ';' when the line has one (then a decimal comma is allowed), else ','.
inline char separator_of(std::string_view header) { return header.find(';') != std::string_view::npos ? ';' : ','; }

inline std::vector<std::string> split_cells(std::string_view line, char sep) {
  std::vector<std::string> cells;
  size_t start = 0;
  while (true) {
    const size_t at = line.find(sep, start);
    cells.emplace_back(unquote(line.substr(start, at == std::string_view::npos ? std::string_view::npos : at - start)));
    if (at == std::string_view::npos) break;
    start = at + 1;
  }
  return cells;
}

//! The whole cell must be one finite number; with ';' as separator a decimal comma is accepted.
inline std::optional<double> parse_number(std::string_view cell, bool decimal_comma) {
  std::string text(trim(cell));
  if (decimal_comma) std::replace(text.begin(), text.end(), ',', '.');
  const char* first = text.data();
  const char* last = text.data() + text.size();
  if (first != last && *first == '+') ++first;
  double v = 0.0;
  const auto [ptr, ec] = std::from_chars(first, last, v);
  if (ec != std::errc() || ptr != last || first == last || !std::isfinite(v)) return std::nullopt;
  return v;
}

}  // namespace oxystrat::csv
