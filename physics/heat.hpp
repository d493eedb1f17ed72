// Heat in an aerated fermenter: the heat the cells release per mol O2, the latent heat of water
// carried off by the gas, the heat capacity of the dry gas, and a cooling surface whose coolant
// warms along it. Free functions, SI in and out, each with its source (docs/method.md, section 16).
#pragma once

namespace oxystrat::physics {

//! Metabolic heat per mol O2 taken up [J/mol]: 440 kJ/mol, constant over strains and substrates in
//! strongly aerobic growth (Cordier, Butsch, Birou & von Stockar 1987, Biotechnol. Bioeng. 30:650)
//! [pub: abstract]. Cooney, Wang & Mateles 1969 found 0.12 kcal/mmol O2 (about 500 kJ/mol) [mem].
inline constexpr double metabolic_heat_per_o2_j_mol = 440e3;

//! Molar mass of water [kg/mol].
inline constexpr double molar_mass_water = 18.015e-3;

//! Molar heat capacity of dry air at constant pressure [J/(mol K)]: 1.006 kJ/(kg K) x 28.96 g/mol,
//! within 1 % from 0 to 60 degC [mem]; O2 and N2 differ by under 1 %. Used for any dry inlet gas.
inline constexpr double dry_gas_molar_heat_capacity = 29.1;

//! Latent heat of vaporisation of water [J/kg] at temperature [K]: our cubic fit [calc] of the
//! IAPWS-IF97 saturation enthalpies (Wagner et al. 2000) from 0 to 80 degC, t in degC:
//! L = 2500.9 - 2.3729 t + 4.7457e-4 t^2 - 1.1825e-5 t^3 kJ/kg, within 0.002 % there
//! (tests/scripts/reference_libraries.py checks it against the iapws library).
double water_latent_heat(double temperature_k);

//! Log-mean temperature difference [K] of two end differences [K] (equal ends: their value).
double log_mean_temperature_difference(double dt_in_k, double dt_out_k);

//! Heat a coolant takes up [W] flowing along a surface of conductance `ua_w_k` [W/K] at a
//! capacity rate `capacity_rate_w_k` = mass flow x heat capacity [W/K], entering at
//! `coolant_in_k` [K], while the broth on the other side stays at `broth_k` [K] (well mixed):
//! the effectiveness form Q = (1 - exp(-UA/C)) C (T_broth - T_in), which equals UA x LMTD
//! (a heat exchanger with one side at constant temperature; standard heat-transfer result).
//! 0 when the coolant is not colder than the broth.
double coolant_duty(double ua_w_k, double capacity_rate_w_k, double broth_k, double coolant_in_k);

}  // namespace oxystrat::physics
