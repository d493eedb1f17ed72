#include "input/units.hpp"

#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <utility>
#include <fmt/format.h>

#include "physics/constants.hpp"

namespace oxystrat::units {
namespace {

struct UnitDef {
  std::string_view name;
  double factor;  // SI = value * factor + offset
  double offset = 0.0;
};

constexpr double kMinute = 60.0;
constexpr double kHour = 3600.0;

// Accepted spellings per dimension; the first entry is the display unit.
const std::vector<UnitDef>& table(Dimension dim) {
  static const std::vector<UnitDef> length{{"m", 1.0}, {"mm", 1e-3}, {"cm", 1e-2}, {"um", 1e-6},
                                           {"in", 0.0254}, {"ft", 0.3048}};
  static const std::vector<UnitDef> volume{{"m3", 1.0}, {"L", 1e-3}, {"l", 1e-3},
                                           {"m^3", 1.0}, {"mL", 1e-6}};
  static const std::vector<UnitDef> speed{{"rpm", 1.0 / kMinute}, {"rps", 1.0}, {"1/s", 1.0},
                                          {"1/min", 1.0 / kMinute}, {"Hz", 1.0}};
  static const std::vector<UnitDef> pressure{{"bar", 1e5},  {"Pa", 1.0},        {"kPa", 1e3},
                                             {"MPa", 1e6},  {"mbar", 100.0},    {"atm", 101325.0},
                                             {"psi", 6894.757293168361},
                                             {"mmHg", kMmHgPa}, {"Torr", 101325.0 / 760.0}};
  static const std::vector<UnitDef> temperature{{"degC", 1.0, zero_celsius_k}, {"K", 1.0}, {"\u00b0C", 1.0, zero_celsius_k}};
  static const std::vector<UnitDef> biomass{{"g/L", 1.0}, {"kg/m3", 1.0}, {"mg/L", 1e-3}};
  static const std::vector<UnitDef> specific_rate{
      {"mmol/g/h", 1.0 / kHour}, {"mol/kg/s", 1.0}, {"mmol/(g h)", 1.0 / kHour},
      {"mol/kg/h", 1.0 / kHour}};
  static const std::vector<UnitDef> viscosity{{"mPa s", 1e-3}, {"Pa s", 1.0}, {"cP", 1e-3},
                                              {"Pa.s", 1.0},   {"mPa.s", 1e-3}};
  static const std::vector<UnitDef> density{{"kg/m3", 1.0}, {"g/L", 1.0}, {"g/cm3", 1e3}, {"kg/L", 1e3}};
  static const std::vector<UnitDef> time{{"s", 1.0}, {"min", kMinute}, {"h", kHour},
                                         {"d", 86400.0}, {"ms", 1e-3}};
  static const std::vector<UnitDef> velocity{{"m/s", 1.0}, {"cm/s", 1e-2}, {"mm/s", 1e-3}};
  static const std::vector<UnitDef> power{{"kW", 1e3}, {"W", 1.0}, {"MW", 1e6}, {"hp", 745.6998715822702}};
  static const std::vector<UnitDef> power_density{{"kW/m3", 1e3}, {"W/m3", 1.0}, {"W/L", 1e3}};
  static const std::vector<UnitDef> fraction{{"", 1.0}, {"%", 0.01}};
  static const std::vector<UnitDef> rate{{"1/h", 1.0 / kHour}, {"1/s", 1.0}, {"1/min", 1.0 / kMinute},
                                         {"1/d", 1.0 / 86400.0}};
  static const std::vector<UnitDef> mass_yield{{"g/g", 1.0}, {"kg/kg", 1.0}, {"", 1.0}};
  static const std::vector<UnitDef> mass_specific_rate{
      {"g/g/h", 1.0 / kHour}, {"g/(g h)", 1.0 / kHour}, {"kg/kg/s", 1.0}, {"g/g/d", 1.0 / 86400.0}};
  static const std::vector<UnitDef> volume_flow{{"L/h", 1e-3 / kHour}, {"m3/h", 1.0 / kHour}, {"L/min", 1e-3 / kMinute},
                                                {"mL/min", 1e-6 / kMinute}, {"m3/s", 1.0}, {"L/s", 1e-3}};
  static const std::vector<UnitDef> stress{{"Pa", 1.0}, {"mPa", 1e-3}, {"kPa", 1e3}};
  static const std::vector<UnitDef> consistency{{"Pa s^n", 1.0}, {"mPa s^n", 1e-3}, {"Pa.s^n", 1.0}};
  static const std::vector<UnitDef> area{{"m2", 1.0}, {"m^2", 1.0}, {"cm2", 1e-4}, {"ft2", 0.09290304}};
  static const std::vector<UnitDef> heat_transfer_coefficient{
      {"W/(m2 K)", 1.0}, {"W/m2/K", 1.0}, {"kW/(m2 K)", 1e3}, {"kW/m2/K", 1e3}};
  static const std::vector<UnitDef> mass_flow{{"kg/s", 1.0}, {"kg/h", 1.0 / kHour}, {"t/h", 1e3 / kHour},
                                              {"kg/min", 1.0 / kMinute}};
  static const std::vector<UnitDef> specific_heat{{"J/(kg K)", 1.0}, {"kJ/(kg K)", 1e3}, {"J/kg/K", 1.0},
                                                  {"kJ/kg/K", 1e3}};
  // kcal is the thermochemical calorie, 4.184 J.
  static const std::vector<UnitDef> molar_energy{{"kJ/mol", 1e3}, {"J/mol", 1.0}, {"kcal/mol", 4184.0},
                                                 {"kJ/mmol", 1e6}, {"kcal/mmol", 4.184e6}};
  static const std::vector<UnitDef> specific_power{{"W/kg", 1.0}, {"mW/kg", 1e-3}, {"kW/kg", 1e3}};
  static const std::vector<UnitDef> pressure_difference{{"bar", 1e5}, {"Pa", 1.0}, {"kPa", 1e3}, {"mbar", 100.0},
                                                        {"psi", 6894.757293168361}, {"mmHg", kMmHgPa}};
  // Cell-culture units: counts per volume, the dry mass of one cell, uptake per cell.
  static const std::vector<UnitDef> cell_density{{"cells/mL", 1e6}, {"cells/L", 1e3}, {"cells/m3", 1.0},
                                                 {"cells/uL", 1e9}};
  static const std::vector<UnitDef> cell_mass{{"pg", 1e-15}, {"ng", 1e-12}, {"fg", 1e-18}, {"kg", 1.0}};
  static const std::vector<UnitDef> cell_specific_rate{
      {"pmol/cell/h", 1e-12 / kHour},    {"pmol/(cell h)", 1e-12 / kHour},   {"pmol/cell/day", 1e-12 / 86400.0},
      {"pmol/(cell day)", 1e-12 / 86400.0}, {"pmol/cell/d", 1e-12 / 86400.0}, {"fmol/cell/h", 1e-15 / kHour},
      {"mol/cell/s", 1.0}};
  // Concentrations in molar units; mass units are handled with the molar mass.
  static const std::vector<UnitDef> concentration{
      {"mmol/L", 1.0}, {"mol/m3", 1.0}, {"mM", 1.0}, {"mol/L", 1e3}, {"M", 1e3}, {"umol/L", 1e-3}};
  switch (dim) {
    case Dimension::length: return length;
    case Dimension::volume: return volume;
    case Dimension::speed: return speed;
    case Dimension::pressure: return pressure;
    case Dimension::temperature: return temperature;
    case Dimension::concentration: return concentration;
    case Dimension::biomass: return biomass;
    case Dimension::specific_rate: return specific_rate;
    case Dimension::viscosity: return viscosity;
    case Dimension::density: return density;
    case Dimension::time: return time;
    case Dimension::velocity: return velocity;
    case Dimension::power: return power;
    case Dimension::power_density: return power_density;
    case Dimension::fraction: return fraction;
    case Dimension::rate: return rate;
    case Dimension::mass_yield: return mass_yield;
    case Dimension::mass_specific_rate: return mass_specific_rate;
    case Dimension::volume_flow: return volume_flow;
    case Dimension::stress: return stress;
    case Dimension::consistency: return consistency;
    case Dimension::area: return area;
    case Dimension::heat_transfer_coefficient: return heat_transfer_coefficient;
    case Dimension::mass_flow: return mass_flow;
    case Dimension::specific_heat: return specific_heat;
    case Dimension::molar_energy: return molar_energy;
    case Dimension::specific_power: return specific_power;
    case Dimension::pressure_difference: return pressure_difference;
    case Dimension::cell_density: return cell_density;
    case Dimension::cell_mass: return cell_mass;
    case Dimension::cell_specific_rate: return cell_specific_rate;
  }
  throw UnitError("unknown dimension");
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

// The table's entry for a unit name, or null.
const UnitDef* find_unit(Dimension dim, const std::string& name) {
  for (const auto& u : table(dim)) {
    if (u.name == name) return &u;
  }
  return nullptr;
}

// The typographic forms of unit symbols, as data sheets print them, in the plain ones the tables
// hold: "mPa·s" (middle dot), "Nm³/h", "m²", "µm" (micro sign or Greek mu).
std::string plain_symbols(std::string_view s) {
  static const std::pair<std::string_view, std::string_view> forms[] = {
      {"\u00b7", " "}, {"\u22c5", " "}, {"\u00b3", "3"}, {"\u00b2", "2"}, {"\u00b5", "u"}, {"\u03bc", "u"}};
  std::string out(s);
  for (const auto& [typographic, plain] : forms) {
    for (size_t at = out.find(typographic); at != std::string::npos; at = out.find(typographic, at + plain.size())) {
      out.replace(at, typographic.size(), plain);
    }
  }
  return out;
}

// Collapses runs of blanks so "mPa  s" matches "mPa s".
std::string fold_spaces(std::string_view s) {
  std::string out;
  bool blank = false;
  for (char c : s) {
    if (std::isspace(static_cast<unsigned char>(c))) {
      blank = true;
      continue;
    }
    if (blank && !out.empty()) out += ' ';
    blank = false;
    out += c;
  }
  return out;
}

}  // namespace

Split split(std::string_view text) {
  const std::string_view t = trim(text);
  double value = 0.0;
  const auto* first = t.data();
  const auto* last = t.data() + t.size();
  if (!t.empty() && *first == '+') ++first;  // from_chars rejects a leading '+'
  const auto [ptr, ec] = std::from_chars(first, last, value);
  if (ec != std::errc() || ptr == first) {
    throw UnitError(fmt::format("'{}' does not start with a number", t));
  }
  if (!std::isfinite(value)) throw UnitError(fmt::format("'{}' is not a finite number", t));
  return Split{value, fold_spaces(plain_symbols(std::string_view(ptr, static_cast<size_t>(last - ptr))))};
}

std::string accepted(Dimension dim) {
  std::string out;
  for (const auto& u : table(dim)) {
    if (u.name.empty()) continue;
    if (!out.empty()) out += ", ";
    out += u.name;
  }
  if (dim == Dimension::pressure) out += " (each with (a) for absolute or (g) for gauge: bar(a) or bara)";
  if (dim == Dimension::concentration) out += ", mg/L";
  if (dim == Dimension::fraction) out = "a plain number or %";
  return out;
}

double to_si(Dimension dim, const Split& q, double molar_mass_kg_mol) {
  std::string unit = q.unit;
  double offset_pa = 0.0;
  if (dim == Dimension::pressure) {
    // The plant's own spelling, "barg", "psia", "kPag", is the marked one: "bar(g)".
    if (!unit.empty() && (unit.back() == 'a' || unit.back() == 'g') && find_unit(dim, unit.substr(0, unit.size() - 1))) {
      unit = unit.substr(0, unit.size() - 1) + "(" + unit.back() + ")";
    }
    const bool absolute = unit.size() >= 3 && unit.compare(unit.size() - 3, 3, "(a)") == 0;
    const bool gauge = unit.size() >= 3 && unit.compare(unit.size() - 3, 3, "(g)") == 0;
    if (!absolute && !gauge) {
      throw UnitError(fmt::format("pressure unit '{}' must say (a) for absolute or (g) for gauge, "
                                  "e.g. '1.5 bar(a)' or '0.5 bar(g)' (also written bara, barg)",
                                  unit));
    }
    unit = fold_spaces(std::string_view(unit).substr(0, unit.size() - 3));
    if (unit.empty()) throw UnitError(fmt::format("missing unit before '{}'; expected one of {}", q.unit, accepted(dim)));
    if (gauge) offset_pa = standard_atmosphere_pa;
  }
  if (dim == Dimension::concentration && (unit == "mg/L" || unit == "g/m3")) {
    if (molar_mass_kg_mol <= 0.0) throw UnitError("mg/L needs a molar mass here");
    return q.value * 1e-3 / molar_mass_kg_mol;  // mg/L = g/m3
  }
  if (const UnitDef* u = find_unit(dim, unit)) return q.value * u->factor + u->offset + offset_pa;
  if (unit.empty()) throw UnitError(fmt::format("missing unit; expected one of {}", accepted(dim)));
  throw UnitError(fmt::format("unknown unit '{}'; expected one of {}", unit, accepted(dim)));
}

double parse(Dimension dim, std::string_view text, double molar_mass_kg_mol) {
  return to_si(dim, split(text), molar_mass_kg_mol);
}

std::string display_unit(Dimension dim) {
  const auto name = std::string(table(dim).front().name);
  return dim == Dimension::pressure ? name + "(a)" : name;
}

double to_display(Dimension dim, double value_in_si) {
  const auto& u = table(dim).front();
  return (value_in_si - u.offset) / u.factor;
}

std::string format(Dimension dim, double value_in_si, int digits) {
  const std::string unit = display_unit(dim);
  const double v = to_display(dim, value_in_si);
  return unit.empty() ? fmt::format("{:.{}g}", v, digits) : fmt::format("{:.{}g} {}", v, digits, unit);
}

}  // namespace oxystrat::units
