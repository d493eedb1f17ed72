// Impeller correlations: power and pumping numbers, gassed power, flooding. Free functions of
// plain arguments, SI in and out, each with its source. Values tagged [mem] were recalled from the
// literature and not re-checked against the original paper (see README, "Method").
#pragma once

#include <string>

#include "case/case.hpp"

namespace oxystrat {

//! Turbulent power number Np = P/(rho N^3 D^5) in a baffled vessel [-]. Rushton 5.0, 45 degree
//! pitched blade (4) 1.27, narrow-blade hydrofoil 0.30 (Pinho et al. 1997 measured 0.31),
//! hollow-blade disc turbine 3.0 [mem, 2.9-3.2].
double turbulent_power_number(ImpellerType t);

//! Laminar constant Kp = Np Re [-]: Rushton 70, pitched blade 45 [mem, 40-50]; hydrofoil and
//! hollow blade 40 and 70 [our assumption; only used below Re = 1e4].
double laminar_constant(ImpellerType t);

//! Pumping number Nq = Qp/(N D^3) [-]: Rushton 0.72, pitched blade 0.79, hydrofoil 0.50
//! [sec/mem, 0.4-0.56], hollow blade 0.6 [mem, 0.5-0.7].
double default_flow_number(ImpellerType t);

//! Power number at Reynolds number `re`: laminar Kp/Re below Re = 10, turbulent `np_turbulent`
//! above 1e4, log-log interpolation between (a smooth stand-in for the transitional curve).
double power_number(double re, double np_turbulent, double kp_laminar);

//! Gassed-to-ungassed power ratio of a Rushton turbine at aeration number Fl_G = Qg/(N D^3):
//! Cui, van der Lans & Luyben (1996): 1 - 12.6 Fl_G for Fl_G < 0.035, else 0.62 - 1.85 Fl_G;
//! floored at 0.2 (beyond the data; the impeller is flooded long before).
double cui_gassed_power_ratio(double aeration_number);

//! Gassed power ratio used for the other impeller types when gas reaches them [our defaults,
//! mem]: hollow blade 0.85, pitched blade down 0.7 / up 0.85, hydrofoil down 0.6 / up 0.8.
double default_gassed_power_factor(ImpellerType t);

//! Aeration number at which a Rushton turbine floods: Fl_G,F = 30 Fr (D/T)^3.5
//! (Nienow, Warmoeskerken, Smith & Konno 1985), Fr = N^2 D / g.
double flooding_aeration_number(double froude, double d_over_t);

//! Aeration number below which gas is completely dispersed (recirculated below the impeller):
//! Fl_G,CD = 0.2 Fr^0.5 (D/T)^0.5 (Nienow et al. 1985).
double complete_dispersion_aeration_number(double froude, double d_over_t);

enum class GasRegime { ungassed, dispersed, loaded, flooded };
std::string to_string(GasRegime r);

//! Regime from the aeration number and the two criteria above.
GasRegime gas_regime(double aeration_number, double flooding, double dispersion);

}  // namespace oxystrat
