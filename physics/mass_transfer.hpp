// Gas holdup and volumetric mass-transfer coefficients: free functions, SI in and out.
#pragma once

#include <string>

namespace oxystrat {

enum class Coalescence { coalescing, non_coalescing };
std::string to_string(Coalescence c);

struct VantRietConstants {
  double prefactor;       //!< SI: kLa [1/s], P/V [W/m3], vs [m/s]
  double power_exponent;  //!< on P/V
  double gas_exponent;    //!< on vs
};

//! van 't Riet (1979), Ind. Eng. Chem. Process Des. Dev. 18:357: coalescing 0.026 (P/V)^0.4 vs^0.5;
//! non-coalescing 0.002 (P/V)^0.7 vs^0.2.
VantRietConstants vant_riet_constants(Coalescence c);

//! kLa from the van 't Riet form [1/s] at power per volume [W/m3] and superficial velocity [m/s].
double vant_riet_kla(const VantRietConstants& k, double power_per_volume_w_m3, double superficial_gas_m_s);

//! Liquid-side coefficient from the eddy model, kL = 0.523 (eps nu)^(1/4) Sc^(-1/2) [m/s]
//! (Linek, Kordac & Moucha 2004 fit of Lamont & Scott's eddy-cell model).
double eddy_model_kl(double epsilon_w_kg, double kinematic_viscosity_m2_s, double schmidt);

//! Interfacial area a = 6 eps_G / d32 [1/m].
double interfacial_area(double holdup, double sauter_diameter_m);

//! Temperature correction theta^(T - 20 degC), theta = 1.024 (common practice in clean-water
//! aeration testing, e.g. ASCE/EWRI 2-06).
double kla_temperature_factor(double temperature_k);

//! Viscosity correction of a water-based kLa correlation [-]: 1 up to 5 mPa s (the viscosity range
//! of the van 't Riet 1979 data, [mem]), (5 mPa s / mu_a)^0.4 above: the net viscosity exponent of
//! Yagi & Yoshida's (1975) correlation for viscous and non-Newtonian liquids, Ind. Eng. Chem.
//! Process Des. Dev. 14:488 [mem]; García-Ochoa & Gómez (2009) list -0.4 to -0.7 [mem].
double viscous_kla_factor(double apparent_viscosity_pa_s);
inline constexpr double water_like_viscosity_pa_s = 5e-3;

//! kLa_CO2 / kLa_O2 = (D_CO2 / D_O2)^(1/2) ~ 0.9 [common practice].
inline constexpr double co2_kla_ratio = 0.9;

}  // namespace oxystrat
