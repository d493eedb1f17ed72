#include "solver/studies/calibration_data.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <filesystem>
#include <optional>

#include "input/csv_table.hpp"
#include "input/numbers.hpp"
#include "input/units.hpp"
#include "solver/fit/do_trace.hpp"
#include "solver/fit/kla_fit.hpp"

namespace oxystrat {
namespace {

std::string_view trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

// Lower case, '_' as a space, runs of spaces as one: "Gas_Flow" -> "gas flow".
std::string normalised(std::string_view s) {
  std::string out;
  for (char ch : trim(s)) {
    char c = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
    if (c == '_' || c == '\t') c = ' ';
    if (c == ' ' && (out.empty() || out.back() == ' ')) continue;
    out += c;
  }
  while (!out.empty() && out.back() == ' ') out.pop_back();
  return out;
}

enum class Column { speed, gas, value, pressure, temperature, weight, uncertainty, name, trace };

std::optional<Column> column_of(const std::string& name, CalibrationQuantity q) {
  const auto n = normalised(name);
  auto any = [&](std::initializer_list<const char*> names) {
    return std::any_of(names.begin(), names.end(), [&](const char* s) { return n == s; });
  };
  if (any({"speed", "stirrer speed", "agitator speed", "impeller speed", "rotational speed", "agitation", "n"})) return Column::speed;
  if (any({"gas flow", "gas", "gas rate", "aeration", "aeration rate", "air flow", "airflow", "qg", "q g"})) return Column::gas;
  if (q == CalibrationQuantity::kla && any({"kla", "k la", "measured kla", "kla measured"})) return Column::value;
  if (q == CalibrationQuantity::mixing_time &&
      (any({"mixing time", "theta", "t95", "t mix", "tmix", "measured mixing time"}) || n.rfind("theta", 0) == 0 ||
       n.rfind("mixing time", 0) == 0)) {
    return Column::value;
  }
  if (any({"pressure", "head pressure", "headspace pressure", "back pressure", "top pressure"})) return Column::pressure;
  if (any({"temperature", "temp", "broth temperature"})) return Column::temperature;
  if (any({"weight", "w"})) return Column::weight;
  if (any({"uncertainty", "sd", "sigma", "standard deviation", "error", "kla uncertainty", "kla sd",
           "mixing time uncertainty", "mixing time sd"})) {
    return Column::uncertainty;
  }
  if (any({"name", "run", "point", "id", "label"})) return Column::name;
  if (q == CalibrationQuantity::kla && any({"trace", "trace file", "gassing-out trace", "gassing out trace", "do trace"})) {
    return Column::trace;
  }
  return std::nullopt;
}

const char* value_name(CalibrationQuantity q) { return q == CalibrationQuantity::kla ? "kLa" : "mixing time"; }
const char* example_header(CalibrationQuantity q) {
  return q == CalibrationQuantity::kla ? "'speed [rpm],gas flow [Nm3/h],kLa [1/h]'"
                                       : "'speed [rpm],gas flow [Nm3/h],mixing time [s]'";
}

// The case reader's gas-flow units (input/case_quantities.cpp): normal and actual volumes.
constexpr std::array<const char*, 9> kGasUnits{"vvm", "Nm3/h", "Nm3/min", "Nm3/s", "NL/min", "m3/h", "m3/min", "m3/s", "L/min"};
constexpr const char* kGasUnitList = "vvm, Nm3/h, Nm3/min, Nm3/s, NL/min (normal: 0 degC, 1 atm), or m3/h, m3/min, m3/s, L/min (actual)";

std::optional<double> rate_factor(const std::string& unit) {
  if (unit == "1/h" || unit == "h-1" || unit == "h^-1") return 1.0 / 3600.0;
  if (unit == "1/min" || unit == "min-1" || unit == "min^-1") return 1.0 / 60.0;
  if (unit == "1/s" || unit == "s-1" || unit == "s^-1") return 1.0;
  return std::nullopt;
}

// SI value of one unit of the measured quantity, or nothing.
std::optional<double> value_factor(CalibrationQuantity q, const std::string& unit) {
  if (q == CalibrationQuantity::kla) return rate_factor(unit);
  try {
    return units::to_si(units::Dimension::time, units::Split{1.0, unit});
  } catch (const UnitError&) {
    return std::nullopt;
  }
}


// The points of a parsed table.
CalibrationData calibration_from(const CsvTable& table, CalibrationQuantity q) {
  const std::string& file_name = table.file_name;
  CalibrationData data;
  data.file_name = file_name;
  data.quantity = q;
  const std::string vname = value_name(q);
  const char sep = table.separator;
  std::vector<Column> columns;
  std::vector<HeaderCell> header;
  double value_si = 1.0;       // SI value of one unit of the measured value
  double uncertainty_si = 0.0; // SI value of one unit of the uncertainty; 0: percent
  {
    const auto where = table.where(table.header_line);
    const auto& cells = table.header;
    {
      for (size_t i = 0; i < cells.size(); ++i) {
        // The first reading whose name is a known column ("gas flow Nm3/h": "gas flow"); a
        // unit-less name such as "name" or "trace" is the last reading, the whole cell.
        std::optional<Column> col;
        HeaderCell hc = header_cell_readings(cells[i]).front();
        for (const auto& r : header_cell_readings(cells[i])) {
          if ((col = column_of(r.name, q))) {
            hc = r;
            break;
          }
        }
        if (!col) {
          throw CaseError(fmt::format("{}: column {} '{}': unknown column; expected speed, gas flow, {} (required) and "
                                      "optionally pressure, temperature, weight, uncertainty, name{}",
                                      where, i + 1, cells[i], vname, q == CalibrationQuantity::kla ? ", trace" : ""));
        }
        if (std::find(columns.begin(), columns.end(), *col) != columns.end()) {
          throw CaseError(fmt::format("{}: column {} '{}': a second {} column", where, i + 1, cells[i], hc.name));
        }
        header.push_back(hc);
        columns.push_back(*col);
        const auto& unit = header.back().unit;
        const auto bad_unit = [&](const std::string& expected) {
          throw CaseError(fmt::format("{}: column {} '{}': {} unit '{}'; expected {}", where, i + 1, cells[i],
                                      unit.empty() ? "missing" : "unknown", unit, expected));
        };
        try {
          switch (*col) {
            case Column::speed: units::to_si(units::Dimension::speed, {1.0, unit}); break;
            case Column::gas:
              if (std::find_if(kGasUnits.begin(), kGasUnits.end(), [&](const char* g) { return unit == g; }) == kGasUnits.end()) {
                bad_unit(kGasUnitList);
              }
              break;
            case Column::value: {
              const auto f = value_factor(q, unit);
              if (!f) bad_unit(q == CalibrationQuantity::kla ? "1/h, 1/min or 1/s" : units::accepted(units::Dimension::time));
              value_si = *f;
              break;
            }
            case Column::pressure: units::to_si(units::Dimension::pressure, {1.0, unit}); break;
            case Column::temperature: units::to_si(units::Dimension::temperature, {20.0, unit}); break;
            case Column::weight:
              if (!unit.empty() && unit != "-" && unit != "1") bad_unit("none, '-' or '1' (a relative weight)");
              break;
            case Column::uncertainty: break;  // checked below, against the value's unit
            case Column::name:
            case Column::trace: break;
          }
        } catch (const UnitError& e) {
          throw CaseError(fmt::format("{}: column {} '{}': {}", where, i + 1, cells[i], e.what()));
        }
      }
      for (auto [c, what] : {std::pair{Column::speed, "speed"}, std::pair{Column::gas, "gas flow"}}) {
        if (std::find(columns.begin(), columns.end(), c) == columns.end()) {
          throw CaseError(fmt::format("{}: the header has no {} column; expected e.g. {}", where, what, example_header(q)));
        }
      }
      const bool has_value = std::find(columns.begin(), columns.end(), Column::value) != columns.end();
      const bool has_trace = std::find(columns.begin(), columns.end(), Column::trace) != columns.end();
      if (!has_value && !has_trace) {
        throw CaseError(fmt::format("{}: the header has no {} column; expected e.g. {}", where, vname, example_header(q)));
      }
      const bool has_weight = std::find(columns.begin(), columns.end(), Column::weight) != columns.end();
      if (const auto it = std::find(columns.begin(), columns.end(), Column::uncertainty); it != columns.end()) {
        const auto i = static_cast<size_t>(it - columns.begin());
        if (has_weight) {
          throw CaseError(fmt::format("{}: column {} '{}': give either a weight or an uncertainty column, not both",
                                      where, i + 1, cells[i]));
        }
        const auto& unit = header[i].unit;
        if (unit == "%") {
          uncertainty_si = 0.0;
        } else if (const auto f = value_factor(q, unit); f && has_value) {
          uncertainty_si = *f;
        } else {
          throw CaseError(fmt::format("{}: column {} '{}': {} unit '{}'; expected % or a unit of the {} column", where,
                                      i + 1, cells[i], unit.empty() ? "missing" : "unknown", unit, vname));
        }
      }
    }
  }
  for (const auto& row : table.rows) {
    const int line_no = row.line;
    const auto where = table.where(line_no);
    const auto& cells = row.cells;
    CalibrationPoint p;
    p.line = line_no;
    p.name = fmt::format("line {}", line_no);
    std::optional<double> value, uncertainty;
    const auto number = [&](size_t i, bool positive) {
      const auto v = parse_number(cells[i], sep == ';');
      const auto col = fmt::format("{}: column {} '{}'", where, i + 1, header[i].unit.empty() ? header[i].name
                                                                                             : header[i].name + " [" + header[i].unit + "]");
      if (!v) throw CaseError(fmt::format("{}: '{}' is not a number", col, cells[i]));
      if (positive ? !(*v > 0.0) : !(*v >= 0.0)) {
        throw CaseError(fmt::format("{}: {} {}: must be {} 0", col, cells[i], header[i].unit, positive ? "more than" : "at least"));
      }
      return *v;
    };
    for (size_t i = 0; i < cells.size(); ++i) {
      const auto& unit = header[i].unit;
      switch (columns[i]) {
        case Column::speed: p.speed_text = fmt::format("{:.17g} {}", number(i, true), unit); break;
        case Column::gas: p.gas_text = fmt::format("{:.17g} {}", number(i, false), unit); break;
        case Column::value:
          if (!cells[i].empty()) value = number(i, true) * value_si;
          break;
        case Column::pressure:
          if (!cells[i].empty()) p.pressure_text = fmt::format("{:.17g} {}", number(i, false), unit);
          break;
        case Column::temperature:
          if (!cells[i].empty()) {
            const auto v = parse_number(cells[i], sep == ';');
            if (!v) throw CaseError(fmt::format("{}: column {} '{}': '{}' is not a number", where, i + 1, header[i].name, cells[i]));
            p.temperature_text = fmt::format("{:.17g} {}", *v, unit);
          }
          break;
        case Column::weight:
          if (!cells[i].empty()) p.weight = number(i, true);
          break;
        case Column::uncertainty:
          if (!cells[i].empty()) uncertainty = number(i, true);
          break;
        case Column::name:
          if (!cells[i].empty()) p.name = cells[i];
          break;
        case Column::trace:
          if (!cells[i].empty()) {
            std::filesystem::path path(cells[i]);
            if (path.is_relative()) path = std::filesystem::path(file_name).parent_path() / path;
            p.trace = path.lexically_normal().string();
          }
          break;
      }
    }
    if (!value && !p.trace.empty()) {
      // The kLa from the row's gassing-out trace, with the probe lag fitted (kla-fit's default).
      std::string trimmed;
      const DoTrace trace = rise_from_minimum(read_do_trace(p.trace), trimmed);
      const KlaFitResult fit = fit_kla(trace, KlaFitOptions{});
      value = fit.kla_1_s;
      if (!trimmed.empty()) data.notes.push_back(fmt::format("{}: {}: {}", where, p.trace, trimmed));
      data.notes.push_back(fmt::format("{}: kLa {:.4g} 1/h fitted from the gassing-out trace {} (probe lag {:.3g} s)",
                                       where, 3600.0 * fit.kla_1_s, p.trace, fit.probe_lag_s));
      for (const auto& w : fit.warnings) data.notes.push_back(fmt::format("{}: {}: {}", where, p.trace, w));
    }
    if (!value) {
      throw CaseError(fmt::format("{}: no {} on this row{}", where, vname,
                                  q == CalibrationQuantity::kla ? " (give the kLa or a gassing-out trace to fit it from)" : ""));
    }
    p.value = *value;
    if (uncertainty) {
      // Weight 1/sigma^2 of ln(value): sigma_ln = sigma / value for small sigma.
      const double rel = uncertainty_si == 0.0 ? *uncertainty / 100.0 : *uncertainty * uncertainty_si / p.value;
      p.weight = 1.0 / (rel * rel);
    }
    data.points.push_back(p);
  }
  if (data.points.empty()) throw CaseError(fmt::format("{}: no data rows after the header", file_name));
  return data;
}

}  // namespace

CalibrationData parse_calibration_data(const std::string& text, const std::string& file_name, CalibrationQuantity q) {
  return calibration_from(parse_csv_table(text, file_name, example_header(q)), q);
}

CalibrationData read_calibration_data(const std::string& path, CalibrationQuantity q) {
  return calibration_from(read_csv_table(path, "data file", example_header(q)), q);
}

LoadedCase case_at_point(const LoadedCase& base, const std::vector<Override>& base_overrides, const CalibrationData& data,
                         const CalibrationPoint& p, const std::vector<Override>& extra) {
  std::vector<Override> o = base_overrides;
  const auto set = [&](const std::string& key, const std::string& value) {
    o.push_back(parse_override(fmt::format("{}=\"{}\"", key, value)));
  };
  set("operation.speed", p.speed_text);
  set("operation.gas_flow", p.gas_text);
  if (!p.pressure_text.empty()) set("vessel.head_pressure", p.pressure_text);
  if (!p.temperature_text.empty()) set("vessel.temperature", p.temperature_text);
  o.insert(o.end(), extra.begin(), extra.end());
  try {
    return read_case_text(base.source_text, base.file_name, o);
  } catch (const CaseError& e) {
    throw CaseError(fmt::format("{}:{}: operating point '{}' (speed {}, gas flow {}) in case {}: {}", data.file_name,
                                p.line, p.name, p.speed_text, p.gas_text, base.file_name, e.what()));
  }
}

std::vector<double> normalised_weights(const CalibrationData& data) {
  std::vector<double> w;
  double sum = 0.0;
  for (const auto& p : data.points) w.push_back(p.weight), sum += p.weight;
  for (double& v : w) v *= static_cast<double>(w.size()) / sum;
  return w;
}

}  // namespace oxystrat
