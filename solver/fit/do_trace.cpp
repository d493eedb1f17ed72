#include "solver/fit/do_trace.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>
#include <optional>
#include <string_view>

#include "input/clock_time.hpp"
#include "input/csv_table.hpp"
#include "input/errors.hpp"
#include "input/units.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

std::string lower_without_spaces(std::string_view s) {
  std::string out;
  for (char c : s) {
    if (!std::isspace(static_cast<unsigned char>(c))) out += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  }
  return out;
}

bool is_percent_saturation(std::string_view unit) {
  const auto u = lower_without_spaces(unit);
  return u == "%" || u == "%airsaturation" || u == "%saturation" || u == "%airsat" || u == "%sat";
}

constexpr const char* kDoUnits = "%, % air saturation, mg/L, mmol/L, mol/m3 (also mM, umol/L, mol/L)";

double time_factor(std::string_view unit) {
  if (unit == "s") return 1.0;
  if (unit == "min") return 60.0;
  if (unit == "h") return 3600.0;
  return std::numeric_limits<double>::quiet_NaN();
}

// SI value (mol/m3) of one DO concentration unit, or nothing.
std::optional<double> do_unit_factor(const std::string& unit) {
  if (unit.empty()) return std::nullopt;
  try {
    return units::to_si(units::Dimension::concentration, {1.0, units::split("1 " + unit).unit}, physics::molar_mass_o2);
  } catch (const UnitError&) {
    return std::nullopt;
  }
}

// The number and unit of an option's text; a bad one is a CaseError naming the option.
units::Split split_option(const std::string& text, const std::string& what) {
  try {
    return units::split(text);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", what, text, e.what()));
  }
}

// The trace from a parsed table: two columns, time and DO, each with its unit.
DoTrace do_trace_from(const CsvTable& table) {
  DoTrace tr;
  tr.file_name = table.file_name;
  const auto where = table.where(table.header_line);
  const auto& cells = table.header;
  if (cells.size() != 2) {
    throw CaseError(fmt::format("{}: the header has {} columns; expected two, time and DO, e.g. 'time [s],DO [%]' "
                                "(separated by ',' or ';')",
                                where, cells.size()));
  }
  // The first reading of each header cell whose unit is one of the column's.
  HeaderCell tc = header_cell_readings(cells[0]).front(), dc = header_cell_readings(cells[1]).front();
  for (const auto& r : header_cell_readings(cells[0])) {
    if (std::isfinite(time_factor(r.unit))) {
      tc = r;
      break;
    }
  }
  for (const auto& r : header_cell_readings(cells[1])) {
    if (is_percent_saturation(r.unit) || do_unit_factor(r.unit)) {
      dc = r;
      break;
    }
  }
  tr.time_header = cells[0];
  tr.do_header = cells[1];
  // A logger's clock times ("10:00:05", "2026-12-05 10:00:05") in a column without a time unit:
  // seconds from the first row, across midnight.
  const bool clock = !std::isfinite(time_factor(tc.unit)) && !table.rows.empty() &&
                     clock_seconds(table.rows.front().cells[0]).has_value();
  if (clock) tc.unit = "s";
  if (tc.unit.empty()) {
    throw CaseError(fmt::format("{}: column 1 '{}': missing unit; write it in brackets or after a space, "
                                "e.g. 'time [s]' (s, min or h)",
                                where, cells[0]));
  }
  const double time_scale = time_factor(tc.unit);
  if (!std::isfinite(time_scale)) {
    throw CaseError(fmt::format("{}: column 1 '{}': unknown time unit '{}'; expected s, min or h", where, cells[0],
                                tc.unit));
  }
  if (dc.unit.empty()) {
    throw CaseError(fmt::format("{}: column 2 '{}': missing unit; write it in brackets or after a space, "
                                "e.g. 'DO [%]' or 'DO [mg/L]' ({})",
                                where, cells[1], kDoUnits));
  }
  double do_scale = 0.01;
  if (is_percent_saturation(dc.unit)) {
    tr.scale = DoScale::saturation;
  } else {
    tr.scale = DoScale::concentration;
    const auto f = do_unit_factor(dc.unit);
    if (!f) {
      throw CaseError(fmt::format("{}: column 2 '{}': unknown DO unit '{}'; expected {}", where, cells[1], dc.unit,
                                  kDoUnits));
    }
    do_scale = *f;
  }
  tr.time_unit = tc.unit;
  tr.do_unit = dc.unit;
  tr.time_factor = time_scale;
  tr.do_factor = do_scale;
  double clock_start = 0.0, clock_days = 0.0, clock_last = 0.0;
  for (const auto& row : table.rows) {
    const auto at = table.where(row.line);
    std::optional<double> tv;
    if (clock) {
      const auto c = clock_seconds(row.cells[0]);
      if (!c) {
        throw CaseError(fmt::format("{}: column 1 '{}': '{}' is not a clock time like the first row's ('{}', "
                                    "hh:mm:ss, optionally after a date YYYY-MM-DD)",
                                    at, tr.time_header, row.cells[0], table.rows.front().cells[0]));
      }
      if (tr.time_s.empty()) clock_start = *c;
      if (!tr.time_s.empty() && *c < clock_last - 43200.0) clock_days += 86400.0;  // past midnight, no date given
      clock_last = *c;
      tv = *c + clock_days - clock_start;
    } else {
      tv = table.number(row, 0);
    }
    if (!tv) {
      throw CaseError(fmt::format("{}: column 1 '{}': '{}' is not a number; expected the time in {}", at,
                                  tr.time_header, row.cells[0], tr.time_unit));
    }
    const auto dv = table.number(row, 1);
    if (!dv) {
      throw CaseError(fmt::format("{}: column 2 '{}': '{}' is not a number; expected the DO in {}", at,
                                  tr.do_header, row.cells[1], tr.do_unit));
    }
    const double t_s = *tv * time_scale;
    if (!tr.time_s.empty() && t_s <= tr.time_s.back()) {
      throw CaseError(fmt::format("{}: column 1 '{}': time {}{} is not after the previous row's (line {}); rows must "
                                  "be in increasing time",
                                  at, tr.time_header, row.cells[0], clock ? "" : " " + tr.time_unit, tr.line.back()));
    }
    tr.time_s.push_back(t_s);
    tr.value.push_back(*dv * do_scale);
    tr.line.push_back(row.line);
  }
  if (static_cast<int>(tr.time_s.size()) < min_trace_points) {
    throw CaseError(fmt::format("{}: too few points: {} row{} of data; the fit needs at least {} (better: dozens "
                                "spread over the whole rise)",
                                table.file_name, tr.time_s.size(), tr.time_s.size() == 1 ? "" : "s", min_trace_points));
  }
  return tr;
}

}  // namespace

DoTrace parse_do_trace(const std::string& text, const std::string& file_name) {
  const CsvTable table = parse_csv_table(text, file_name, "'time [s],DO [%]'");
  return do_trace_from(table);
}

DoTrace read_do_trace(const std::string& path) { return do_trace_from(read_csv_table(path, "DO trace", "'time [s],DO [%]'")); }

DoTrace rise_from_minimum(const DoTrace& trace, std::string& note) {
  note.clear();
  const auto& y = trace.value;
  if (y.size() < 3) return trace;
  const auto [lo, hi] = std::minmax_element(y.begin(), y.end());
  const size_t first = static_cast<size_t>(lo - y.begin());
  const size_t head = std::min<size_t>(3, first);
  double start = 0.0;
  for (size_t i = 0; i < head; ++i) start += y[i] / static_cast<double>(head);
  // A fall of a fifth of the range, not the noise of a flat start (whose minimum is anywhere), and
  // a rise after it (a trace that only falls is the fit's to refuse, with its own message).
  const double rise_after = *std::max_element(lo, y.end()) - *lo;
  if (first < 3 || !(start - *lo > 0.2 * (*hi - *lo)) || !(rise_after > 0.2 * (*hi - *lo))) return trace;
  DoTrace rise = trace;
  const auto cut = [first](auto& v) { v.erase(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(first)); };
  cut(rise.time_s), cut(rise.value), cut(rise.line);
  note = fmt::format("the trace falls to its lowest reading at t = {:.6g} s (line {}) before it rises: the fit uses the "
                     "rise from there; the {} rows before it (the stripping part) are left out",
                     rise.time_s.front(), rise.line.front(), first);
  return rise;
}

double parse_do_value(const std::string& text, DoScale scale, const std::string& what) {
  const units::Split q = split_option(text, what);
  if (scale == DoScale::saturation) {
    if (!is_percent_saturation(q.unit)) {
      throw CaseError(fmt::format("{} '{}': the trace is in % air saturation, so give this in % too, e.g. '100 %'",
                                  what, text));
    }
    return 0.01 * q.value;
  }
  if (is_percent_saturation(q.unit)) {
    throw CaseError(fmt::format("{} '{}': the trace is a concentration, so give this as one too, e.g. "
                                "'0.21 mmol/L' or '6.8 mg/L'",
                                what, text));
  }
  try {
    return units::to_si(units::Dimension::concentration, q, physics::molar_mass_o2);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", what, text, e.what()));
  }
}

double parse_uptake_rate(const std::string& text, DoScale scale, const std::string& what) {
  const units::Split q = split_option(text, what);
  const std::string u = lower_without_spaces(q.unit);
  constexpr double h = 3600.0;
  const double mg_l = 1e-3 / physics::molar_mass_o2;  // mg/L -> mol/m3
  struct Unit {
    const char* name;
    double factor;
  };
  static const std::vector<Unit> concentration{{"mmol/l/h", 1.0 / h}, {"mmol/(lh)", 1.0 / h}, {"mm/h", 1.0 / h},
                                               {"mol/m3/s", 1.0},     {"mol/(m3s)", 1.0},    {"mol/m3/h", 1.0 / h},
                                               {"mg/l/h", mg_l / h},   {"mg/(lh)", mg_l / h}};
  static const std::vector<Unit> saturation{{"%/h", 0.01 / h}, {"%/min", 0.01 / 60.0}, {"%/s", 0.01}};
  const auto& table = scale == DoScale::saturation ? saturation : concentration;
  const char* expected = scale == DoScale::saturation
                             ? "%/h, %/min or %/s (the trace is in % air saturation)"
                             : "mmol/L/h, mol/m3/s, mol/m3/h or mg/L/h (the trace is a concentration)";
  if (q.unit.empty()) throw CaseError(fmt::format("{} '{}': missing unit; expected {}", what, text, expected));
  for (const auto& e : table) {
    if (u == e.name) {
      if (q.value < 0.0) throw CaseError(fmt::format("{} '{}': an uptake rate cannot be negative", what, text));
      return q.value * e.factor;
    }
  }
  throw CaseError(fmt::format("{} '{}': unknown unit '{}'; expected {}", what, text, q.unit, expected));
}

}  // namespace oxystrat
