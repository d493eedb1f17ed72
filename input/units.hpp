// Parsing of quantities written with units ("120 rpm", "1.5 bar(a)") into SI values, and the
// display units used when numbers are printed. Units exist only at the edges: everything that
// leaves this file is SI.
#pragma once

#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

#include "input/errors.hpp"

namespace oxystrat::units {

//! Physical kind of a quantity; decides which units are accepted.
enum class Dimension {
  length,         // m
  volume,         // m3
  speed,          // rotational speed, 1/s
  pressure,       // Pa (absolute after parsing)
  temperature,    // K
  concentration,  // mol/m3 (molar mass needed for mass units)
  biomass,        // kg/m3 (dry mass per volume)
  specific_rate,  // mol/(kg s)
  viscosity,      // Pa s
  density,        // kg/m3
  time,           // s
  velocity,       // m/s
  power,          // W
  power_density,  // W/m3
  fraction,       // dimensionless, "%" accepted
  rate,           // 1/s (specific growth rate)
  mass_yield,     // kg/kg (g biomass per g substrate or O2)
  mass_specific_rate,  // kg/(kg s) (maintenance: g substrate per g biomass per hour)
  volume_flow,    // m3/s (liquid feed)
  stress,         // Pa (a yield stress: no absolute or gauge)
  consistency,    // Pa s^n (power-law consistency index)
  area,           // m2 (heat-transfer surfaces)
  heat_transfer_coefficient,  // W/(m2 K)
  mass_flow,      // kg/s (coolant)
  specific_heat,  // J/(kg K)
  molar_energy,   // J/mol (heat per mol O2)
  specific_power, // W/kg (energy dissipation rate)
  pressure_difference,  // Pa, a difference: no (a)/(g)
  cell_density,   // 1/m3 (cells per volume: "5e6 cells/mL")
  cell_mass,      // kg (dry mass of one cell: "350 pg")
  cell_specific_rate,  // mol/s per cell (O2 uptake of one cell: "0.2 pmol/cell/h")
};

//! Number and unit text of a quantity string, e.g. "120 rpm" -> {120, "rpm"}.
struct Split {
  double value = 0.0;
  std::string unit;  // empty when the text is a bare number
};

//! Splits "value unit"; throws UnitError when the text does not start with a number.
Split split(std::string_view text);

//! Converts value+unit of `dim` to SI. Pressures must carry "(a)" or "(g)".
//! `molar_mass_kg_mol` is needed only for mass-based concentrations (mg/L).
double to_si(Dimension dim, const Split& q, double molar_mass_kg_mol = 0.0);

//! Parses a whole quantity string to SI (split + to_si).
double parse(Dimension dim, std::string_view text, double molar_mass_kg_mol = 0.0);

//! The units accepted for `dim`, for error messages ("rpm, rps, 1/s").
std::string accepted(Dimension dim);

//! The unit SI values of `dim` are printed in for people ("rpm", "bar(a)", "degC").
std::string display_unit(Dimension dim);

//! SI value converted to display_unit(dim).
double to_display(Dimension dim, double value_in_si);

//! "12.3 rpm": SI value formatted in the display unit with `digits` significant digits.
std::string format(Dimension dim, double value_in_si, int digits = 4);

//! Standard atmosphere [Pa]; the reference for gauge pressures.
inline constexpr double standard_atmosphere_pa = 101325.0;
//! 0 degC [K].
inline constexpr double zero_celsius_k = 273.15;

}  // namespace oxystrat::units
