#include "solver/studies/calibrate.hpp"

#include <fmt/format.h>

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <numbers>
#include <sstream>

#include "input/csv_cells.hpp"
#include "input/units.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/fit/kla_fit.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kG = 9.80665;         // standard gravity [m/s2], as in the oxygen field
constexpr double kR = 8.314462618;     // gas constant [J/(mol K)] (CODATA 2018)

// ---------------------------------------------------------------------------------------------
// Reading the data file

using csv::parse_number;
using csv::split_cells;
using csv::trim;

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

struct HeaderCell {
  std::string name, unit;
};

// "speed [rpm]", "speed (rpm)" or "speed rpm": the name, then the unit in brackets or after the
// last space. "pressure (bar(g))" keeps its inner parentheses.
HeaderCell split_header_cell(std::string_view cell) {
  cell = trim(cell);
  if (const auto o = cell.find('['); o != std::string_view::npos) {
    const auto c = cell.find(']', o);
    if (c != std::string_view::npos) return {std::string(trim(cell.substr(0, o))), std::string(trim(cell.substr(o + 1, c - o - 1)))};
  }
  if (const auto o = cell.find('('); o != std::string_view::npos && cell.back() == ')') {
    return {std::string(trim(cell.substr(0, o))), std::string(trim(cell.substr(o + 1, cell.size() - o - 2)))};
  }
  const auto space = cell.find_last_of(" \t");
  if (space == std::string_view::npos) return {std::string(cell), ""};
  return {std::string(trim(cell.substr(0, space))), std::string(trim(cell.substr(space + 1)))};
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

// The case reader's gas-flow units (solver/case/case_reader.cpp): normal and actual volumes.
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

}  // namespace

CalibrationData parse_calibration_data(const std::string& text, const std::string& file_name, CalibrationQuantity q) {
  CalibrationData data;
  data.file_name = file_name;
  data.quantity = q;
  const std::string vname = value_name(q);
  std::istringstream in(text);
  std::string raw;
  int line_no = 0;
  bool have_header = false;
  char sep = ',';
  std::vector<Column> columns;
  std::vector<HeaderCell> header;
  double value_si = 1.0;       // SI value of one unit of the measured value
  double uncertainty_si = 0.0; // SI value of one unit of the uncertainty; 0: percent
  while (std::getline(in, raw)) {
    ++line_no;
    const std::string_view line = csv::content_line(raw, line_no);
    if (line.empty()) continue;
    const auto where = fmt::format("{}:{}", file_name, line_no);
    if (!have_header) {
      sep = csv::separator_of(line);
      const auto cells = split_cells(line, sep);
      if (parse_number(cells.front(), sep == ';')) {
        throw CaseError(fmt::format("{}: expected a header row naming the columns with their units, e.g. {}, before "
                                    "the first row of numbers",
                                    where, example_header(q)));
      }
      for (size_t i = 0; i < cells.size(); ++i) {
        const auto hc = split_header_cell(cells[i]);
        auto col = column_of(hc.name, q);
        // A unit-less name such as "name" or "trace": the whole cell is the name.
        if (!col && !hc.unit.empty()) {
          col = column_of(cells[i], q);
          if (col) header.push_back({cells[i], ""});
        }
        if (!col) {
          throw CaseError(fmt::format("{}: column {} '{}': unknown column; expected speed, gas flow, {} (required) and "
                                      "optionally pressure, temperature, weight, uncertainty, name{}",
                                      where, i + 1, cells[i], vname, q == CalibrationQuantity::kla ? ", trace" : ""));
        }
        if (std::find(columns.begin(), columns.end(), *col) != columns.end()) {
          throw CaseError(fmt::format("{}: column {} '{}': a second {} column", where, i + 1, cells[i], hc.name));
        }
        if (header.size() == i) header.push_back(hc);
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
      have_header = true;
      continue;
    }
    const auto cells = split_cells(line, sep);
    if (cells.size() != columns.size()) {
      throw CaseError(fmt::format("{}: {} cells; the header has {} columns", where, cells.size(), columns.size()));
    }
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
      const DoTrace trace = read_do_trace(p.trace);
      const KlaFitResult fit = fit_kla(trace, KlaFitOptions{});
      value = fit.kla_1_s;
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
  if (!have_header) {
    throw CaseError(fmt::format("{}: no header and no data; expected a header such as {} and one row per operating point",
                                file_name, example_header(q)));
  }
  if (data.points.empty()) throw CaseError(fmt::format("{}: no data rows after the header", file_name));
  return data;
}

CalibrationData read_calibration_data(const std::string& path, CalibrationQuantity quantity) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw CaseError(fmt::format("{}: cannot open the data file", path));
  std::ostringstream ss;
  ss << in.rdbuf();
  return parse_calibration_data(ss.str(), path, quantity);
}

// -------------------------------------------------------------------------------------------------
// The model at one operating point

VesselKlaInputs vessel_kla_inputs(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h) {
  // As OxygenSetup (solver/oxygen_field.cpp): total gassed power per working volume, and the
  // wet inlet gas at the pressure of mid-height in the ungassed liquid over the vessel's section.
  VesselKlaInputs in;
  const double t = c.vessel.temperature_k;
  const double pw = physics::water_vapour_pressure(t);
  const double p_mid = c.vessel.head_pressure_pa + 0.5 * c.broth.density_kg_m3 * kG * c.vessel.liquid_height_m;
  in.power_per_volume_w_m3 = h.power_gassed_w / c.vessel.working_volume_m3;
  in.superficial_gas_m_s =
      h.gas_molar_flow_mol_s * kR * t / (p_mid - pw) / (std::numbers::pi * std::pow(net.shape.radius(), 2));
  in.temperature_factor = kla_temperature_factor(t);
  in.kla_factor = c.model.kla_factor;
  return in;
}

double vessel_kla(const VantRietConstants& k, const VesselKlaInputs& in) {
  return vant_riet_kla(k, in.power_per_volume_w_m3, in.superficial_gas_m_s) * in.temperature_factor * in.kla_factor;
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

namespace {

std::vector<double> normalised_weights(const CalibrationData& data) {
  std::vector<double> w;
  double sum = 0.0;
  for (const auto& p : data.points) w.push_back(p.weight), sum += p.weight;
  for (double& v : w) v *= static_cast<double>(w.size()) / sum;
  return w;
}

double weighted_correlation(const std::vector<double>& x, const std::vector<double>& y, const std::vector<double>& w) {
  double sw = 0, mx = 0, my = 0;
  for (size_t i = 0; i < x.size(); ++i) sw += w[i], mx += w[i] * x[i], my += w[i] * y[i];
  mx /= sw, my /= sw;
  double sxx = 0, syy = 0, sxy = 0;
  for (size_t i = 0; i < x.size(); ++i) {
    sxx += w[i] * (x[i] - mx) * (x[i] - mx);
    syy += w[i] * (y[i] - my) * (y[i] - my);
    sxy += w[i] * (x[i] - mx) * (y[i] - my);
  }
  return sxx > 0.0 && syy > 0.0 ? sxy / std::sqrt(sxx * syy) : 0.0;
}

double spread(const std::vector<double>& v) {
  const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
  return *hi - *lo;
}

// ln spread below which a regressor counts as not varied: 10 %, against measured kLa scatter of
// +-20-40 % (van 't Riet 1979) such a lever cannot pin an exponent (our modelling choice).
constexpr double kMinLogSpread = 0.1;
// |correlation| of ln(P/V) and ln(vs) above which the two exponents cannot be told apart.
constexpr double kMaxCorrelation = 0.98;

}  // namespace

KlaCalibration calibrate_kla(const LoadedCase& base, const std::vector<Override>& base_overrides,
                             const CalibrationData& data, const KlaCalibrationOptions& opt) {
  if (data.quantity != CalibrationQuantity::kla) throw CaseError(fmt::format("{}: not kLa data", data.file_name));
  const Case& c0 = base.data;
  if (c0.model.kla_model != KlaModel::local_correlation) {
    throw CaseError(fmt::format("{}: model.kla_model = \"mechanistic\": calibrate fits the constants of the van 't Riet "
                                "correlation, which only model.kla_model = \"local-correlation\" uses",
                                base.file_name));
  }
  KlaCalibration res;
  res.confidence = opt.confidence;
  res.before = vant_riet_constants(c0.broth.coalescence, c0.model);
  const auto w = normalised_weights(data);
  const size_t n = data.points.size();
  std::vector<double> x1, x2, y;
  for (size_t i = 0; i < n; ++i) {
    const auto& p = data.points[i];
    const Case c = case_at_point(base, base_overrides, data, p).data;
    if (c.operation.gas_flow_normal_m3_s <= 0.0) {
      throw CaseError(fmt::format("{}:{}: operating point '{}': gas flow {}: a kLa needs sparged gas", data.file_name,
                                  p.line, p.name, p.gas_text));
    }
    const auto net = build_zone_geometry(c);
    const auto hydro = compute_hydrodynamics(c, net);
    KlaPointResult r;
    r.name = p.name;
    r.line = p.line;
    r.speed_rps = c.operation.speed_rps;
    r.gas_normal_m3_s = c.operation.gas_flow_normal_m3_s;
    r.working_volume_m3 = c.vessel.working_volume_m3;
    r.inputs = vessel_kla_inputs(c, net, hydro);
    if (!(r.inputs.power_per_volume_w_m3 > 0.0)) {
      throw CaseError(fmt::format("{}:{}: operating point '{}': no power input at speed {}", data.file_name, p.line,
                                  p.name, p.speed_text));
    }
    r.measured_1_s = p.value;
    r.before_1_s = vessel_kla(res.before, r.inputs);
    r.weight = w[i];
    x1.push_back(std::log(r.inputs.power_per_volume_w_m3));
    x2.push_back(std::log(r.inputs.superficial_gas_m_s));
    y.push_back(std::log(p.value / (r.inputs.temperature_factor * r.inputs.kla_factor)));
    res.rows.push_back(r);
  }
  res.points = static_cast<int>(n);
  const auto range = [&](auto get, double& lo, double& hi) {
    lo = get(res.rows.front()), hi = lo;
    for (const auto& r : res.rows) lo = std::min(lo, get(r)), hi = std::max(hi, get(r));
  };
  range([](const KlaPointResult& r) { return r.inputs.power_per_volume_w_m3; }, res.pv_min, res.pv_max);
  range([](const KlaPointResult& r) { return r.inputs.superficial_gas_m_s; }, res.vs_min, res.vs_max);
  range([](const KlaPointResult& r) { return r.speed_rps; }, res.speed_min_rps, res.speed_max_rps);
  range([](const KlaPointResult& r) { return r.gas_normal_m3_s * 60.0 / r.working_volume_m3; }, res.vvm_min, res.vvm_max);

  // Which exponents the design can identify.
  // At one speed P/V still moves with the gas flow (the gassed power falls), but only in step
  // with vs: the speed itself must have been varied to fit alpha.
  std::vector<double> ln_speed;
  for (const auto& r : res.rows) ln_speed.push_back(std::log(r.speed_rps));
  const bool speed_varied = spread(ln_speed) >= 0.5 * kMinLogSpread;
  res.power_exponent_fitted = speed_varied && spread(x1) >= kMinLogSpread;
  res.gas_exponent_fitted = spread(x2) >= kMinLogSpread;
  res.exponent_correlation = n > 1 ? weighted_correlation(x1, x2, w) : 0.0;
  if (!res.gas_exponent_fitted) {
    res.warnings.push_back(fmt::format(
        "the superficial gas velocity varies by only {:.1f} % over the data (the gas flow was hardly changed), so the "
        "gas exponent beta cannot be fitted: it is held at the case's value {:.3g}; measure at two or more gas flows "
        "to fit it",
        100.0 * std::expm1(spread(x2)), res.before.gas_exponent));
  }
  if (!res.power_exponent_fitted) {
    res.warnings.push_back(fmt::format(
        "the speed varies by only {:.1f} % over the data (P/V by {:.1f} %, and then mostly through the gassed power, "
        "in step with the gas flow), so the power exponent alpha cannot be fitted: it is held at the case's value "
        "{:.3g}; measure at two or more speeds to fit it",
        100.0 * std::expm1(spread(ln_speed)), 100.0 * std::expm1(spread(x1)), res.before.power_exponent));
  }
  if (res.power_exponent_fitted && res.gas_exponent_fitted && std::abs(res.exponent_correlation) > kMaxCorrelation) {
    res.gas_exponent_fitted = false;
    res.warnings.push_back(fmt::format(
        "ln(P/V) and ln(vs) move together over the data (correlation {:.3f}): speed and gas flow were changed in step, "
        "so the two exponents cannot be told apart; beta is held at the case's value {:.3g} and only a and alpha are "
        "fitted; vary speed at a fixed gas flow and gas flow at a fixed speed",
        res.exponent_correlation, res.before.gas_exponent));
  }
  res.parameters = 1 + static_cast<int>(res.power_exponent_fitted) + static_cast<int>(res.gas_exponent_fitted);
  const int dof = res.points - res.parameters;
  if (dof < 1) {
    throw CaseError(fmt::format("{}: {} operating point{} for {} unknown{} ({}): too few to fit and to estimate the "
                                "scatter; measure at least {}, better {}, varying speed and gas flow independently",
                                data.file_name, res.points, res.points == 1 ? "" : "s", res.parameters,
                                res.parameters == 1 ? "" : "s",
                                res.parameters == 1 ? "a" : res.parameters == 2 ? (res.power_exponent_fitted ? "a, alpha" : "a, beta") : "a, alpha, beta",
                                res.parameters + 1, 2 * res.parameters + 2));
  }

  // Weighted least squares on the log scale; the held exponents move to the left-hand side.
  Eigen::MatrixXd A(static_cast<Eigen::Index>(n), res.parameters);
  Eigen::VectorXd b(static_cast<Eigen::Index>(n));
  for (size_t i = 0; i < n; ++i) {
    const auto k = static_cast<Eigen::Index>(i);
    const double sw = std::sqrt(w[i]);
    double lhs = y[i];
    Eigen::Index j = 0;
    A(k, j++) = sw;
    if (res.power_exponent_fitted) A(k, j++) = sw * x1[i]; else lhs -= res.before.power_exponent * x1[i];
    if (res.gas_exponent_fitted) A(k, j++) = sw * x2[i]; else lhs -= res.before.gas_exponent * x2[i];
    b[k] = sw * lhs;
  }
  const Eigen::VectorXd coef = A.colPivHouseholderQr().solve(b);
  const Eigen::VectorXd r = b - A * coef;  // sqrt(w) (measured - fitted) on the log scale
  const double ss_res = r.squaredNorm();
  const double s2 = ss_res / dof;
  const Eigen::MatrixXd cov = s2 * (A.transpose() * A).inverse();
  res.t_quantile = student_t_quantile(0.5 + 0.5 * opt.confidence, dof);
  Eigen::Index j = 0;
  const double ln_a = coef[j], se_a = std::sqrt(std::max(0.0, cov(j, j)));
  ++j;
  res.fitted.prefactor = std::exp(ln_a);
  res.prefactor_lo = std::exp(ln_a - res.t_quantile * se_a);
  res.prefactor_hi = std::exp(ln_a + res.t_quantile * se_a);
  const auto exponent = [&](bool fitted, double held, double& value, double& lo, double& hi) {
    if (!fitted) {
      value = lo = hi = held;
      return;
    }
    const double se = std::sqrt(std::max(0.0, cov(j, j)));
    value = coef[j];
    lo = value - res.t_quantile * se;
    hi = value + res.t_quantile * se;
    ++j;
  };
  exponent(res.power_exponent_fitted, res.before.power_exponent, res.fitted.power_exponent, res.power_exponent_lo,
           res.power_exponent_hi);
  exponent(res.gas_exponent_fitted, res.before.gas_exponent, res.fitted.gas_exponent, res.gas_exponent_lo,
           res.gas_exponent_hi);

  double sw = 0.0, ybar = 0.0;
  for (size_t i = 0; i < n; ++i) sw += w[i], ybar += w[i] * y[i];
  ybar /= sw;
  double ss_tot = 0.0;
  for (size_t i = 0; i < n; ++i) ss_tot += w[i] * (y[i] - ybar) * (y[i] - ybar);
  res.r_squared = ss_tot > 0.0 ? 1.0 - ss_res / ss_tot : kNaN;
  res.rms_log = std::sqrt(ss_res / sw);
  for (auto& row : res.rows) {
    row.fitted_1_s = vessel_kla(res.fitted, row.inputs);
    row.residual_log = std::log(row.fitted_1_s / row.measured_1_s);
  }

  // What the fragment can hold (the case reader's ranges), then the honest warnings.
  if (!(res.fitted.power_exponent > 0.0 && res.fitted.power_exponent <= 1.5) ||
      !(res.fitted.gas_exponent > 0.0 && res.fitted.gas_exponent <= 1.5) ||
      !(res.fitted.prefactor > 0.0 && res.fitted.prefactor <= 10.0)) {
    throw CaseError(fmt::format(
        "{}: the fit gives a = {:.4g}, alpha = {:.4g}, beta = {:.4g}, outside what the correlation can mean (a more "
        "than 0 and at most 10, exponents more than 0 and at most 1.5): kLa does not rise with P/V and vs over these "
        "data; check the units of the kLa and gas-flow columns and the rows",
        data.file_name, res.fitted.prefactor, res.fitted.power_exponent, res.fitted.gas_exponent));
  }
  const int pct = static_cast<int>(std::lround(100.0 * opt.confidence));
  if (res.power_exponent_fitted &&
      (res.fitted.power_exponent < published_power_exponent_lo || res.fitted.power_exponent > published_power_exponent_hi)) {
    res.warnings.push_back(fmt::format(
        "the fitted power exponent alpha = {:.3g} ({} % interval {:.3g} to {:.3g}) lies outside {:g}-{:g}, the span of "
        "van 't Riet's (1979) two forms; the data may cover too narrow a range or hold another effect (flooding, "
        "foam, antifoam, a probe lag); scaled up, the fitted exponent carries its error to every P/V",
        res.fitted.power_exponent, pct, res.power_exponent_lo, res.power_exponent_hi, published_power_exponent_lo,
        published_power_exponent_hi));
  }
  if (res.gas_exponent_fitted &&
      (res.fitted.gas_exponent < published_gas_exponent_lo || res.fitted.gas_exponent > published_gas_exponent_hi)) {
    res.warnings.push_back(fmt::format(
        "the fitted gas exponent beta = {:.3g} ({} % interval {:.3g} to {:.3g}) lies outside {:g}-{:g}, the span of "
        "van 't Riet's (1979) two forms; check the gas-flow column (normal or actual volumes) and the range covered",
        res.fitted.gas_exponent, pct, res.gas_exponent_lo, res.gas_exponent_hi, published_gas_exponent_lo,
        published_gas_exponent_hi));
  }
  if (res.power_exponent_fitted && res.gas_exponent_fitted && std::abs(res.exponent_correlation) > 0.9) {
    res.warnings.push_back(fmt::format(
        "ln(P/V) and ln(vs) are strongly correlated over the data ({:.3f}): the two exponents trade off against each "
        "other and their intervals are wide; more points with speed and gas flow varied independently would help",
        res.exponent_correlation));
  }
  if (dof < 3) {
    res.warnings.push_back(fmt::format("only {} point{} for {} unknowns ({} degree{} of freedom): the intervals are "
                                       "wide (Student-t {:.3g}) and one bad point decides the fit",
                                       res.points, res.points == 1 ? "" : "s", res.parameters, dof, dof == 1 ? "" : "s",
                                       res.t_quantile));
  }
  if (res.rms_log > 0.25) {
    res.warnings.push_back(fmt::format("the points scatter by {:.0f} % (RMS of ln(fitted/measured)) about the fit, more "
                                       "than repeat kLa measurements usually do; look for outliers or a missing effect",
                                       100.0 * res.rms_log));
  }
  if (dof >= 3 && s2 > 0.0) {
    for (size_t i = 0; i < n; ++i) {
      const double z = std::abs(r[static_cast<Eigen::Index>(i)]) / std::sqrt(s2);
      if (z > 2.5) {
        res.warnings.push_back(fmt::format("{}:{}: point '{}' lies {:.1f} standard deviations from the fit (measured "
                                           "{:.4g} 1/h, fitted {:.4g} 1/h): check it",
                                           data.file_name, res.rows[i].line, res.rows[i].name,
                                           z, 3600.0 * res.rows[i].measured_1_s, 3600.0 * res.rows[i].fitted_1_s));
      }
    }
  }

  // The full zone model at every point with the fitted constants: its volume-mean kLa.
  if (opt.zone_model_check) {
    const std::vector<Override> fitted_keys{
        parse_override(fmt::format("model.kla_prefactor={:.17g}", res.fitted.prefactor)),
        parse_override(fmt::format("model.kla_power_exponent={:.17g}", res.fitted.power_exponent)),
        parse_override(fmt::format("model.kla_gas_exponent={:.17g}", res.fitted.gas_exponent))};
    double worst = 0.0;
    bool all = true;
    for (size_t i = 0; i < n; ++i) {
      const Case c = case_at_point(base, base_overrides, data, data.points[i], fitted_keys).data;
      const auto net = build_zone_geometry(c);
      const auto hydro = compute_hydrodynamics(c, net);
      const auto routing = route_gas(c, net, hydro);
      try {
        // No culture: kLa is a property of the vessel and its operation (as in a gassing-out test).
        const auto field = solve_oxygen_field(OxygenContext{c, net, hydro, routing}, 0.0);
        res.rows[i].zone_mean_1_s = field.kla_mean_1_s;
        worst = std::max(worst, std::abs(field.kla_mean_1_s / res.rows[i].fitted_1_s - 1.0));
      } catch (const SolveError& e) {
        all = false;
        res.warnings.push_back(fmt::format("{}:{}: the zone-model check failed at point '{}': {}", data.file_name,
                                           res.rows[i].line, res.rows[i].name, e.what()));
      }
    }
    if (all) res.zone_check_max_deviation = worst;
    if (worst > 0.05) {
      res.warnings.push_back(fmt::format(
          "the zone model's volume-mean kLa differs from the fitted vessel correlation by up to {:.0f} % (the case has "
          "model.kla_normalise = {}): the fit calibrates the vessel-level correlation; with kla_normalise = true the "
          "zone model reproduces it exactly",
          100.0 * worst, c0.model.kla_normalise ? "true" : "false"));
    }
  }
  return res;
}

// -------------------------------------------------------------------------------------------------
// Exchange constant from mixing times

namespace {

struct MixingRow {
  Case c;
  ZoneNetwork net;
};

double mixing_time_at(const MixingRow& row, double exchange, const MixingCalibrationOptions& o, bool& reached) {
  Case c = row.c;
  c.model.exchange_constant = exchange;
  const auto hydro = compute_hydrodynamics(c, row.net);
  MixingOptions mo = o.mixing;
  mo.snapshots = 1;
  const auto mix = tracer_mixing_time(row.net, hydro, mo);
  reached = reached && mix.reached;
  return o.at_probe ? mix.theta_probe_s : mix.theta_s;
}

}  // namespace

MixingCalibration calibrate_exchange(const LoadedCase& base, const std::vector<Override>& base_overrides,
                                     const CalibrationData& data, const MixingCalibrationOptions& opt) {
  if (data.quantity != CalibrationQuantity::mixing_time) {
    throw CaseError(fmt::format("{}: not mixing-time data", data.file_name));
  }
  MixingCalibration res;
  res.confidence = opt.confidence;
  res.before = base.data.model.exchange_constant > 0.0 ? base.data.model.exchange_constant : default_exchange_constant;
  const auto w = normalised_weights(data);
  const size_t n = data.points.size();
  std::vector<MixingRow> rows;
  for (size_t i = 0; i < n; ++i) {
    const auto& p = data.points[i];
    const Case c = case_at_point(base, base_overrides, data, p).data;
    rows.push_back({c, build_zone_geometry(c)});
    MixingPointResult r;
    r.name = p.name;
    r.line = p.line;
    r.speed_rps = c.operation.speed_rps;
    r.gas_normal_m3_s = c.operation.gas_flow_normal_m3_s;
    r.working_volume_m3 = c.vessel.working_volume_m3;
    r.measured_s = p.value;
    r.weight = w[i];
    res.rows.push_back(r);
  }
  res.points = static_cast<int>(n);
  bool reached = true;
  // Log mixing times at ln c_t = u, every row.
  const auto thetas = [&](double u) {
    std::vector<double> out;
    for (const auto& row : rows) out.push_back(mixing_time_at(row, std::exp(u), opt, reached));
    res.evaluations += static_cast<int>(rows.size());
    return out;
  };
  const auto cost = [&](const std::vector<double>& th) {
    double s = 0.0;
    for (size_t i = 0; i < n; ++i) s += w[i] * std::pow(std::log(th[i] / data.points[i].value), 2);
    return s;
  };
  // The case reader allows 0 < c_t <= 100.
  const double u_lo = std::log(default_exchange_constant / opt.search_factor);
  const double u_hi = std::min(std::log(100.0), std::log(default_exchange_constant * opt.search_factor));
  constexpr int scan = 11;
  std::vector<double> us, costs;
  for (int k = 0; k < scan; ++k) {
    us.push_back(u_lo + (u_hi - u_lo) * k / (scan - 1));
    costs.push_back(cost(thetas(us.back())));
  }
  const auto best = static_cast<int>(std::min_element(costs.begin(), costs.end()) - costs.begin());
  res.at_search_bound = best == 0 || best == scan - 1;
  // Golden section inside the neighbouring scan points, to 1e-3 in ln c_t (0.1 % in c_t).
  double a = us[static_cast<size_t>(std::max(0, best - 1))], d = us[static_cast<size_t>(std::min(scan - 1, best + 1))];
  const double g = (std::sqrt(5.0) - 1.0) / 2.0;
  double b = d - g * (d - a), cc = a + g * (d - a);
  double fb = cost(thetas(b)), fc = cost(thetas(cc));
  while (d - a > 1e-3) {
    if (fb < fc) {
      d = cc, cc = b, fc = fb;
      b = d - g * (d - a);
      fb = cost(thetas(b));
    } else {
      a = b, b = cc, fb = fc;
      cc = a + g * (d - a);
      fc = cost(thetas(cc));
    }
  }
  double u = fb < fc ? b : cc;
  if (costs[static_cast<size_t>(best)] < std::min(fb, fc)) u = us[static_cast<size_t>(best)];
  res.fitted = std::exp(u);
  const auto at_fit = thetas(u);
  const auto at_before = thetas(std::log(res.before));
  // Sensitivities by central differences over +-5 % in c_t.
  constexpr double du = 0.05;
  const auto up = thetas(u + du), down = thetas(u - du);
  double ss = 0.0, jj = 0.0, max_sens = 0.0;
  for (size_t i = 0; i < n; ++i) {
    auto& r = res.rows[i];
    r.fitted_s = at_fit[i];
    r.before_s = at_before[i];
    r.residual_log = std::log(r.fitted_s / r.measured_s);
    r.sensitivity = (std::log(up[i]) - std::log(down[i])) / (2.0 * du);
    ss += w[i] * r.residual_log * r.residual_log;
    jj += w[i] * r.sensitivity * r.sensitivity;
    max_sens = std::max(max_sens, std::abs(r.sensitivity));
  }
  res.rms_log = std::sqrt(ss / static_cast<double>(n));
  res.lo = res.hi = kNaN;
  const int pct = static_cast<int>(std::lround(100.0 * opt.confidence));
  if (n >= 2 && jj > 0.0) {
    res.t_quantile = student_t_quantile(0.5 + 0.5 * opt.confidence, static_cast<double>(n - 1));
    const double se = std::sqrt(ss / static_cast<double>(n - 1) / jj);
    res.lo = std::exp(u - res.t_quantile * se);
    res.hi = std::exp(u + res.t_quantile * se);
  } else if (n < 2) {
    res.warnings.push_back("one mixing time only: c_t matches it exactly, with no scatter to estimate an interval "
                           "from; measure at two or more operating points");
  }
  if (!reached) {
    res.warnings.push_back(fmt::format("the tracer did not mix within {:.3g} s at some point of the search; those mixing "
                                       "times are lower bounds",
                                       opt.mixing.max_time_s));
  }
  if (max_sens < 0.05) {
    res.warnings.push_back(fmt::format(
        "the computed mixing times hardly depend on the exchange constant at these points (|d ln theta / d ln c_t| "
        "at most {:.3f}): the circulation loops set them, so the measurements cannot determine c_t",
        max_sens));
  } else if (res.at_search_bound) {
    res.warnings.push_back(fmt::format(
        "the best exchange constant lies at the end of the search range ({:.3g} to {:.3g}): the measured mixing times "
        "are {} than the network can give by turbulent exchange alone; check the probe and injection positions and "
        "the homogeneity of the measurement",
        std::exp(u_lo), std::exp(u_hi), res.fitted >= std::exp(u_hi) * 0.999 ? "shorter" : "longer"));
  }
  if (n >= 2 && std::isfinite(res.hi) && res.hi / res.lo > 4.0) {
    res.warnings.push_back(fmt::format("c_t is poorly determined: {} % interval {:.3g} to {:.3g}", pct, res.lo, res.hi));
  }
  return res;
}

}  // namespace oxystrat
