// Gas solubility and water properties: free functions, SI in, SI out, each with its source.
#pragma once

#include <map>
#include <string>

namespace oxystrat::physics {

//! Molar masses [kg/mol].
inline constexpr double molar_mass_o2 = 31.9988e-3;
inline constexpr double molar_mass_co2 = 44.0095e-3;
//! O2 mole fraction of dry air [-] (common practice; Benson & Krause 1984 use 0.20946).
inline constexpr double air_o2_fraction = 0.20946;

//! Saturation pressure of water [Pa] at temperature [K]: IAPWS-IF97 region 4, eq. 30
//! (Wagner et al. 2000, J. Eng. Gas Turbines Power 122:150). Valid 273.15-647.096 K.
double water_vapour_pressure(double temperature_k);

//! Dynamic viscosity of liquid water [Pa s], Vogel form fitted 0-100 degC
//! (A = 2.414e-5 Pa s, B = 247.8 K, C = 140 K; common practice, from memory, +-2 %).
double water_viscosity(double temperature_k);

//! O2 solubility in fresh water from moist air at 1 atm total pressure [mol/m3]:
//! Benson & Krause (1984), Limnol. Oceanogr. 29:620, in the mg/L form of APHA Standard Methods.
double o2_saturation_air_1atm(double temperature_k);

//! Henry coefficient of O2 [mol/(m3 Pa)]: C = H p_O2, chosen so that moist air at 1 atm gives
//! exactly Benson & Krause (1984).
double henry_o2(double temperature_k);

//! Henry coefficient of CO2 [mol/(m3 Pa)]: Sander (2023) compilation, 3.3e-4 at 298.15 K with a
//! van 't Hoff temperature dependence d ln H / d(1/T) = 2400 K.
double henry_co2(double temperature_k);

//! Dissolved-gas species for salting-out.
enum class Gas { o2, co2 };

//! Solubility ratio c/c0 in an electrolyte solution [-]: Weisenberger & Schumpe (1996),
//! AIChE J. 42:298, log10(c0/c) = sum_i (h_i + h_G) c_i, c_i in kmol/m3.
//! `ions_mol_m3` maps ion names ("Na+", "Cl-", ...) to concentrations [mol/m3].
double salting_out_factor(Gas gas, double temperature_k, const std::map<std::string, double>& ions_mol_m3);

//! True when Weisenberger & Schumpe ion parameters for `ion` are known.
bool known_ion(const std::string& ion);
//! Comma-separated list of the known ion names, for error messages.
std::string known_ions();

}  // namespace oxystrat::physics
